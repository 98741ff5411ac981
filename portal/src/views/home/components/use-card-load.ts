import { onMounted, ref } from 'vue';
import { isApiError } from '../../../api/api-error';
import { useApiErrorToast } from '../../../composables/use-api-error-toast';

/** Loads a home card's data on mount; a failure is toasted and kept for the card's retry. */
export function useCardLoad(load: () => Promise<void>, what: string) {
  const loading = ref(true);
  const error = ref<string | null>(null);
  const showApiError = useApiErrorToast();

  async function run(): Promise<void> {
    loading.value = true;
    error.value = null;
    try {
      await load();
    } catch (e) {
      error.value = isApiError(e) ? e.message : `${what} could not be loaded.`;
      showApiError(e, `${what} could not be loaded`);
    } finally {
      loading.value = false;
    }
  }

  onMounted(run);
  return { loading, error, retry: run };
}
