import type { InvoiceRun, InvoiceRunInput } from '@localis/shared';
import { computed, ref, watch } from 'vue';
import { invoiceRunsApi } from '../../../api/invoice-runs.api';
import { useApiErrorToast } from '../../../composables/use-api-error-toast';
import { usePolledList } from '../../../composables/use-polled-list';

/** Every 2 s while a run is queued or running: the worker drafts a month's invoices in seconds. */
export const RUNS_POLL_MS = 2000;

const isMoving = (run: InvoiceRun) => run.state === 'queued' || run.state === 'running';

/**
 * The office's invoice runs, newest first, kept live while one is queued or running.
 * `onSettled` is told when a run the page saw moving has finished, so the invoices can be read again.
 */
export function useInvoiceRuns(onSettled: (run: InvoiceRun) => void) {
  const showApiError = useApiErrorToast();
  // The runs are the office's, not any one record's: one fixed owner for the polled list.
  const owner = ref('office');
  const list = usePolledList<InvoiceRun>({
    owner,
    fetchList: (_owner, signal) => invoiceRunsApi.list(signal),
    isMoving,
    intervalMs: RUNS_POLL_MS,
    onFirstLoadFailure: (error) => showApiError(error, 'The invoice runs could not be loaded'),
  });
  const { items } = list;

  watch(
    () => list.moving.value.map((r) => r.id),
    (now, before) => {
      for (const id of before ?? []) {
        const settled = !now.includes(id) && items.value.find((r) => r.id === id);
        if (settled) onSettled(settled);
      }
    },
  );

  /** A run the page started: shown at once, and its polling starts with it. */
  function put(run: InvoiceRun): void {
    const known = items.value.some((r) => r.id === run.id);
    items.value = known ? items.value.map((r) => (r.id === run.id ? run : r)) : [run, ...items.value];
  }

  async function start(input: InvoiceRunInput): Promise<InvoiceRun> {
    const run = await invoiceRunsApi.start(input);
    put(run);
    return run;
  }

  return { ...list, moving: computed(() => list.moving.value.length > 0), start };
}
