import type { Analysis } from '@localis/shared';
import { computed, ref, watch, type Ref } from 'vue';
import { analysesApi } from '../../../../api/analyses.api';
import { archivesApi } from '../../../../api/archives.api';
import { useApiErrorToast } from '../../../../composables/use-api-error-toast';
import { usePolling } from '../../../../composables/use-polling';
import { isAbort, latestOnly } from '../../../../stores/latest-only';
import { isMoving, newestFirst } from '../../lib/analysis-state';

/** Every 2 s while an analysis waits or runs: the worker reports its fits as it goes. */
const POLL_MS = 2000;

/**
 * A campaign's analyses, newest first, kept live: while one is queued or running it is asked for
 * again every two seconds (only that one, not the whole list), until it is done or failed. With no
 * analysis at all, whether the campaign has a verified result archive yet tells the page what to
 * say (nothing to analyse, or the first analysis is on its way).
 */
export function useCampaignAnalyses(campaignId: Ref<string>) {
  const items = ref<Analysis[]>([]);
  const loaded = ref(false);
  const failed = ref(false);
  /** null until asked (only when there is no analysis). */
  const hasVerifiedArchive = ref<boolean | null>(null);
  const showApiError = useApiErrorToast();
  const latest = latestOnly();

  async function load(): Promise<void> {
    const { signal, isCurrent } = latest.begin();
    try {
      const { items: list } = await analysesApi.list(campaignId.value, signal);
      if (!isCurrent()) return;
      items.value = newestFirst(list);
      loaded.value = true;
      failed.value = false;
      if (list.length === 0) await checkArchives(signal, isCurrent);
    } catch (error) {
      if (isAbort(error) || !isCurrent()) return;
      showApiError(error, 'The analyses could not be loaded');
      failed.value = !loaded.value;
    }
  }

  async function checkArchives(signal: AbortSignal, isCurrent: () => boolean): Promise<void> {
    try {
      const { items: archives } = await archivesApi.list(campaignId.value, signal);
      if (isCurrent()) hasVerifiedArchive.value = archives.some((a) => a.kind === 'results' && a.state === 'verified' && !a.withdrawnAt);
    } catch {
      // Not knowing only changes the words of the empty state; the page says the general thing.
      if (isCurrent()) hasVerifiedArchive.value = null;
    }
  }

  /** An analysis the page started or heard of: shown at once, without waiting for a poll. */
  function put(analysis: Analysis): void {
    const known = items.value.some((a) => a.id === analysis.id);
    items.value = newestFirst(known ? items.value.map((a) => (a.id === analysis.id ? analysis : a)) : [analysis, ...items.value]);
  }

  const moving = computed(() => items.value.filter(isMoving));

  /** Asks for each unfinished analysis; a failed poll is tried again at the next tick, silently. */
  async function refreshMoving(): Promise<void> {
    const ids = moving.value.map((a) => a.id);
    const answers = await Promise.allSettled(ids.map((id) => analysesApi.get(id)));
    for (const answer of answers) if (answer.status === 'fulfilled') put(answer.value);
  }

  watch(
    campaignId,
    () => {
      loaded.value = false;
      items.value = [];
      hasVerifiedArchive.value = null;
      void load();
    },
    { immediate: true },
  );
  usePolling({ active: () => loaded.value && moving.value.length > 0, poll: refreshMoving, intervalMs: POLL_MS });

  return { items, loaded, failed, moving, hasVerifiedArchive, load, put };
}
