import { MAX_PAGE_SIZE, type Round } from '@localis/shared';
import { computed, onMounted, ref } from 'vue';
import { roundsApi } from '../api/rounds.api';
import { useApiErrorToast } from './use-api-error-toast';

/**
 * Every round, newest first, as options of a round filter (a draft may sit in a closed round, so
 * closed ones count too). Loaded once per visit of the page.
 */
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
