import type { Assignment, Campaign, CampaignReviews, CommitteeQueueItem, DecisionInput, PoolUsage, ReviewInput } from '@localis/shared';
import { defineStore } from 'pinia';
import { ref } from 'vue';
import { reviewsApi, type CommitteeQueueParams } from '../api/reviews.api';
import { isAbort, latestOnly } from './latest-only';
import { useShownRecord } from './shown-record';
import { useWholeList } from './whole-list';

export const useReviewsStore = defineStore('reviews', () => {
  /** The committee queue as last loaded (the whole list: the api does not page it). */
  const { items: queue, loading: queueLoading, load: loadQueue } = useWholeList<CommitteeQueueItem, CommitteeQueueParams>(reviewsApi.queue);
  /** The reviews of the campaign a page shows, in the form meant for the caller. */
  const { current, loading: currentLoading, load: loadForCampaign } = useShownRecord(reviewsApi.forCampaign, (reviews: CampaignReviews) => reviews.campaignId);
  /** The pool the decision screen weighs a grant against, and the campaign it was read for. */
  const pool = ref<PoolUsage | null>(null);
  const poolCampaignId = ref<string | null>(null);
  const poolReads = latestOnly();

  async function loadPool(campaignId: string): Promise<PoolUsage | null> {
    const { signal, isCurrent } = poolReads.begin();
    // Read again for the same campaign, the old figures stay until the new ones arrive.
    if (poolCampaignId.value !== campaignId) pool.value = null;
    try {
      const answer = await reviewsApi.pool(campaignId, signal);
      if (!isCurrent()) return null;
      pool.value = answer;
      poolCampaignId.value = campaignId;
      return answer;
    } catch (error) {
      if (isAbort(error)) return null;
      throw error;
    }
  }

  /** Puts a changed assignment in place at once, so the page does not wait for the re-read. */
  function remember(changed: Assignment): Assignment {
    const reviews = current.value;
    if (reviews?.campaignId === changed.campaignId) {
      const known = reviews.assignments.some((a) => a.id === changed.id);
      current.value = {
        ...reviews,
        assignments: known ? reviews.assignments.map((a) => (a.id === changed.id ? changed : a)) : [...reviews.assignments, changed],
      };
    }
    return changed;
  }

  /**
   * After a write, the summary, the permissions and who is still eligible change on the server
   * too: read them again. The write itself succeeded, so a failed re-read is not reported as
   * its failure; the page keeps what `remember` put in place.
   */
  async function refresh(campaignId: string): Promise<void> {
    try {
      await loadForCampaign(campaignId);
    } catch {
      // The next visit of the page reads the reviews again.
    }
  }

  async function assign(campaignId: string, reviewerPersonId: string): Promise<Assignment> {
    const created = remember(await reviewsApi.assign(campaignId, reviewerPersonId));
    await refresh(campaignId);
    return created;
  }

  async function unassign(campaignId: string, assignmentId: string): Promise<void> {
    await reviewsApi.unassign(campaignId, assignmentId);
    if (current.value?.campaignId === campaignId) {
      current.value = { ...current.value, assignments: current.value.assignments.filter((a) => a.id !== assignmentId) };
    }
    await refresh(campaignId);
  }

  async function declareConflict(campaignId: string, reason: string): Promise<Assignment> {
    const declared = remember(await reviewsApi.declareConflict(campaignId, reason));
    await refresh(campaignId);
    return declared;
  }

  async function submitReview(campaignId: string, assignmentId: string, input: ReviewInput): Promise<Assignment> {
    const saved = remember(await reviewsApi.submitReview(campaignId, assignmentId, input));
    await refresh(campaignId);
    return saved;
  }

  /** Records the office's decision; the decided campaign comes back. Reviews and pool are re-read by the pages that show them. */
  async function decide(campaignId: string, input: DecisionInput): Promise<Campaign> {
    const decided = await reviewsApi.decide(campaignId, input);
    if (current.value?.campaignId === campaignId) current.value = null;
    pool.value = null;
    poolCampaignId.value = null;
    return decided;
  }

  return {
    queue,
    queueLoading,
    current,
    currentLoading,
    pool,
    poolCampaignId,
    loadQueue,
    loadForCampaign,
    loadPool,
    assign,
    unassign,
    declareConflict,
    submitReview,
    decide,
  };
});
