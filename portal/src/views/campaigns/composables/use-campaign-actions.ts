import type { Campaign } from '@localis/shared';
import { ref, type Ref } from 'vue';
import { useApiErrorToast } from '../../../composables/use-api-error-toast';
import { useSuccessToast } from '../../../composables/use-success-toast';
import { useCampaignsStore } from '../../../stores/campaigns.store';
import { TRANSITIONS, type TransitionAction } from '../lib/campaign-transitions';

/**
 * The state changes of a campaign's page: `ask` opens the dialog for one, `confirm` makes it
 * with the optional note and says how it went; the store then holds the campaign as it now is.
 */
export function useCampaignActions(campaign: Ref<Campaign | null>) {
  const store = useCampaignsStore();
  const showApiError = useApiErrorToast();
  const showSuccess = useSuccessToast();

  const pending = ref<TransitionAction | null>(null);
  const busy = ref(false);

  const run: Record<TransitionAction, (id: string, note?: string) => Promise<Campaign>> = {
    submit: store.submit,
    withdraw: store.withdraw,
    'start-review': store.startReview,
  };

  function ask(action: TransitionAction): void {
    pending.value = action;
  }

  function cancel(): void {
    if (!busy.value) pending.value = null;
  }

  async function confirm(note?: string): Promise<void> {
    const action = pending.value;
    const current = campaign.value;
    if (!action || !current) return;
    busy.value = true;
    try {
      const updated = await run[action](current.id, note);
      pending.value = null;
      showSuccess(TRANSITIONS[action].success, updated.title);
    } catch (error) {
      showApiError(error, TRANSITIONS[action].failure);
      // Someone else may have moved it meanwhile (a 409): show the campaign as it now stands.
      pending.value = null;
      await store.loadCurrent(current.id).catch(() => undefined);
    } finally {
      busy.value = false;
    }
  }

  return { pending, busy, ask, cancel, confirm };
}
