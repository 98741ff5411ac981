import type { Campaign, RoundPool } from '@localis/shared';
import { ref, watch, type Ref } from 'vue';
import { useRoundsStore } from '../../../stores/rounds.store';

/**
 * The pool of the campaign's machine in its round, so the estimate can say what share of it the
 * request is. Only context: when the round cannot be read, the estimate simply goes without it.
 */
export function useCampaignPool(campaign: Ref<Campaign | null>) {
  const rounds = useRoundsStore();
  const pool = ref<RoundPool | null>(null);

  watch(
    () => (campaign.value ? `${campaign.value.roundId}/${campaign.value.machine}` : null),
    async (key) => {
      pool.value = null;
      const c = campaign.value;
      if (!key || !c) return;
      try {
        const round = await rounds.get(c.roundId);
        if (campaign.value?.roundId === round.id) pool.value = round.pools.find((p) => p.machine === c.machine) ?? null;
      } catch {
        // Without the round the estimate still stands; the share of the pool is left out.
      }
    },
    { immediate: true },
  );

  return pool;
}
