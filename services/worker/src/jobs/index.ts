import { mailJob } from './mail.job';
import { dailySweepJob } from './daily-sweep.job';
import { verifyArchiveJob } from './verify-archive.job';
import { sequenceProvenanceJob } from './sequence-provenance.job';
import { analyzeJob } from './analyze.job';
import { spotCheckJob } from './spot-check.job';
import { invoiceRunJob } from './invoice-run.job';
import { invoiceIssuedJob } from './invoice-issued.job';
import type { JobDefinition } from './job';

/** Every job the worker runs; one BullMQ queue each. */
export const JOBS: JobDefinition[] = [mailJob as JobDefinition, dailySweepJob as JobDefinition, verifyArchiveJob as JobDefinition, sequenceProvenanceJob as JobDefinition, analyzeJob as JobDefinition, spotCheckJob as JobDefinition, invoiceRunJob as JobDefinition, invoiceIssuedJob as JobDefinition];
export type { JobDefinition, JobDeps } from './job';
