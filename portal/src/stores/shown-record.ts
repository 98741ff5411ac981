import { ref, type Ref } from 'vue';
import { isAbort, latestOnly } from './latest-only';

/**
 * The one record a page shows, inside a setup store: `current` and its loading flag, filled by
 * `load(key)`. Read again for the same key (a refresh) the record stays shown meanwhile; for
 * another key it is dropped at once, so a page never shows one record under another's address.
 * A newer load wins over an older answer still on its way.
 */
export function useShownRecord<T, K>(fetchOne: (key: K, signal: AbortSignal) => Promise<T>, keyOf: (record: T) => K) {
  const current = ref(null) as Ref<T | null>;
  const loading = ref(false);
  const reads = latestOnly();

  /** The record read, or null when a newer load overtook this one or it was aborted. */
  async function load(key: K): Promise<T | null> {
    const { signal, isCurrent } = reads.begin();
    if (current.value !== null && keyOf(current.value) !== key) current.value = null;
    loading.value = true;
    try {
      const answer = await fetchOne(key, signal);
      if (!isCurrent()) return null;
      current.value = answer;
      return answer;
    } catch (error) {
      if (isAbort(error)) return null;
      throw error;
    } finally {
      if (isCurrent()) loading.value = false;
    }
  }

  return { current, loading, load };
}
