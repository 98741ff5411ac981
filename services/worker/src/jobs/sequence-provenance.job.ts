import { z } from 'zod';
import { QUEUES } from '@localis/shared';
import { createProvenanceService, type ProvenanceService } from '@localis/api/provenance';
import { createCampaignsService } from '@localis/api/campaigns';
import type { JobDefinition, JobDeps } from './job';

/** One scheduler under a fixed id, like the daily sweep. */
export const SEQUENCE_PROVENANCE_SCHEDULER_ID = 'localis-sequence-provenance';
/** The log's merge delay: entries get their leaf index and a signed head within this. */
export const SEQUENCE_PROVENANCE_EVERY_MS = 5_000;

let service: ProvenanceService | null = null;
const serviceOf = (deps: JobDeps) => (service ??= createProvenanceService(deps.db, deps.settings, createCampaignsService(deps.db)));

/** Give new provenance entries their leaf indexes and sign a tree head over them. */
export const sequenceProvenanceJob: JobDefinition<z.ZodObject> = {
  name: QUEUES.sequenceProvenance,
  schema: z.object({}),
  async process(_data, deps) {
    const head = await serviceOf(deps).sequence();
    return { treeSize: head.treeSize };
  },
};
