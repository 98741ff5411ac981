import {
  disorderCount,
  GOAL_LABELS,
  METHOD_LABELS,
  MODEL_LABELS,
  SYMMETRY_CLASS_SIGNATURE,
  type CampaignSpec,
  type DisorderGrid,
  type Method,
  type MethodOptions,
} from '@localis/shared';

/** One line of a campaign's specification as a physicist writes it: term, symbol, value. */
export interface SpecLine {
  key: string;
  term: string;
  /** The usual symbol (L, W, E, ε, Λ), set in italics beside the term. */
  symbol?: string;
  value: string;
  /** Counts and explanations, in smaller type. */
  note?: string;
}

/** Lists longer than this show their start and end with an ellipsis (the CSV has them all). */
export const LIST_SHOWN = 10;

/** A number as printed: up to 12 significant digits (no 0.30000000000000004), a true minus sign. */
export function formatNumber(x: number): string {
  const text = Number(x.toPrecision(12)).toLocaleString('en', { maximumFractionDigits: 12, useGrouping: Math.abs(x) >= 10_000 });
  return text.replace(/^-/, '−');
}

/** "8, 12, 16" or, when long, "8, 10, 12, 14, 16, …, 96, 128". */
export function formatList(values: readonly number[], shown = LIST_SHOWN): string {
  if (values.length <= shown) return values.map(formatNumber).join(', ');
  const head = values.slice(0, shown - 2).map(formatNumber);
  const tail = values.slice(-2).map(formatNumber);
  return [...head, '…', ...tail].join(', ');
}

const plural = (n: number, one: string, many = `${one}s`) => `${n.toLocaleString('en')} ${n === 1 ? one : many}`;

/** The disorder grid: "15 … 18 in steps of 0.1" or the listed values. */
export function formatDisorder(grid: DisorderGrid): { value: string; note: string } {
  const count = disorderCount(grid);
  if (grid.values) return { value: formatList(grid.values), note: plural(count, 'value') };
  return {
    value: `${formatNumber(grid.from ?? 0)} … ${formatNumber(grid.to ?? 0)} in steps of ${formatNumber(grid.step ?? 0)}`,
    note: plural(count, 'value'),
  };
}

/** A relative precision as a percentage: 0.01 -> "1 %", 0.0005 -> "0.05 %". */
export function formatPrecision(eps: number): string {
  return `${formatNumber(Number((eps * 100).toPrecision(6)))} %`;
}

/** Which options each method reads; the others may linger from an earlier choice and mean nothing. */
const OPTIONS_OF: Record<Method, readonly (keyof MethodOptions)[]> = {
  'transfer-matrix': ['expectedLambda', 'reorthogonalizeEvery'],
  'kernel-polynomial': ['moments', 'randomVectors'],
  'shift-invert': ['eigenpairs'],
  'exact-diagonalization': [],
  'recursive-green': [],
};

function methodOptionLines(method: Method, options: MethodOptions | undefined): SpecLine[] {
  const o = Object.fromEntries(Object.entries(options ?? {}).filter(([k]) => OPTIONS_OF[method].includes(k as keyof MethodOptions))) as MethodOptions;
  const lines: SpecLine[] = [];
  if (o.expectedLambda !== undefined) {
    lines.push({ key: 'expectedLambda', term: 'Expected reduced localization length', symbol: 'Λ', value: formatNumber(o.expectedLambda) });
  }
  if (o.reorthogonalizeEvery !== undefined) {
    lines.push({ key: 'reorthogonalizeEvery', term: 'Re-orthonormalization', value: `every ${plural(o.reorthogonalizeEvery, 'slice')}` });
  }
  if (o.moments !== undefined) lines.push({ key: 'moments', term: 'Chebyshev moments', value: o.moments.toLocaleString('en') });
  if (o.randomVectors !== undefined) lines.push({ key: 'randomVectors', term: 'Random vectors', value: o.randomVectors.toLocaleString('en') });
  if (o.eigenpairs !== undefined) lines.push({ key: 'eigenpairs', term: 'Eigenpairs per job', value: o.eigenpairs.toLocaleString('en') });
  return lines;
}

/** The whole specification, in the order a referee reads it: physics, grid, numerics, machine. */
export function specLines(spec: CampaignSpec): SpecLine[] {
  const sizes = [...spec.sizes].sort((a, b) => a - b);
  const disorder = formatDisorder(spec.disorder);
  const signature = SYMMETRY_CLASS_SIGNATURE[spec.symmetryClass];
  const lines: SpecLine[] = [
    { key: 'model', term: 'Model', value: MODEL_LABELS[spec.model] },
    { key: 'goal', term: 'Aim', value: GOAL_LABELS[spec.goal] },
    { key: 'dimension', term: 'Dimension', symbol: 'd', value: String(spec.dimension) },
    { key: 'symmetryClass', term: 'Symmetry class', value: spec.symmetryClass, note: signature.name },
    { key: 'sizes', term: 'System sizes', symbol: 'L', value: formatList(sizes), note: plural(sizes.length, 'size') },
    { key: 'disorder', term: 'Disorder strength', symbol: 'W', value: disorder.value, note: disorder.note },
    { key: 'energies', term: 'Energy', symbol: 'E', value: formatList(spec.energies), note: plural(spec.energies.length, 'value') },
    {
      key: 'realizations',
      term: 'Disorder realizations',
      value: spec.realizations.toLocaleString('en'),
      note: 'per (W, E) point and size',
    },
    { key: 'method', term: 'Method', value: METHOD_LABELS[spec.method] },
  ];
  if (spec.targetPrecision !== undefined) {
    lines.push({
      key: 'targetPrecision',
      term: 'Target precision',
      symbol: 'ε',
      value: formatPrecision(spec.targetPrecision),
      note: spec.method === 'transfer-matrix' ? 'relative error of the smallest Lyapunov exponent' : undefined,
    });
  }
  lines.push(...methodOptionLines(spec.method, spec.methodOptions));
  lines.push({
    key: 'node',
    term: 'Node',
    value: `${plural(spec.node.coresPerNode, 'core')}, ${formatNumber(spec.node.memoryGiBPerNode)} GiB`,
  });
  if (spec.pilotTimings?.length) {
    const pilotSizes = [...new Set(spec.pilotTimings.map((t) => t.size))].sort((a, b) => a - b);
    lines.push({ key: 'pilotTimings', term: 'Pilot timings', value: plural(spec.pilotTimings.length, 'timing'), note: `at L = ${formatList(pilotSizes)}` });
  }
  return lines;
}
