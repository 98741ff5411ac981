import { InvoiceRunJob, QUEUES } from '@localis/shared';
import { createInvoiceRunner, type InvoiceRunner } from '@localis/api/invoices/invoice-runner';
import type { JobDefinition, JobDeps } from './job';

let runner: InvoiceRunner | null = null;
const runnerOf = (deps: JobDeps) => (runner ??= createInvoiceRunner(deps.db, deps.settings.PUBLIC_URL));

/** An invoice run: the partners' usage of a period drafted into invoices. */
export const invoiceRunJob: JobDefinition<typeof InvoiceRunJob> = {
  name: QUEUES.invoiceRun,
  schema: InvoiceRunJob,
  concurrency: 1,
  async process(data, deps) {
    const outcome = await runnerOf(deps).run(data.runId);
    deps.logger.info({ runId: data.runId, outcome }, 'invoice run');
    return { outcome };
  },
};
