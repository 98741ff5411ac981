import type { Assignment, Campaign, CampaignReviews, CommitteeQueue, DecisionInput, PoolUsage, ReviewInput } from '@localis/shared';
import { http, type QueryParams } from './http-client';

/** Query of GET /committee/queue as the portal sends it. */
export interface CommitteeQueueParams extends QueryParams {
  /** mine (assigned to the caller) or all (everything in front of the committee). */
  scope?: 'mine' | 'all';
  roundId?: string;
}

const campaign = (id: string) => `/campaigns/${encodeURIComponent(id)}`;
const assignment = (campaignId: string, assignmentId: string) => `${campaign(campaignId)}/assignments/${encodeURIComponent(assignmentId)}`;

/** The committee's work on proposals: who reviews what, the reviews, and the office's decision. */
export const reviewsApi = {
  queue: (query: CommitteeQueueParams, signal?: AbortSignal) => http.get<CommitteeQueue>('/committee/queue', query, signal),
  /** Content depends on who asks: the committee and office see every review, proposers the feedback after the decision. */
  forCampaign: (campaignId: string, signal?: AbortSignal) => http.get<CampaignReviews>(`${campaign(campaignId)}/reviews`, undefined, signal),
  assign: (campaignId: string, reviewerPersonId: string) => http.post<Assignment>(`${campaign(campaignId)}/assignments`, { reviewerPersonId }),
  unassign: (campaignId: string, assignmentId: string) => http.delete(assignment(campaignId, assignmentId)),
  /** The caller declares their own conflict of interest with the proposal. */
  declareConflict: (campaignId: string, reason: string) => http.post<Assignment>(`${campaign(campaignId)}/conflict`, { reason }),
  submitReview: (campaignId: string, assignmentId: string, input: ReviewInput) =>
    http.put<Assignment>(`${assignment(campaignId, assignmentId)}/review`, input),
  /** The pool of the campaign's round on its machine, and how much of it is granted already. */
  pool: (campaignId: string, signal?: AbortSignal) => http.get<PoolUsage>(`${campaign(campaignId)}/pool`, undefined, signal),
  decide: (campaignId: string, input: DecisionInput) => http.post<Campaign>(`${campaign(campaignId)}/decision`, input),
};
