import { disorderSpan, type DisorderGrid } from '../../campaigns/campaign-spec.schema';

/** What a campaign planned, in the form a per-row check can test quickly. */
export interface SpecBounds {
  sizes: ReadonlySet<number>;
  sizeList: readonly number[];
  disorderMin: number;
  disorderMax: number;
  /** Sorted. */
  energies: Float64Array;
}

export interface PlannedGrid {
  sizes: number[];
  disorder: DisorderGrid;
  energies: number[];
}

/** Grids are written by hand and by programs: 15.3 may come back as 15.299999999999999. */
export const RELATIVE_TOLERANCE = 1e-9;

export function specBounds(spec: PlannedGrid): SpecBounds {
  const { min, max } = disorderSpan(spec.disorder);
  return {
    sizes: new Set(spec.sizes),
    sizeList: [...spec.sizes].sort((a, b) => a - b),
    disorderMin: min,
    disorderMax: max,
    energies: Float64Array.from(spec.energies).sort(),
  };
}

export function sizeInSpec(bounds: SpecBounds, size: number): boolean {
  return bounds.sizes.has(size);
}

export function disorderInSpec(bounds: SpecBounds, w: number): boolean {
  return w >= bounds.disorderMin - RELATIVE_TOLERANCE * Math.abs(bounds.disorderMin) && w <= bounds.disorderMax + RELATIVE_TOLERANCE * Math.abs(bounds.disorderMax);
}

/** E among the planned energies, to 1e-9 (relative above |E| = 1, absolute below, so that E = 0 matches 1e-12). */
export function energyInSpec(bounds: SpecBounds, e: number): boolean {
  const list = bounds.energies;
  let low = 0;
  let high = list.length;
  while (low < high) {
    const mid = (low + high) >>> 1;
    if (list[mid] < e) low = mid + 1;
    else high = mid;
  }
  const near = (planned: number) => Math.abs(planned - e) <= RELATIVE_TOLERANCE * Math.max(1, Math.abs(planned));
  return (low < list.length && near(list[low])) || (low > 0 && near(list[low - 1]));
}

export function describeDisorderSpan(bounds: SpecBounds): string {
  return bounds.disorderMin === bounds.disorderMax ? `W = ${bounds.disorderMin}` : `${bounds.disorderMin} ≤ W ≤ ${bounds.disorderMax}`;
}

/** A list for a message: the first few values, then how many more. */
export function shortList(values: readonly number[], shown = 8): string {
  if (values.length <= shown) return values.join(', ');
  return `${values.slice(0, shown).join(', ')} and ${values.length - shown} more`;
}
