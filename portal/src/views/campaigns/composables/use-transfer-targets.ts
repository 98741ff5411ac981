import { MAX_PAGE_SIZE, type Campaign, type CampaignSummary } from '@localis/shared';
import { computed, ref } from 'vue';
import { campaignsApi } from '../../../api/campaigns.api';
import { GRANTED_STATES } from '../lib/ledger-permissions';

/**
 * The campaigns a transfer may go to: the other granted campaigns of the same group. The list
 * filters one state at a time, so granted and partly granted are asked for side by side.
 */
export function useTransferTargets() {
  const targets = ref<CampaignSummary[]>([]);
  const loading = ref(false);

  async function load(from: Campaign): Promise<void> {
    loading.value = true;
    try {
      const pages = await Promise.all(
        GRANTED_STATES.map((state) => campaignsApi.list({ groupId: from.groupId, state, limit: MAX_PAGE_SIZE, sort: 'title' })),
      );
      targets.value = pages
        .flatMap((p) => p.items)
        .filter((c) => c.id !== from.id)
        .sort((a, b) => a.title.localeCompare(b.title));
    } finally {
      loading.value = false;
    }
  }

  const options = computed(() => targets.value.map((c) => ({ label: `${c.title} · ${c.roundName}`, value: c.id })));

  return { targets, options, loading, load };
}
