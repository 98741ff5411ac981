import { InvoiceIssuedJob, QUEUES } from '@localis/shared';
import { createObjectStore } from '@localis/api/archives/object-store';
import { createStripeClient } from '@localis/api/billing/stripe-client';
import { createInvoicePayments, type InvoicePayments } from '@localis/api/invoices/invoice-payments';
import type { JobDefinition, JobDeps } from './job';

let payments: InvoicePayments | null = null;
const paymentsOf = (deps: JobDeps) => (payments ??= createInvoicePayments(deps.db, deps.settings, createObjectStore(deps.settings), createStripeClient(deps.settings)));

/** After an invoice is issued: its PDF, its payment page and the e-mail to its billing contacts (each step idempotent). */
export const invoiceIssuedJob: JobDefinition<typeof InvoiceIssuedJob> = {
  name: QUEUES.invoiceIssued,
  schema: InvoiceIssuedJob,
  async process(data, deps) {
    await paymentsOf(deps).afterIssue(data.invoiceId);
    return { done: true };
  },
};
