import type { Archive } from '@localis/shared';
import { computed, ref, watch, type Ref } from 'vue';
import { archivesApi } from '../../../api/archives.api';
import { useApiErrorToast } from '../../../composables/use-api-error-toast';
import { usePolling } from '../../../composables/use-polling';
import { isAbort, latestOnly } from '../../../stores/latest-only';
import { MOVING_STATES } from '../lib/archive-format';

/** Every 2 s while an archive waits for or is in its check: the worker takes seconds, not minutes. */
const POLL_MS = 2000;

/**
 * A campaign's archives, newest first, kept live: while any is waiting for or in its check, the list is asked for again every two seconds, and the asking stops once all are settled.
 */
export function useCampaignArchives(campaignId: Ref<string>) {
  const items = ref<Archive[]>([]);
  const loaded = ref(false);
  const failed = ref(false);
  const showApiError = useApiErrorToast();
  const latest = latestOnly();

  async function load(): Promise<void> {
    const { signal, isCurrent } = latest.begin();
    try {
      const { items: list } = await archivesApi.list(campaignId.value, signal);
      if (!isCurrent()) return;
      items.value = [...list].sort((a, b) => b.createdAt.localeCompare(a.createdAt));
      loaded.value = true;
      failed.value = false;
    } catch (error) {
      if (isAbort(error) || !isCurrent()) return;
      // A failed poll says nothing until it happens on a page that shows nothing yet.
      if (!loaded.value) showApiError(error, 'The archives could not be loaded');
      failed.value = !loaded.value;
    }
  }

  /** An archive the page changed (completed, withdrawn): shown at once, without waiting for a poll. */
  function put(archive: Archive): void {
    const known = items.value.some((a) => a.id === archive.id);
    items.value = known ? items.value.map((a) => (a.id === archive.id ? archive : a)) : [archive, ...items.value];
  }

  // Received and checking archives settle within seconds. An upload from another browser changes
  // only when that browser completes it (or cancels, or a week passes), so it is not polled for.
  const moving = computed(() => items.value.some((a) => MOVING_STATES.includes(a.state) && a.state !== 'uploading'));

  watch(
    campaignId,
    () => {
      loaded.value = false;
      items.value = [];
      void load();
    },
    { immediate: true },
  );
  usePolling({ active: () => loaded.value && moving.value, poll: load, intervalMs: POLL_MS });

  return { items, loaded, failed, moving, load, put };
}
