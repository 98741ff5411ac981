import { QUEUES, SpotCheckJob } from '@localis/shared';
import { createSpotCheckRunner, type SpotCheckRunner } from '@localis/api/spot-checks/spot-check-runner';
import type { JobDefinition, JobDeps } from './job';

let runner: SpotCheckRunner | null = null;
const runnerOf = (deps: JobDeps) => (runner ??= createSpotCheckRunner(deps.db));

/** A verified archive's reproducibility spot-check: a few points recomputed with the transfer-matrix kernel. */
export const spotCheckJob: JobDefinition<typeof SpotCheckJob> = {
  name: QUEUES.spotCheck,
  schema: SpotCheckJob,
  // The kernel keeps a core busy for up to a minute: one at a time leaves the other core to the rest.
  concurrency: 1,
  async process(data, deps) {
    const started = Date.now();
    const outcome = await runnerOf(deps).run(data.spotCheckId);
    deps.logger.info({ spotCheckId: data.spotCheckId, outcome, ms: Date.now() - started }, 'spot-check run');
    return { outcome };
  },
};
