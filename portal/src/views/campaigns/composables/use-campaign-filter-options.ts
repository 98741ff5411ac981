import { MAX_PAGE_SIZE, type ResearchGroup, type Round } from '@localis/shared';
import { computed, onMounted, ref } from 'vue';
import { groupsApi } from '../../../api/groups.api';
import { roundsApi } from '../../../api/rounds.api';
import { useApiErrorToast } from '../../../composables/use-api-error-toast';

/**
 * The rounds and groups the campaigns table can be filtered by: every round (a draft may sit in
 * a closed one), newest first, and every group by name. Loaded once per visit of the page.
 */
export function useCampaignFilterOptions() {
  const rounds = ref<Round[]>([]);
  const groups = ref<ResearchGroup[]>([]);
  const showApiError = useApiErrorToast();

  onMounted(() => {
    roundsApi
      .list({ limit: MAX_PAGE_SIZE, sort: '-opensAt' })
      .then((page) => (rounds.value = page.items))
      .catch((error) => showApiError(error, 'Rounds could not be loaded'));
    groupsApi
      .list({ limit: MAX_PAGE_SIZE, sort: 'name' })
      .then((page) => (groups.value = page.items))
      .catch((error) => showApiError(error, 'Research groups could not be loaded'));
  });

  const roundOptions = computed(() => rounds.value.map((r) => ({ label: r.name, value: r.id })));
  const groupOptions = computed(() => groups.value.map((g) => ({ label: `${g.name} · ${g.institutionName}`, value: g.id })));

  return { roundOptions, groupOptions };
}
