import { InvoiceListQuery, type Invoice } from '@localis/shared';
import type { InvoicesQuery } from '../../../api/invoices.api';
import type { TableQuerySpec, TableQueryState } from '../../../composables/use-table-query';
import { fieldErrors } from '../../../composables/use-zod-form';

/** What the invoices page keeps in its address: a billing contact's view, or the office's filters. */
export type InvoiceFilter = 'show' | 'state' | 'institutionId' | 'overdue';
export type InvoiceFilters = Partial<Record<InvoiceFilter, string>>;

/** Fields the table sorts by. The api answers the whole list at once; the portal sorts and pages it. */
export const INVOICE_SORTABLE = ['number', 'institutionName', 'periodFrom', 'state', 'dueOn'] as const;
type InvoiceSortField = (typeof INVOICE_SORTABLE)[number];

export const INVOICES_TABLE: TableQuerySpec<InvoiceFilter> = {
  filters: ['show', 'state', 'institutionId', 'overdue'],
  sortable: INVOICE_SORTABLE,
  // The latest period first: what was billed last is what people ask about.
  defaultSort: '-periodFrom',
};

/** A billing contact's views of their institution's invoices. */
export const BILLING_SHOWS = ['open', 'overdue', 'paid', 'all'] as const;
export type BillingShow = (typeof BILLING_SHOWS)[number];

export const BILLING_SHOW_LABELS: Record<BillingShow, string> = {
  open: 'To pay',
  overdue: 'Overdue',
  paid: 'Paid',
  all: 'All',
};

/** The view in the address; what is to pay comes first and is the default. */
export function billingShowOf(filters: InvoiceFilters): BillingShow {
  return (BILLING_SHOWS as readonly string[]).includes(filters.show ?? '') ? (filters.show as BillingShow) : 'open';
}

/** What the address holds for a chosen view: nothing for the default. */
export function billingShowValue(show: BillingShow): string | null {
  return show === 'open' ? null : show;
}

const BILLING_QUERY: Record<BillingShow, InvoicesQuery> = {
  // Issued is unpaid: a paid invoice moves on to "paid". Overdue ones are open too.
  open: { state: 'issued' },
  overdue: { overdue: 'true' },
  paid: { state: 'paid' },
  all: {},
};

/**
 * The api query for the page. The office filters freely (values passed on as typed, so a
 * hand-edited address is explained, not sent); a billing contact picks one of the views.
 */
export function invoicesQueryOf(filters: InvoiceFilters, office: boolean): InvoicesQuery {
  if (!office) return { ...BILLING_QUERY[billingShowOf(filters)] };
  const query: Record<string, string> = {};
  for (const name of ['state', 'institutionId', 'overdue'] as const) if (filters[name]) query[name] = filters[name];
  return query as InvoicesQuery;
}

/** Why the api would refuse the query, in its schema's words, by field; empty when it would not. */
export function invoiceQueryProblems(query: InvoicesQuery): Record<string, string> {
  const result = InvoiceListQuery.safeParse(query);
  return result.success ? {} : fieldErrors(result.error.issues);
}

const STATE_ORDER: Record<Invoice['state'], number> = { draft: 0, issued: 1, paid: 2, void: 3 };

function sortValue(invoice: Invoice, field: InvoiceSortField): string | number | null {
  return field === 'state' ? STATE_ORDER[invoice.state] : invoice[field];
}

/** The invoices in the order asked for (`-field` for descending); those without a value go last either way. */
export function sortInvoices(items: readonly Invoice[], sort: string): Invoice[] {
  const descending = sort.startsWith('-');
  const name = descending ? sort.slice(1) : sort;
  const field: InvoiceSortField = (INVOICE_SORTABLE as readonly string[]).includes(name) ? (name as InvoiceSortField) : 'periodFrom';
  const direction = descending ? -1 : 1;
  return [...items].sort((a, b) => {
    const x = sortValue(a, field);
    const y = sortValue(b, field);
    if (x === y) return a.institutionName.localeCompare(b.institutionName) || b.createdAt.localeCompare(a.createdAt);
    if (x === null) return 1;
    if (y === null) return -1;
    const order = typeof x === 'number' && typeof y === 'number' ? x - y : String(x).localeCompare(String(y));
    return order * direction;
  });
}

/** The rows of one page of the sorted list. */
export function invoicesPage(items: readonly Invoice[], state: Pick<TableQueryState<InvoiceFilter>, 'page' | 'limit' | 'sort'>): Invoice[] {
  const start = (state.page - 1) * state.limit;
  return sortInvoices(items, state.sort).slice(start, start + state.limit);
}
