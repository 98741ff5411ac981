import type { Invoice } from '@localis/shared';
import { computed, ref, type Ref } from 'vue';
import { invoicesApi } from '../../../api/invoices.api';
import { useApiErrorToast } from '../../../composables/use-api-error-toast';
import { useConfirmDialog } from '../../../composables/use-confirm-dialog';
import { useSuccessToast } from '../../../composables/use-success-toast';
import { useInvoicesStore } from '../../../stores/invoices.store';
import { useSessionStore } from '../../../stores/session.store';
import { invoiceActions, type InvoiceActions } from '../lib/invoice-actions';

const NOTHING: InvoiceActions = { issue: false, void: false, pay: false, pdf: false };

/** What the reader may do with the invoice on the page, and doing it: issue, pay, the PDF's address. */
export function useInvoiceActions(invoice: Ref<Invoice | null>) {
  const store = useInvoicesStore();
  const session = useSessionStore();
  const ask = useConfirmDialog();
  const showApiError = useApiErrorToast();
  const showSuccess = useSuccessToast();
  const busy = ref<'issue' | 'pay' | null>(null);

  const can = computed(() => (invoice.value ? invoiceActions(session.roles, invoice.value) : NOTHING));
  const pdfUrl = computed(() => (invoice.value ? invoicesApi.pdfUrl(invoice.value.id) : ''));

  async function issue(): Promise<void> {
    const draft = invoice.value;
    if (!draft) return;
    const go = await ask({
      header: 'Issue this invoice?',
      message: `It gets the next invoice number and its PDF, and the billing contacts of ${draft.institutionName} receive it by e-mail. An issued invoice cannot be changed, only voided with a credit note.`,
      acceptLabel: 'Issue invoice',
    });
    if (!go) return;
    busy.value = 'issue';
    try {
      const issued = await store.issue(draft.id);
      showSuccess('Invoice issued', `${issued.number ?? 'The invoice'} is sent to ${issued.institutionName}.`);
    } catch (error) {
      showApiError(error, 'The invoice was not issued');
    } finally {
      busy.value = null;
    }
  }

  /** Off to the payment provider's page; it links back with `?paid=1`. */
  async function pay(): Promise<void> {
    if (!invoice.value) return;
    busy.value = 'pay';
    try {
      const { url } = await store.pay(invoice.value.id);
      window.location.assign(url);
    } catch (error) {
      showApiError(error, 'The payment could not start');
      busy.value = null;
    }
  }

  return { can, busy, pdfUrl, issue, pay };
}
