import { computed, onMounted } from 'vue';
import { useApiErrorToast } from '../../../composables/use-api-error-toast';
import { useInstitutionsStore } from '../../../stores/institutions.store';

/** The paying partners by name, as options of the office's partner filter. Loaded once per visit. */
export function usePartnerOptions(enabled: () => boolean) {
  const institutions = useInstitutionsStore();
  const showApiError = useApiErrorToast();

  onMounted(() => {
    if (!enabled()) return;
    institutions.loadOptions().catch((error) => showApiError(error, 'The partner institutions could not be loaded'));
  });

  return computed(() => institutions.options.filter((i) => i.kind === 'partner').map((i) => ({ label: i.name, value: i.id })));
}
