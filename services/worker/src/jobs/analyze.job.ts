import { AnalyzeJob, QUEUES } from '@localis/shared';
import { createAnalysisRunner, type AnalysisRunner } from '@localis/api/analyses/analysis-runner';
import type { JobDefinition, JobDeps } from './job';

let runner: AnalysisRunner | null = null;
const runnerOf = (deps: JobDeps) => (runner ??= createAnalysisRunner(deps.db));

/** A scaling analysis of a campaign's verified archives (queued after a verification, or on request). */
export const analyzeJob: JobDefinition<typeof AnalyzeJob> = {
  name: QUEUES.analyze,
  schema: AnalyzeJob,
  // A bootstrap keeps a core busy for seconds: one at a time leaves the other core to the rest.
  concurrency: 1,
  async process(data, deps) {
    const started = Date.now();
    const outcome = await runnerOf(deps).run(data.analysisId);
    deps.logger.info({ analysisId: data.analysisId, outcome, ms: Date.now() - started }, 'analysis run');
    return { outcome };
  },
};
