import type { InvoiceRun, InvoiceRunInput } from '@localis/shared';
import { computed, ref, watch } from 'vue';
import { isApiError } from '../../../api/api-error';
import { useApiErrorToast } from '../../../composables/use-api-error-toast';
import { runPeriodErrors, runPeriodInput, type RunPeriodErrors, type RunPeriodValues } from '../lib/invoice-run-period';
import { previousMonth } from '../lib/month-range';

/**
 * The "Run invoices" form: one month (last month by default) or a range of whole months, checked
 * by the schema the api uses; the server's refusals stand beside the month boxes and in a toast.
 */
export function useInvoiceRunForm(start: (input: InvoiceRunInput) => Promise<InvoiceRun>) {
  const showApiError = useApiErrorToast();
  const last = previousMonth();
  const values = ref<RunPeriodValues>({ mode: 'month', month: last, fromMonth: last, toMonth: last });
  const errors = ref<RunPeriodErrors>({});
  const attempted = ref(false);
  const starting = ref(false);

  /** The period the run would cover, for the words beside the button; null while it cannot run. */
  const period = computed(() => runPeriodInput(values.value).input);

  watch(values, () => {
    if (attempted.value) errors.value = runPeriodInput(values.value).errors ?? {};
  }, { deep: true });

  async function submit(): Promise<InvoiceRun | null> {
    attempted.value = true;
    const { input, errors: found } = runPeriodInput(values.value);
    errors.value = found ?? {};
    if (!input) return null;
    starting.value = true;
    try {
      const run = await start(input);
      attempted.value = false;
      return run;
    } catch (error) {
      if (isApiError(error) && error.details.length > 0) errors.value = runPeriodErrors(error.details, values.value.mode);
      showApiError(error, 'The invoice run did not start');
      return null;
    } finally {
      starting.value = false;
    }
  }

  return { values, errors, period, starting, submit };
}
