import type { Page } from '@localis/shared';
import { ref, type Ref } from 'vue';
import { isAbort, latestOnly } from './latest-only';

/**
 * The page of a server-side table inside a setup store: items, total and loading, filled by
 * `load`. Loads can overlap (a person pages quickly); only the latest answer lands.
 */
export function usePagedList<T, Q>(fetchPage: (query: Q, signal: AbortSignal) => Promise<Page<T>>) {
  const items = ref([]) as Ref<T[]>;
  const total = ref(0);
  const loading = ref(false);
  const lists = latestOnly();

  async function load(query: Q): Promise<void> {
    const { signal, isCurrent } = lists.begin();
    loading.value = true;
    try {
      const page = await fetchPage(query, signal);
      if (!isCurrent()) return;
      items.value = page.items;
      total.value = page.total;
    } catch (error) {
      if (isAbort(error)) return;
      throw error;
    } finally {
      if (isCurrent()) loading.value = false;
    }
  }

  return { items, total, loading, load };
}
