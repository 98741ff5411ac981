import type { Invoice, PaymentLink, VoidInvoiceInput } from '@localis/shared';
import { defineStore } from 'pinia';
import { invoicesApi, type InvoicesQuery } from '../api/invoices.api';
import { useShownRecord } from './shown-record';
import { useWholeList } from './whole-list';

export const useInvoicesStore = defineStore('invoices', () => {
  /** The invoices list as last loaded for a filter (the whole list: the api does not page it). */
  const { items, loading, load } = useWholeList<Invoice, InvoicesQuery>(invoicesApi.list);
  /** The invoice a detail page shows; read again for the same id (a payment being confirmed), it stays shown meanwhile. */
  const { current, loading: currentLoading, load: loadOne } = useShownRecord(invoicesApi.get, (invoice: Invoice) => invoice.id);

  /** An invoice the server changed: shown at once in the list and on its page. */
  function remember(invoice: Invoice): Invoice {
    items.value = items.value.map((i) => (i.id === invoice.id ? invoice : i));
    if (current.value?.id === invoice.id) current.value = invoice;
    return invoice;
  }

  const issue = async (id: string): Promise<Invoice> => remember(await invoicesApi.issue(id));
  const voidInvoice = async (id: string, input: VoidInvoiceInput): Promise<Invoice> => remember(await invoicesApi.void(id, input));
  /** Where to pay; the invoice itself changes only when the provider confirms (a webhook). */
  const pay = (id: string): Promise<PaymentLink> => invoicesApi.pay(id);

  return { items, loading, current, currentLoading, load, loadOne, issue, voidInvoice, pay };
});
