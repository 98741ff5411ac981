import { computed, ref, watch, type Ref } from 'vue';
import { useRoute } from 'vue-router';
import { isApiError } from '../../../api/api-error';
import { useApiErrorToast } from '../../../composables/use-api-error-toast';
import { usePolling } from '../../../composables/use-polling';
import { useInvoicesStore } from '../../../stores/invoices.store';
import { invoiceNumberText } from '../lib/invoice-format';

/** How often, and for how long, a page back from the payment provider asks whether the payment is confirmed. */
export const CONFIRM_POLL_MS = 2000;
export const CONFIRM_WINDOW_MS = 30_000;
const MAX_CONFIRM_POLLS = CONFIRM_WINDOW_MS / CONFIRM_POLL_MS;

/**
 * The invoice an /invoices/:id page shows, with "not found" told apart from a failure. Opened
 * from the payment provider's return link (`?paid=1`), it asks again every 2 s for about 30 s
 * until the invoice shows paid: the provider's confirmation (a webhook) may arrive a moment later.
 */
export function useInvoicePage(id: Ref<string>) {
  const store = useInvoicesStore();
  const route = useRoute();
  const showApiError = useApiErrorToast();
  const failure = ref<'not-found' | 'failed' | null>(null);

  const invoice = computed(() => (store.current?.id === id.value ? store.current : null));

  async function load(): Promise<void> {
    failure.value = null;
    try {
      await store.loadOne(id.value);
    } catch (error) {
      failure.value = isApiError(error) && error.status === 404 ? 'not-found' : 'failed';
      if (failure.value === 'failed') showApiError(error, 'The invoice could not be loaded');
    }
  }

  watch(id, load, { immediate: true });
  watch(invoice, (i) => {
    if (i) document.title = `Invoice ${invoiceNumberText(i)}: ${i.institutionName} · Localis`;
  });

  const returning = computed(() => route.query.paid === '1');
  const polls = ref(0);
  watch(id, () => (polls.value = 0));

  /** Back from paying, the invoice still issued, and the window not yet over. */
  const confirming = computed(() => returning.value && invoice.value?.state === 'issued' && polls.value < MAX_CONFIRM_POLLS);
  /** The window is over and no confirmation came: the page says so calmly. */
  const unconfirmed = computed(() => returning.value && invoice.value?.state === 'issued' && polls.value >= MAX_CONFIRM_POLLS);
  /** Back from paying and confirmed. */
  const confirmed = computed(() => returning.value && invoice.value?.state === 'paid');

  usePolling({
    active: () => confirming.value,
    poll: async () => {
      polls.value += 1;
      try {
        await store.loadOne(id.value);
      } catch {
        // A poll that fails keeps what is shown; the next one may get through.
      }
    },
    intervalMs: CONFIRM_POLL_MS,
  });

  return { invoice, failure, load, confirming, unconfirmed, confirmed };
}
