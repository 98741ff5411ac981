import type { Campaign, CampaignInput, CampaignPatch, CampaignSummary } from '@localis/shared';
import { defineStore } from 'pinia';
import { ref } from 'vue';
import { campaignsApi } from '../api/campaigns.api';
import { isAbort, latestOnly } from './latest-only';
import { usePagedList } from './paged-list';

export const useCampaignsStore = defineStore('campaigns', () => {
  /** One page of a campaigns table. */
  const { items, total, loading, load } = usePagedList(campaignsApi.list);
  /** The campaign a detail or edit page shows. */
  const current = ref<Campaign | null>(null);
  const currentLoading = ref(false);
  const reads = latestOnly();

  /** Keeps the open campaign and its row in the table in step with the server's answer. */
  function remember(campaign: Campaign): Campaign {
    if (!current.value || current.value.id === campaign.id) current.value = campaign;
    items.value = items.value.map((c): CampaignSummary => (c.id === campaign.id ? summaryOf(campaign) : c));
    return campaign;
  }

  /** Loads one campaign into `current`; a newer load (another id) wins over an older one. */
  async function loadCurrent(id: string): Promise<Campaign | null> {
    const { signal, isCurrent } = reads.begin();
    if (current.value?.id !== id) current.value = null;
    currentLoading.value = true;
    try {
      const campaign = await campaignsApi.get(id, signal);
      if (!isCurrent()) return null;
      current.value = campaign;
      return campaign;
    } catch (error) {
      if (isAbort(error)) return null;
      throw error;
    } finally {
      if (isCurrent()) currentLoading.value = false;
    }
  }

  function forgetCurrent(): void {
    current.value = null;
  }

  async function create(input: CampaignInput): Promise<Campaign> {
    const campaign = await campaignsApi.create(input);
    current.value = campaign;
    items.value = [summaryOf(campaign), ...items.value];
    total.value += 1;
    return campaign;
  }

  const update = async (id: string, patch: CampaignPatch) => remember(await campaignsApi.update(id, patch));
  const submit = async (id: string, note?: string) => remember(await campaignsApi.submit(id, note));
  const withdraw = async (id: string, note?: string) => remember(await campaignsApi.withdraw(id, note));
  const startReview = async (id: string, note?: string) => remember(await campaignsApi.startReview(id, note));

  return { items, total, loading, current, currentLoading, load, loadCurrent, forgetCurrent, create, update, submit, withdraw, startReview };
});

/** A table row holds the summary only, not the spec, estimate and history of the full campaign. */
function summaryOf(c: Campaign): CampaignSummary {
  return {
    id: c.id,
    title: c.title,
    state: c.state,
    groupId: c.groupId,
    groupName: c.groupName,
    institutionName: c.institutionName,
    roundId: c.roundId,
    roundName: c.roundName,
    ownerPersonId: c.ownerPersonId,
    ownerName: c.ownerName,
    machine: c.machine,
    method: c.method,
    dimension: c.dimension,
    symmetryClass: c.symmetryClass,
    requestedCoreHours: c.requestedCoreHours,
    peakMemoryBytes: c.peakMemoryBytes,
    warningCount: c.warningCount,
    createdAt: c.createdAt,
    updatedAt: c.updatedAt,
    submittedAt: c.submittedAt,
  };
}
