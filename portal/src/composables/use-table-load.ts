import { watch, type Ref } from 'vue';
import { useApiErrorToast } from './use-api-error-toast';

/**
 * Loads a server-side table's page now and whenever its API query changes. A query the api would
 * refuse is not sent (`blocked`): the view says what is wrong instead. A failure is toasted.
 */
export function useTableLoad<Q>(options: {
  query: Readonly<Ref<Q>>;
  load: (query: Q) => Promise<void>;
  blocked?: () => boolean;
  failure: string;
}): void {
  const showApiError = useApiErrorToast();

  async function load(): Promise<void> {
    if (options.blocked?.()) return;
    try {
      await options.load(options.query.value);
    } catch (error) {
      showApiError(error, options.failure);
    }
  }

  // Compared as text: a recomputed query with the same values must not load again.
  watch(() => JSON.stringify(options.query.value), load, { immediate: true });
}
