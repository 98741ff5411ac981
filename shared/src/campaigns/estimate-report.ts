import { z } from 'zod';
import type { CampaignSpec } from './campaign-spec.schema';
import { estimateCampaign, type CampaignEstimate } from './cost-model';
import { campaignNotices, Notice } from './notices';

/** The estimate with its notices: what POST /estimates answers and `localis estimate --json` prints. */
export type EstimateReport = CampaignEstimate & { notices: Notice[] };

export function estimateReport(spec: CampaignSpec): EstimateReport {
  const estimate = estimateCampaign(spec);
  return { ...estimate, notices: campaignNotices(spec, estimate) };
}

/** The documented part of the report (the api's response schema); the rest is described in the type. */
export const EstimateReportSchema = z
  .object({
    totalCoreHours: z.number(),
    rows: z.array(
      z.object({
        size: z.number().int(),
        points: z.number().int(),
        jobs: z.number().int(),
        operations: z.number(),
        coreHours: z.number(),
        share: z.number(),
        peakMemoryBytes: z.number(),
        fitsNode: z.boolean(),
      }).loose(),
    ),
    peakMemoryBytes: z.number(),
    nodeMemoryBytes: z.number(),
    fitsNode: z.boolean(),
    sizeExponent: z.number(),
    assumptions: z.array(z.string()),
    notices: z.array(Notice),
  })
  .loose()
  .meta({ id: 'EstimateReport' });
