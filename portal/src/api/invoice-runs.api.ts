import type { InvoiceRun, InvoiceRunInput, InvoiceRunList } from '@localis/shared';
import { http } from './http-client';

export const invoiceRunsApi = {
  /** The office's invoice runs; the worker moves them from queued to done or failed. */
  list: (signal?: AbortSignal) => http.get<InvoiceRunList>('/invoice-runs', undefined, signal),
  /** Drafts (or brings up to date) every partner's invoice for whole calendar months; answered 202 while queued. */
  start: (input: InvoiceRunInput) => http.post<InvoiceRun>('/invoice-runs', input),
};
