import { z } from 'zod';

/**
 * Reproducibility spot-checks: after a result archive is verified, the worker recomputes a few
 * Lambda points of its smallest size with Localis's own transfer-matrix kernel and reports, per
 * point, the difference in units of the combined standard error (flagged beyond 3). It applies to
 * what the kernel computes: the Anderson model with box disorder in class AI, Lambda tables.
 */

export const SPOT_CHECK_STATES = ['queued', 'running', 'done', 'not-applicable', 'failed'] as const;
export const SpotCheckState = z.enum(SPOT_CHECK_STATES);
export type SpotCheckState = z.infer<typeof SpotCheckState>;

export const SpotCheckRow = z
  .object({
    L: z.number().int(),
    W: z.number(),
    E: z.number(),
    reported: z.number(),
    reportedErr: z.number(),
    recomputed: z.number(),
    recomputedErr: z.number(),
    /** (recomputed - reported) / sqrt(reportedErr^2 + recomputedErr^2). */
    z: z.number(),
    flagged: z.boolean(),
    /** What the kernel was asked for, so anyone can repeat it with `localis tmm`. */
    dimension: z.number().int(),
    precision: z.number(),
    seed: z.number().int(),
    slices: z.number().int(),
    seconds: z.number(),
  })
  .meta({ id: 'SpotCheckRow' });
export type SpotCheckRow = z.infer<typeof SpotCheckRow>;

export const SpotCheck = z
  .object({
    id: z.uuid(),
    campaignId: z.uuid(),
    archiveId: z.uuid(),
    archiveFileName: z.string(),
    state: SpotCheckState,
    /** Points recomputed of those planned, while running. */
    progress: z.object({ done: z.number().int(), total: z.number().int() }).nullable(),
    rows: z.array(SpotCheckRow),
    /** Rows beyond the limit. */
    flagged: z.number().int(),
    /** Why the kernel cannot check this archive (not-applicable), or what went wrong (failed). */
    reason: z.string().nullable(),
    createdAt: z.string(),
    startedAt: z.string().nullable(),
    finishedAt: z.string().nullable(),
  })
  .meta({ id: 'SpotCheck' });
export type SpotCheck = z.infer<typeof SpotCheck>;

export const SpotCheckList = z.object({ items: z.array(SpotCheck) }).meta({ id: 'SpotCheckList' });
export type SpotCheckList = z.infer<typeof SpotCheckList>;

export const SpotCheckJob = z.object({ spotCheckId: z.uuid() });
export type SpotCheckJob = z.infer<typeof SpotCheckJob>;
