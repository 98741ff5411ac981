import { computed, ref, watch, type Ref } from 'vue';
import { isAbort, latestOnly } from '../stores/latest-only';
import { usePolling } from './use-polling';

/**
 * A list the worker changes behind the page (a campaign's archives, its spot-checks), newest
 * first and kept live: loaded now and whenever `owner` changes, then asked for again every
 * `intervalMs` while some item is still moving, until none is. Only the latest answer lands;
 * polling stops with the component.
 *
 * A first load that fails sets `failed` (the page offers `load` to try again) and is handed to
 * `onFirstLoadFailure`; a poll that fails keeps what is shown and is tried again at the next tick.
 */
export function usePolledList<T extends { createdAt: string }>(options: {
  owner: Ref<string>;
  fetchList: (owner: string, signal: AbortSignal) => Promise<{ items: readonly T[] }>;
  isMoving: (item: T) => boolean;
  intervalMs: number;
  onFirstLoadFailure?: (error: unknown) => void;
}) {
  const items = ref([]) as Ref<T[]>;
  const loaded = ref(false);
  const failed = ref(false);
  const latest = latestOnly();

  async function load(): Promise<void> {
    const { signal, isCurrent } = latest.begin();
    try {
      const { items: list } = await options.fetchList(options.owner.value, signal);
      if (!isCurrent()) return;
      items.value = [...list].sort((a, b) => b.createdAt.localeCompare(a.createdAt));
      loaded.value = true;
      failed.value = false;
    } catch (error) {
      if (isAbort(error) || !isCurrent()) return;
      if (!loaded.value) options.onFirstLoadFailure?.(error);
      failed.value = !loaded.value;
    }
  }

  const moving = computed(() => items.value.filter(options.isMoving));

  watch(
    options.owner,
    () => {
      loaded.value = false;
      failed.value = false;
      items.value = [];
      void load();
    },
    { immediate: true },
  );
  usePolling({ active: () => loaded.value && moving.value.length > 0, poll: load, intervalMs: options.intervalMs });

  return { items, loaded, failed, moving, load };
}
