import { mailJob } from './mail.job';
import type { JobDefinition } from './job';

/** Every job the worker runs; one BullMQ queue each. */
export const JOBS: JobDefinition[] = [mailJob as JobDefinition];
export type { JobDefinition, JobDeps } from './job';
