import { computed, ref, watch, type Ref } from 'vue';
import { isApiError } from '../../../api/api-error';
import { useApiErrorToast } from '../../../composables/use-api-error-toast';
import { useCampaignsStore } from '../../../stores/campaigns.store';

/**
 * The campaign a page under /campaigns/:id shows (its own, decision, ledger, runs, import): loaded into the
 * campaigns store, with "not found" told apart from a failure so the page can say which.
 * The window is titled "<pageTitle>: <campaign title>", or the campaign's title alone on its own
 * page (pageTitle null). `afterLoad` runs once the campaign is there, for what else the page needs.
 */
export function useCampaignPage(id: Ref<string>, pageTitle: string | null, afterLoad?: () => Promise<void>) {
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
      return;
    }
    await afterLoad?.();
  }

  watch(id, load, { immediate: true });
  watch(campaign, (c) => {
    if (c) document.title = `${pageTitle ? `${pageTitle}: ` : ''}${c.title} · Localis`;
  });

  return { campaign, failure, load };
}
