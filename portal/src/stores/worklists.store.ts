import type { CampaignSummary, Round } from '@localis/shared';
import { defineStore } from 'pinia';
import { ref } from 'vue';
import { campaignsApi, type CampaignsQuery } from '../api/campaigns.api';
import { roundsApi } from '../api/rounds.api';

/** The campaign lists a home page shows: what needs the person now. */
export type CampaignWorklist = 'drafts' | 'readyToSubmit' | 'awaitingReview' | 'inReview';

/** The filters and order of each list, as the campaigns table spells them. */
export const WORKLISTS: Record<CampaignWorklist, { filters: { scope?: string; state: string }; sort: string }> = {
  /** Your own drafts, the one touched last first. */
  drafts: { filters: { scope: 'mine', state: 'draft' }, sort: '-updatedAt' },
  /** Drafts in the groups you lead: a PI submits them. */
  readyToSubmit: { filters: { scope: 'my-groups', state: 'draft' }, sort: '-updatedAt' },
  /** Submitted and not yet taken into review: the longest waiting first. */
  awaitingReview: { filters: { state: 'submitted' }, sort: 'submittedAt' },
  /** In review with the committee: what a committee member reads and scores, oldest first. */
  inReview: { filters: { state: 'in-review' }, sort: 'submittedAt' },
};

export interface Worklist<T> {
  count: number;
  first: T[];
}

export const useWorklistsStore = defineStore('worklists', () => {
  const campaigns = ref<Partial<Record<CampaignWorklist, Worklist<CampaignSummary>>>>({});
  const openRounds = ref<Worklist<Round> | null>(null);

  /** How many campaigns are on one list, and the first few. */
  async function loadCampaigns(list: CampaignWorklist, limit = 5): Promise<void> {
    const { filters, sort } = WORKLISTS[list];
    const query: CampaignsQuery = { ...filters, sort, limit };
    const page = await campaignsApi.list(query);
    campaigns.value = { ...campaigns.value, [list]: { count: page.total, first: page.items } };
  }

  /** Rounds taking proposals now, the one closing soonest first. */
  async function loadOpenRounds(limit = 5): Promise<void> {
    const page = await roundsApi.list({ status: 'open', sort: 'closesAt', limit });
    openRounds.value = { count: page.total, first: page.items };
  }

  return { campaigns, openRounds, loadCampaigns, loadOpenRounds };
});
