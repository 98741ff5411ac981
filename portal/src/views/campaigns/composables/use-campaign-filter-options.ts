import { MAX_PAGE_SIZE, type ResearchGroup } from '@localis/shared';
import { computed, onMounted, ref } from 'vue';
import { groupsApi } from '../../../api/groups.api';
import { useApiErrorToast } from '../../../composables/use-api-error-toast';
import { useRoundOptions } from '../../../composables/use-round-options';

/**
 * The rounds and groups the campaigns table can be filtered by: every round, newest first, and
 * every group by name. Loaded once per visit of the page.
 */
export function useCampaignFilterOptions() {
  const groups = ref<ResearchGroup[]>([]);
  const showApiError = useApiErrorToast();
  const roundOptions = useRoundOptions();

  onMounted(() => {
    groupsApi
      .list({ limit: MAX_PAGE_SIZE, sort: 'name' })
      .then((page) => (groups.value = page.items))
      .catch((error) => showApiError(error, 'Research groups could not be loaded'));
  });

  const groupOptions = computed(() => groups.value.map((g) => ({ label: `${g.name} · ${g.institutionName}`, value: g.id })));

  return { roundOptions, groupOptions };
}
