import type { Invoice, InvoiceList, InvoiceState, PaymentLink, VoidInvoiceInput } from '@localis/shared';
import { apiUrl, http, type QueryParams } from './http-client';

/** Query of GET /invoices as the portal sends it (InvoiceListQuery before the server parses it). */
export interface InvoicesQuery extends QueryParams {
  state?: InvoiceState;
  institutionId?: string;
  /** Only issued invoices past their due date. */
  overdue?: 'true' | 'false';
}

const invoice = (id: string) => `/invoices/${encodeURIComponent(id)}`;

export const invoicesApi = {
  /** Every invoice the caller may see: all for the office, their institution's for a billing contact. */
  list: (query: InvoicesQuery = {}, signal?: AbortSignal) => http.get<InvoiceList>('/invoices', query, signal),
  get: (id: string, signal?: AbortSignal) => http.get<Invoice>(invoice(id), undefined, signal),
  /** Draft to issued: the invoice gets its number and PDF, and its billing contacts an e-mail. */
  issue: (id: string) => http.post<Invoice>(`${invoice(id)}/issue`),
  /** An issued invoice voided gets a credit note; the reason is kept with it. */
  void: (id: string, input: VoidInvoiceInput) => http.post<Invoice>(`${invoice(id)}/void`, input),
  /** Where to pay an issued invoice: the payment provider's page, which links back here. */
  pay: (id: string) => http.post<PaymentLink>(`${invoice(id)}/pay`),
  /** The PDF, for a plain link: a GET with the session cookie that redirects to the download. */
  pdfUrl: (id: string) => apiUrl(`${invoice(id)}/pdf`),
};
