import type { LineageEdge, LineageLayout, LineageNode, PlacedLineageNode } from '@localis/shared';

/**
 * Where the boxes and arrows of a lineage drawing go. The graph and its columns come from
 * `lineageGraph` and `layerNodes` in shared (column = longest distance from the archive, row =
 * place in the column); this file only turns them into SVG coordinates, so the drawing is plain
 * geometry.
 */

export interface DrawnNode extends LineageNode {
  x: number;
  y: number;
  /** The label as it fits in the box; the whole one goes in a tooltip. */
  shortLabel: string;
}

export interface DrawnEdge extends LineageEdge {
  path: string;
  labelX: number;
  labelY: number;
  words: string;
}

export interface LineageDrawing {
  nodes: DrawnNode[];
  edges: DrawnEdge[];
  width: number;
  height: number;
}

export const NODE_WIDTH = 176;
export const NODE_HEIGHT = 46;
/** Room between columns for an arrow and its words. */
const COLUMN_GAP = 96;
const ROW_GAP = 34;
const PAD = 12;
const LABEL_CHARS = 24;

/** PROV's relation names, in the words the drawing and its text version use. */
export const RELATION_WORDS: Record<string, string> = {
  used: 'used',
  wasGeneratedBy: 'made by',
  wasAssociatedWith: 'done by',
  wasDerivedFrom: 'derived from',
  wasAttributedTo: 'attributed to',
  wasInformedBy: 'informed by',
  actedOnBehalfOf: 'on behalf of',
};

export function relationWords(relation: string): string {
  return RELATION_WORDS[relation] ?? relation;
}

export function shorten(text: string, max = LABEL_CHARS): string {
  return text.length <= max ? text : `${text.slice(0, max - 1)}…`;
}

export function drawLineage(layout: Pick<LineageLayout, 'nodes' | 'edges'>): LineageDrawing {
  if (!layout.nodes.length) return { nodes: [], edges: [], width: 0, height: 0 };
  const nodes: DrawnNode[] = layout.nodes.map(({ column, row, ...n }: PlacedLineageNode) => ({
    ...n,
    x: PAD + column * (NODE_WIDTH + COLUMN_GAP),
    y: PAD + row * (NODE_HEIGHT + ROW_GAP),
    shortLabel: shorten(n.label),
  }));
  const byId = new Map(nodes.map((n) => [n.id, n]));
  // Arrows that skip a column arc over the boxes between: the drawing needs room above its top row.
  const columnOf = (id: string) => Math.round((byId.get(id)!.x - PAD) / (NODE_WIDTH + COLUMN_GAP));
  const longest = Math.max(0, ...layout.edges.filter((e) => byId.has(e.from) && byId.has(e.to)).map((e) => Math.abs(columnOf(e.from) - columnOf(e.to))));
  if (longest > 1) for (const n of nodes) n.y += arcRise(longest) + 14;
  const edges = layout.edges.flatMap((e) => {
    const from = byId.get(e.from);
    const to = byId.get(e.to);
    return from && to && from !== to ? [placeEdge(e, from, to)] : [];
  });
  const width = Math.max(...nodes.map((n) => n.x + NODE_WIDTH)) + PAD + (edges.some((e) => byId.get(e.from)!.x === byId.get(e.to)!.x) ? 48 : 0);
  const height = Math.max(...nodes.map((n) => n.y + NODE_HEIGHT)) + PAD;
  return { nodes, edges, width, height };
}

const LABEL_AT = 0.3;

/** A point of a cubic Bézier curve at t, one coordinate at a time. */
function bezier(p0: number, p1: number, p2: number, p3: number, t: number): number {
  const u = 1 - t;
  return u * u * u * p0 + 3 * u * u * t * p1 + 3 * u * t * t * p2 + t * t * t * p3;
}

/** How far above the higher box an arrow skipping `span` columns arcs (longer arrows higher, so they do not overlap). */
function arcRise(span: number): number {
  return 14 + 16 * span;
}

/** An arrow over the boxes between two columns further apart than neighbours: top to top, its words at the crest. */
function placeArc(edge: LineageEdge, from: DrawnNode, to: DrawnNode): DrawnEdge {
  const span = Math.round(Math.abs(to.x - from.x) / (NODE_WIDTH + COLUMN_GAP));
  const x1 = from.x + (from.x < to.x ? NODE_WIDTH * 0.75 : NODE_WIDTH * 0.25);
  const x2 = to.x + (from.x < to.x ? NODE_WIDTH * 0.25 : NODE_WIDTH * 0.75);
  const crest = Math.min(from.y, to.y) - arcRise(span);
  // A cubic with both control points at `ctrl` peaks at 3/4 of the way from the ends to `ctrl`.
  const ctrl = Math.min(from.y, to.y) + (crest - Math.min(from.y, to.y)) * (4 / 3);
  return {
    ...edge,
    path: `M ${x1} ${from.y} C ${x1} ${ctrl}, ${x2} ${ctrl}, ${x2} ${to.y}`,
    labelX: bezier(x1, x1, x2, x2, 0.5),
    labelY: bezier(from.y, ctrl, ctrl, to.y, 0.5),
    words: relationWords(edge.relation),
  };
}

/** A curve from side to side of two boxes; within one column it bows out to the right; over a column, it arcs. */
function placeEdge(edge: LineageEdge, from: DrawnNode, to: DrawnNode): DrawnEdge {
  if (Math.abs(to.x - from.x) > NODE_WIDTH + COLUMN_GAP) return placeArc(edge, from, to);
  const fromMid = from.y + NODE_HEIGHT / 2;
  const toMid = to.y + NODE_HEIGHT / 2;
  let x1: number;
  let x2: number;
  let c1: number;
  let c2: number;
  if (from.x === to.x) {
    x1 = x2 = from.x + NODE_WIDTH;
    c1 = c2 = x1 + 44;
  } else if (from.x < to.x) {
    x1 = from.x + NODE_WIDTH;
    x2 = to.x;
    const bend = (x2 - x1) / 2;
    c1 = x1 + bend;
    c2 = x2 - bend;
  } else {
    x1 = from.x;
    x2 = to.x + NODE_WIDTH;
    const bend = (x1 - x2) / 2;
    c1 = x1 - bend;
    c2 = x2 + bend;
  }
  // Words sit a third of the way along, near the arrow's start: arrows fanning out of one box are
  // apart there, while at their middles crossing arrows would put words on top of each other.
  const labelX = bezier(x1, c1, c2, x2, LABEL_AT);
  const labelY = bezier(fromMid, fromMid, toMid, toMid, LABEL_AT);
  return {
    ...edge,
    path: `M ${x1} ${fromMid} C ${c1} ${fromMid}, ${c2} ${toMid}, ${x2} ${toMid}`,
    labelX,
    labelY,
    words: relationWords(edge.relation),
  };
}

const SENTENCE_WORDS: Record<string, string> = {
  used: 'used',
  wasGeneratedBy: 'was made by',
  wasAssociatedWith: 'was carried out by',
  wasDerivedFrom: 'was derived from',
};

/** The drawing as sentences, for screen readers and anyone who would rather read it. */
export function lineageSentences(graph: Pick<LineageLayout, 'nodes' | 'edges'>): string[] {
  const labelOf = new Map(graph.nodes.map((n) => [n.id, n.label]));
  return graph.edges
    .filter((e) => labelOf.has(e.from) && labelOf.has(e.to))
    .map((e) => `${labelOf.get(e.from)} ${SENTENCE_WORDS[e.relation] ?? relationWords(e.relation)} ${labelOf.get(e.to)}.`);
}
