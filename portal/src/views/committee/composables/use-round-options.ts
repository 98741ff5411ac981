import { MAX_PAGE_SIZE, type Round } from '@localis/shared';
import { computed, onMounted, ref } from 'vue';
import { roundsApi } from '../../../api/rounds.api';
import { useApiErrorToast } from '../../../composables/use-api-error-toast';

/** Every round, newest first, for the queue's round filter. Loaded once per visit of the page. */
export function useRoundOptions() {
  const rounds = ref<Round[]>([]);
  const showApiError = useApiErrorToast();

  onMounted(() => {
    roundsApi
      .list({ limit: MAX_PAGE_SIZE, sort: '-opensAt' })
      .then((page) => (rounds.value = page.items))
      .catch((error) => showApiError(error, 'Rounds could not be loaded'));
  });

  return computed(() => rounds.value.map((r) => ({ label: r.name, value: r.id })));
}
