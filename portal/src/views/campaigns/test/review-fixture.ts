import type { Assignment, CampaignReviews } from '@localis/shared';
import { campaignFixture } from './campaign-fixture';

const CAMPAIGN_ID = campaignFixture().id;

/** A committee member's assignment to the fixture campaign, not reviewed yet. */
export function assignmentFixture(overrides: Partial<Assignment> = {}): Assignment {
  return {
    id: '7c6b5a49-3827-4165-9f4e-3d2c1b0a9f8e',
    campaignId: CAMPAIGN_ID,
    reviewerPersonId: '1f2e3d4c-5b6a-4798-8a7b-6c5d4e3f2a1b',
    reviewerName: 'Odile Brandt',
    reviewerInstitutionName: 'Kestrel University',
    state: 'assigned',
    conflictReason: null,
    assignedAt: '2027-01-20T09:00:00.000Z',
    review: null,
    ...overrides,
  };
}

/** GET /campaigns/:id/reviews of the fixture campaign as the committee sees it: nothing yet, nothing allowed. */
export function campaignReviewsFixture(overrides: Partial<CampaignReviews> = {}): CampaignReviews {
  return {
    campaignId: CAMPAIGN_ID,
    audience: 'committee',
    assignments: [],
    summary: null,
    feedback: [],
    decisionMessage: null,
    eligibleReviewers: [],
    can: { assign: false, review: false, declareConflict: false, decide: false },
    myAssignmentId: null,
    ...overrides,
  };
}
