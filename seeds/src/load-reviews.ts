import type { Services } from '@localis/api/services';
import { ReviewAssignment } from '@localis/api/db';
import { ReviewInput } from '@localis/shared';
import { REVIEW_PLANS } from './reviews-scenario';
import { adminContext, personContext, scenarioPerson } from './seed-context';

export interface ReviewCounts {
  assignments: number;
  conflicts: number;
  reviews: number;
}

const findAssignment = (campaignId: string, reviewerPersonId: string) => ReviewAssignment.findOne({ where: { campaignId, reviewerPersonId } });

/**
 * The committee's part of a campaign's story, before the decision: the office assigns the
 * reviewers (the first assignment puts the proposal in review), members declare their conflicts,
 * reviewers write. Every step is looked up first (assignments have no fixed ids: one per
 * campaign and reviewer), so a load that stopped half-way finishes and a second changes nothing.
 * Returns false when the story has no review plan for the campaign.
 */
export async function loadReviews(services: Services, campaignId: string, requestedCoreHours: number, report: ReviewCounts): Promise<boolean> {
  const plan = REVIEW_PLANS.find((p) => p.campaignId === campaignId);
  if (!plan) return false;
  for (const a of plan.assignments) {
    if (await findAssignment(campaignId, a.reviewerId)) continue;
    await services.reviews.assign(adminContext(), campaignId, a.reviewerId);
    report.assignments++;
  }
  for (const c of plan.conflicts) {
    if (await findAssignment(campaignId, c.reviewerId)) continue;
    await services.reviews.declareConflict(personContext(scenarioPerson(c.reviewerId)), campaignId, c.reason);
    report.conflicts++;
  }
  for (const a of plan.assignments) {
    if (!a.review) continue;
    const assignment = (await findAssignment(campaignId, a.reviewerId))!;
    if (assignment.state === 'reviewed') continue;
    const { recommendedShare, ...review } = a.review;
    const input = ReviewInput.parse({ ...review, recommendedCoreHours: Math.round(requestedCoreHours * recommendedShare) });
    await services.reviews.submitReview(personContext(scenarioPerson(a.reviewerId)), campaignId, assignment.id, input);
    report.reviews++;
  }
  return true;
}
