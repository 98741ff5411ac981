import type { SpotCheck } from '@localis/shared';
import { computed, ref, watch, type Ref } from 'vue';
import { spotChecksApi } from '../../../../api/spot-checks.api';
import { usePolling } from '../../../../composables/use-polling';
import { isAbort, latestOnly } from '../../../../stores/latest-only';
import { isSpotCheckMoving } from '../../lib/spot-check-table';

/** Every 3 s while a spot-check waits or runs: a point takes the kernel up to twenty seconds. */
const POLL_MS = 3000;

/**
 * A campaign's reproducibility spot-checks, newest first, kept live: while one is queued or
 * running the list is asked for again every three seconds (the api has no route for one check),
 * until none is left moving. Polling stops with the page.
 */
export function useCampaignSpotChecks(campaignId: Ref<string>) {
  const items = ref<SpotCheck[]>([]);
  const loaded = ref(false);
  const failed = ref(false);
  const latest = latestOnly();

  /**
   * Asks for the list. A first load that fails says so in the section (with a way to try again);
   * a poll that fails keeps what is shown and is tried again at the next tick, silently.
   */
  async function load(): Promise<void> {
    const { signal, isCurrent } = latest.begin();
    try {
      const { items: list } = await spotChecksApi.list(campaignId.value, signal);
      if (!isCurrent()) return;
      items.value = [...list].sort((a, b) => b.createdAt.localeCompare(a.createdAt));
      loaded.value = true;
      failed.value = false;
    } catch (error) {
      if (isAbort(error) || !isCurrent()) return;
      failed.value = !loaded.value;
    }
  }

  const moving = computed(() => items.value.filter(isSpotCheckMoving));

  watch(
    campaignId,
    () => {
      loaded.value = false;
      failed.value = false;
      items.value = [];
      void load();
    },
    { immediate: true },
  );
  usePolling({ active: () => loaded.value && moving.value.length > 0, poll: load, intervalMs: POLL_MS });

  return { items, loaded, failed, moving, load };
}
