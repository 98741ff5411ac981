import { computed, ref, watch, type Ref } from 'vue';
import { isApiError } from '../../../api/api-error';
import { useApiErrorToast } from '../../../composables/use-api-error-toast';
import { useCampaignsStore } from '../../../stores/campaigns.store';

/**
 * The campaign a page under /campaigns/:id shows (ledger, runs, import): loaded into the
 * campaigns store, with "not found" told apart from a failure so the page can say which.
 */
export function useCampaignPage(id: Ref<string>, pageTitle: string) {
  const store = useCampaignsStore();
  const showApiError = useApiErrorToast();
  const failure = ref<'not-found' | 'failed' | null>(null);

  const campaign = computed(() => (store.current?.id === id.value ? store.current : null));

  async function load(): Promise<void> {
    failure.value = null;
    try {
      await store.loadCurrent(id.value);
    } catch (error) {
      failure.value = isApiError(error) && error.status === 404 ? 'not-found' : 'failed';
      if (failure.value === 'failed') showApiError(error, 'The campaign could not be loaded');
    }
  }

  watch(id, load, { immediate: true });
  watch(campaign, (c) => {
    if (c) document.title = `${pageTitle}: ${c.title} · Localis`;
  });

  return { campaign, failure, load };
}
