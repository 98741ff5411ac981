/**
 * Reproducibility spot-check: a point of an archive recomputed with our own kernel, compared in
 * units of the combined standard error, z = (recomputed - reported) / sqrt(err_r^2 + err_k^2).
 * Beyond SPOT_CHECK_LIMIT standard errors a point is flagged (common practice: 3 sigma).
 */
export const SPOT_CHECK_LIMIT = 3;

export interface SpotCheckPoint {
  L: number;
  x: number;
  reported: number;
  reportedErr: number;
  recomputed: number;
  recomputedErr: number;
}

export interface SpotCheckRow extends SpotCheckPoint {
  /** Difference in combined standard errors. */
  z: number;
  flagged: boolean;
}

export function compareSpotCheck(points: readonly SpotCheckPoint[]): { rows: SpotCheckRow[]; flagged: number } {
  const rows = points.map((p) => {
    const combined = Math.hypot(p.reportedErr, p.recomputedErr);
    const z = combined > 0 ? (p.recomputed - p.reported) / combined : p.recomputed === p.reported ? 0 : Number.POSITIVE_INFINITY;
    return { ...p, z, flagged: !(Math.abs(z) <= SPOT_CHECK_LIMIT) };
  });
  return { rows, flagged: rows.filter((r) => r.flagged).length };
}
