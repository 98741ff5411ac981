import type { Archive } from '@localis/shared';
import { computed, type Ref } from 'vue';
import { archivesApi } from '../../../api/archives.api';
import { useApiErrorToast } from '../../../composables/use-api-error-toast';
import { usePolledList } from '../../../composables/use-polled-list';
import { MOVING_STATES } from '../lib/archive-format';

/** Every 2 s while an archive waits for or is in its check: the worker takes seconds, not minutes. */
const POLL_MS = 2000;

/**
 * Received and checking archives settle within seconds. An upload from another browser changes
 * only when that browser completes it (or cancels, or a week passes), so it is not polled for.
 */
function isSettling(archive: Archive): boolean {
  return MOVING_STATES.includes(archive.state) && archive.state !== 'uploading';
}

/**
 * A campaign's archives, newest first, kept live: while any is waiting for or in its check, the list is asked for again every two seconds, and the asking stops once all are settled.
 */
export function useCampaignArchives(campaignId: Ref<string>) {
  const showApiError = useApiErrorToast();
  const list = usePolledList<Archive>({
    owner: campaignId,
    fetchList: (id, signal) => archivesApi.list(id, signal),
    isMoving: isSettling,
    intervalMs: POLL_MS,
    // Toasted only while the page shows nothing yet: a failed poll keeps quiet.
    onFirstLoadFailure: (error) => showApiError(error, 'The archives could not be loaded'),
  });
  const { items } = list;

  /** An archive the page changed (completed, withdrawn): shown at once, without waiting for a poll. */
  function put(archive: Archive): void {
    const known = items.value.some((a) => a.id === archive.id);
    items.value = known ? items.value.map((a) => (a.id === archive.id ? archive : a)) : [archive, ...items.value];
  }

  return { ...list, moving: computed(() => list.moving.value.length > 0), put };
}
