import type { Invoice, PaymentLink, VoidInvoiceInput } from '@localis/shared';
import { defineStore } from 'pinia';
import { ref } from 'vue';
import { invoicesApi, type InvoicesQuery } from '../api/invoices.api';
import { isAbort, latestOnly } from './latest-only';

export const useInvoicesStore = defineStore('invoices', () => {
  /** The invoices list as last loaded (the whole list: the api does not page it). */
  const items = ref<Invoice[]>([]);
  const loading = ref(false);
  /** The invoice a detail page shows. */
  const current = ref<Invoice | null>(null);
  const currentLoading = ref(false);
  const lists = latestOnly();
  const reads = latestOnly();

  /** Loads the list for a filter; a newer filter wins over an older answer still on its way. */
  async function load(query: InvoicesQuery): Promise<void> {
    const { signal, isCurrent } = lists.begin();
    loading.value = true;
    try {
      const answer = await invoicesApi.list(query, signal);
      if (isCurrent()) items.value = answer.items;
    } catch (error) {
      if (isAbort(error)) return;
      throw error;
    } finally {
      if (isCurrent()) loading.value = false;
    }
  }

  /** Loads one invoice; read again for the same id (a payment being confirmed) it stays shown meanwhile. */
  async function loadOne(id: string): Promise<Invoice | null> {
    const { signal, isCurrent } = reads.begin();
    if (current.value?.id !== id) current.value = null;
    currentLoading.value = true;
    try {
      const answer = await invoicesApi.get(id, signal);
      if (!isCurrent()) return null;
      current.value = answer;
      return answer;
    } catch (error) {
      if (isAbort(error)) return null;
      throw error;
    } finally {
      if (isCurrent()) currentLoading.value = false;
    }
  }

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
