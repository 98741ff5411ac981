import { ref, type Ref } from 'vue';
import { isAbort, latestOnly } from './latest-only';

/**
 * A list the api answers whole (it does not page it) inside a setup store: items and loading,
 * filled by `load`. A newer query wins over an older answer still on its way.
 */
export function useWholeList<T, Q>(fetchList: (query: Q, signal: AbortSignal) => Promise<{ items: T[] }>) {
  const items = ref([]) as Ref<T[]>;
  const loading = ref(false);
  const lists = latestOnly();

  async function load(query: Q): Promise<void> {
    const { signal, isCurrent } = lists.begin();
    loading.value = true;
    try {
      const answer = await fetchList(query, signal);
      if (isCurrent()) items.value = answer.items;
    } catch (error) {
      if (isAbort(error)) return;
      throw error;
    } finally {
      if (isCurrent()) loading.value = false;
    }
  }

  return { items, loading, load };
}
