import { MAX_PAGE_SIZE, type Run } from '@localis/shared';
import { computed, onBeforeUnmount, ref } from 'vue';
import { runsApi } from '../../../api/runs.api';
import { isAbort, latestOnly } from '../../../stores/latest-only';
import { formatCoreHoursPrecise } from '../../../lib/units';
import { refundableCoreHours } from '../lib/refund';

/**
 * The campaign's latest runs that still have core-hours to give back, for the refund dialog.
 * When the campaign has more runs than one read brings, typing a job id asks the server.
 */
export function useRefundableRuns() {
  const runs = ref<Run[]>([]);
  const loading = ref(false);
  /** More runs exist than were read: the person may need the job id search. */
  const truncated = ref(false);
  const reads = latestOnly();
  let timer: ReturnType<typeof setTimeout> | undefined;

  async function load(campaignId: string, q?: string): Promise<void> {
    const { signal, isCurrent } = reads.begin();
    loading.value = true;
    try {
      const page = await runsApi.list(campaignId, { limit: MAX_PAGE_SIZE, sort: '-startedAt', q: q || undefined }, signal);
      if (!isCurrent()) return;
      const found = page.items.filter((r) => refundableCoreHours(r) > 0);
      if (q) {
        // Found runs join those already listed, so a run chosen before the search stays chosen.
        const byId = new Map([...runs.value, ...found].map((r) => [r.id, r]));
        runs.value = [...byId.values()].sort((a, b) => b.startedAt.localeCompare(a.startedAt));
      } else {
        runs.value = found;
        // Only the unfiltered list says whether the search is needed at all.
        truncated.value = page.total > page.items.length;
      }
    } catch (error) {
      if (!isAbort(error)) throw error;
    } finally {
      if (isCurrent()) loading.value = false;
    }
  }

  /** A search typed in the picker, sent after a pause; only needed when the list was cut short. */
  function search(campaignId: string, q: string, onError: (error: unknown) => void): void {
    if (!truncated.value) return;
    clearTimeout(timer);
    timer = setTimeout(() => load(campaignId, q.trim()).catch(onError), 350);
  }

  onBeforeUnmount(() => clearTimeout(timer));

  const options = computed(() =>
    runs.value.map((r) => ({ label: `${r.externalJobId} · ${r.codeName} · ${formatCoreHoursPrecise(refundableCoreHours(r))} refundable`, value: r.id })),
  );

  return { runs, options, loading, truncated, load, search };
}
