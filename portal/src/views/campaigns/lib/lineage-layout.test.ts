import { layerNodes, lineageGraph, type LineageLayout } from '@localis/shared';
import { describe, expect, it } from 'vitest';
import { lineageRecords, provIds } from '../test/provenance-fixture';
import { drawLineage, lineageSentences, NODE_HEIGHT, NODE_WIDTH, relationWords, shorten } from './lineage-layout';

function layout(nodes: [string, number, number][], edges: [string, string, string][]): LineageLayout {
  return {
    nodes: nodes.map(([id, column, row]) => ({ id, label: id, type: 'entity', subtype: 'run', column, row })),
    edges: edges.map(([from, to, relation]) => ({ from, to, relation: relation as 'used' })),
    columns: Math.max(...nodes.map((n) => n[1])) + 1,
    rows: Math.max(...nodes.map((n) => n[2])) + 1,
  };
}

describe('drawLineage', () => {
  describe('the boxes', () => {
    it('should put columns left to right and rows top to bottom, and size the drawing to hold them', () => {
      const drawing = drawLineage(layout([['a', 0, 0], ['b', 1, 0], ['c', 1, 1]], [['a', 'b', 'used']]));
      const [a, b, c] = drawing.nodes;
      expect(a.x).toBeLessThan(b.x);
      expect(b.x).toBe(c.x);
      expect(b.y).toBeLessThan(c.y);
      expect(c.y - b.y).toBeGreaterThan(NODE_HEIGHT);
      expect(drawing.width).toBeGreaterThanOrEqual(c.x + NODE_WIDTH);
      expect(drawing.height).toBeGreaterThanOrEqual(c.y + NODE_HEIGHT);
    });

    it('should draw nothing for an empty lineage', () => {
      expect(drawLineage(layout([], []) as LineageLayout)).toEqual({ nodes: [], edges: [], width: 0, height: 0 });
    });

    it('should shorten long labels to fit a box', () => {
      expect(shorten('results-W16.5-L8-to-L24-final.tar.gz')).toBe('results-W16.5-L8-to-L24…');
      expect(shorten('short.tar.gz')).toBe('short.tar.gz');
    });
  });

  describe('the arrows', () => {
    it('should run from the right side of one box to the left side of the next, with words near its start', () => {
      const drawing = drawLineage(layout([['a', 0, 0], ['b', 1, 1]], [['a', 'b', 'wasDerivedFrom']]));
      const [a, b] = drawing.nodes;
      const [edge] = drawing.edges;
      const y1 = a.y + NODE_HEIGHT / 2;
      const y2 = b.y + NODE_HEIGHT / 2;
      expect(edge.path.startsWith(`M ${a.x + NODE_WIDTH} ${y1} C`)).toBe(true);
      expect(edge.path.endsWith(`${b.x} ${y2}`)).toBe(true);
      // At t = 0.3 of this curve x has gone 1.5 t (1 − t) + t³ = 0.342 of the way, y 3 t² − 2 t³ = 0.216.
      expect(edge.labelX).toBeCloseTo(a.x + NODE_WIDTH + 0.342 * (b.x - a.x - NODE_WIDTH));
      expect(edge.labelY).toBeCloseTo(y1 + 0.216 * (y2 - y1));
      expect(edge.words).toBe('derived from');
    });

    it('should bow an arrow between boxes of one column out to the right and leave out loops', () => {
      const drawing = drawLineage(layout([['a', 0, 0], ['b', 0, 1]], [['a', 'b', 'used'], ['a', 'a', 'used']]));
      expect(drawing.edges).toHaveLength(1);
      expect(drawing.edges[0].path).toMatch(new RegExp(`^M ${12 + NODE_WIDTH} `));
      expect(drawing.width).toBeGreaterThan(12 + NODE_WIDTH + 12);
    });
  });

  describe('with the lineage of an archive', () => {
    it('should place the archive first and every arrow pointing right', () => {
      const drawn = drawLineage(layerNodes(lineageGraph(lineageRecords, provIds.archive)));
      expect(drawn.nodes[0]).toMatchObject({ id: provIds.archive, x: 12 });
      const x = new Map(drawn.nodes.map((n) => [n.id, n.x]));
      expect(drawn.edges.every((e) => x.get(e.from)! < x.get(e.to)!)).toBe(true);
    });
  });
});

describe('lineageSentences', () => {
  it('should say each relation in words', () => {
    const sentences = lineageSentences(layerNodes(lineageGraph(lineageRecords, provIds.archive)));
    expect(sentences).toContain('wc-sweep-L8-16.tar.gz was derived from Run L=12, W=16.5.');
    expect(sentences).toContain('wc-sweep-L8-16.tar.gz was made by Upload and check.');
    expect(sentences).toContain('Transfer-matrix simulation L=16 used Grant of 500000 core-hours.');
    expect(sentences).toContain('Upload and check was carried out by localis-verifier 1.0.0.');
  });

  it('should keep a relation it has no words for as PROV names it', () => {
    expect(relationWords('wasInvalidatedBy')).toBe('wasInvalidatedBy');
  });
});
