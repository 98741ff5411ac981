import { z } from 'zod';
import type { ScalingAnalysis } from '../physics/scaling-analysis';

/**
 * Scaling analyses of a campaign's verified archives, run by the worker: automatically after each
 * archive is verified (all verified, not withdrawn archives together), or again on request with
 * other orders, sizes or bootstrap. Each finished analysis is an entry of the provenance log,
 * derived from the archives it read.
 */

export const ANALYSIS_STATES = ['queued', 'running', 'done', 'failed'] as const;
export const AnalysisState = z.enum(ANALYSIS_STATES);
export type AnalysisState = z.infer<typeof AnalysisState>;

export const MAX_ANALYSIS_BOOTSTRAP = 2000;

export const AnalysisRequest = z
  .object({
    observable: z.enum(['lambda', 'g'], { message: 'observable is lambda or g' }).optional(),
    /** The energy whose points are fitted (the tables may hold several); default: the most common. */
    energy: z.number({ message: 'energy must be a number' }).finite().optional(),
    /** The model's expansion orders; left out, the model scan chooses. */
    orders: z
      .object({
        nr: z.number().int().min(1, 'nr is at least 1').max(4, 'nr is at most 4'),
        ni: z.number().int().min(0).max(2, 'ni is at most 2').default(0),
        mr: z.number().int().min(1).max(3, 'mr is at most 3').default(1),
        mi: z.number().int().min(0).max(2, 'mi is at most 2').default(0),
      })
      .strict()
      .optional(),
    /** Only these sizes L (at least three), e.g. to drop the smallest. */
    sizes: z.array(z.number().int().min(1)).min(3, 'a scaling fit needs at least three sizes').max(64).optional(),
    bootstrap: z.number().int('bootstrap is a whole number of refits').min(0).max(MAX_ANALYSIS_BOOTSTRAP, `at most ${MAX_ANALYSIS_BOOTSTRAP} bootstrap refits`).default(200),
  })
  .strict()
  .meta({ id: 'AnalysisRequest' });
export type AnalysisRequest = z.infer<typeof AnalysisRequest>;

export const Analysis = z
  .object({
    id: z.uuid(),
    campaignId: z.uuid(),
    state: AnalysisState,
    request: AnalysisRequest,
    /** Fits done of all planned (scan, central fit, bootstrap refits), while running. */
    progress: z.object({ done: z.number().int(), total: z.number().int() }).nullable(),
    archiveIds: z.array(z.uuid()),
    points: z.number().int(),
    /** The ScalingAnalysis of shared/src/physics (Wc, nu, critical, chi2, dof, p, scan, crossings, beta, collapse). */
    result: z.record(z.string(), z.unknown()).nullable(),
    error: z.string().nullable(),
    requestedByName: z.string().nullable(),
    createdAt: z.string(),
    startedAt: z.string().nullable(),
    finishedAt: z.string().nullable(),
  })
  .meta({ id: 'Analysis' });
export type Analysis = Omit<z.infer<typeof Analysis>, 'result'> & { result: ScalingAnalysis | null };

export const AnalysisList = z.object({ items: z.array(Analysis) }).meta({ id: 'AnalysisList' });
export type AnalysisList = { items: Analysis[] };

export const AnalyzeJob = z.object({ analysisId: z.uuid() });
export type AnalyzeJob = z.infer<typeof AnalyzeJob>;
