import type { Campaign, CampaignReviews } from '@localis/shared';
import { flushPromises } from '@vue/test-utils';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { defineComponent, h } from 'vue';
import { jsonResponse as json } from '../../../test/fetch-stub';
import { mountPage, resetTestPage } from '../../../test/mount-in-app';
import { CAN_NOTHING as NO_CAN, campaignFixture, testRouter } from '../test/campaign-fixture';
import { assignmentFixture, campaignReviewsFixture } from '../test/review-fixture';
import CampaignReviewsPanel from './campaign-reviews-panel.vue';

const IN_REVIEW = campaignFixture({ state: 'in-review', grantedCoreHours: null, can: NO_CAN });

const REVIEWED = assignmentFixture({
  reviewerName: 'Tomas Vell',
  state: 'reviewed',
  review: {
    scores: { merit: 4, feasibility: 3, costJustification: 5 },
    toProposers: 'A clear plan.',
    confidential: 'The group used its last grant in full.',
    recommendedCoreHours: 900_000,
    submittedAt: '2027-02-01T10:00:00.000Z',
    updatedAt: '2027-02-01T10:00:00.000Z',
  },
});
const WAITING = assignmentFixture({ id: '8d7c6b5a-4938-4276-8a5f-4e3d2c1b0a9f' });

function reviews(overrides: Partial<CampaignReviews> = {}): CampaignReviews {
  return campaignReviewsFixture({
    assignments: [REVIEWED, WAITING],
    summary: { reviews: 1, meanScores: { merit: 4, feasibility: 3, costJustification: 5 }, meanRecommendedCoreHours: 900_000 },
    eligibleReviewers: [{ personId: '2a3b4c5d-6e7f-4809-9a1b-2c3d4e5f6a7b', name: 'Mira Solberg', institutionName: 'Kestrel University' }],
    ...overrides,
  });
}

let answer: CampaignReviews;

async function mountPanel(campaign: Campaign = IN_REVIEW) {
  vi.stubGlobal('fetch', vi.fn(() => Promise.resolve(json(200, answer))));
  const router = testRouter({ path: '/panel', component: defineComponent({ render: () => h(CampaignReviewsPanel, { campaign }) }) });
  return mountPage(router, '/panel');
}

describe('CampaignReviewsPanel', { timeout: 20_000 }, () => {
  beforeEach(() => {
    answer = reviews();
  });

  afterEach(resetTestPage);

  describe('the office', () => {
    it('should offer to assign, to remove only reviewers who have not reviewed, and to decide', async () => {
      answer = reviews({ can: { assign: true, review: false, declareConflict: false, decide: true } });
      const wrapper = await mountPanel();

      expect(wrapper.find('[data-testid="assign-reviewer"]').exists()).toBe(true);
      expect(wrapper.get(`[data-testid="assignment-${WAITING.id}"]`).find('[data-testid="remove-assignment"]').exists()).toBe(true);
      expect(wrapper.get(`[data-testid="assignment-${REVIEWED.id}"]`).find('[data-testid="remove-assignment"]').exists()).toBe(false);
      expect(wrapper.get('[data-testid="decide-campaign"]').attributes('href')).toBe(`/campaigns/${IN_REVIEW.id}/decision`);
    });

    it('should show the scores, the recommendation and the confidential comments marked as such', async () => {
      answer = reviews({ can: { assign: true, review: false, declareConflict: false, decide: true } });
      const wrapper = await mountPanel();
      const card = wrapper.get(`[data-testid="assignment-${REVIEWED.id}"]`);

      expect(card.get('[data-testid="score-merit"]').text()).toContain('4 of 5 · very good');
      expect(card.text()).toContain('Recommends 900 k core-hours');
      expect(card.get('[data-testid="confidential-comment"]').text()).toContain('Confidential · committee and office only');
      expect(wrapper.get('[data-testid="mean-recommended"]').text()).toContain('72 % of the request');
    });
  });

  describe('a committee member', () => {
    it('should show the review form for their own assignment and leave it out of the list', async () => {
      answer = reviews({ myAssignmentId: WAITING.id, can: { assign: false, review: true, declareConflict: true, decide: false } });
      const wrapper = await mountPanel();

      expect(wrapper.find('[data-testid="review-form"]').exists()).toBe(true);
      expect(wrapper.find(`[data-testid="assignment-${WAITING.id}"]`).exists()).toBe(false);
      expect(wrapper.find(`[data-testid="assignment-${REVIEWED.id}"]`).exists()).toBe(true);
      expect(wrapper.find('[data-testid="assign-reviewer"]').exists()).toBe(false);
      expect(wrapper.find('[data-testid="decide-campaign"]').exists()).toBe(false);
    });

    it('should open the conflict dialog when a member declares a conflict of interest', async () => {
      answer = reviews({ can: { assign: false, review: false, declareConflict: true, decide: false } });
      const wrapper = await mountPanel();

      await wrapper.get('[data-testid="declare-conflict"]').trigger('click');
      await flushPromises();

      expect(document.querySelector('[data-testid="conflict-reason"]')).not.toBeNull();
    });

    it('should say so and show no form when the member declared a conflict', async () => {
      const mine = { ...WAITING, state: 'conflict' as const, conflictReason: 'Co-author of the PI in 2026' };
      answer = reviews({ assignments: [REVIEWED, mine], myAssignmentId: mine.id, can: { assign: false, review: false, declareConflict: false, decide: false } });
      const wrapper = await mountPanel();

      expect(wrapper.get('[data-testid="my-conflict"]').text()).toContain('Co-author of the PI in 2026');
      expect(wrapper.find('[data-testid="review-form"]').exists()).toBe(false);
    });

    it('should not double the full stop when the member ended the reason with one', async () => {
      const mine = { ...WAITING, state: 'conflict' as const, conflictReason: 'We calibrate.' };
      answer = reviews({ assignments: [REVIEWED, mine], myAssignmentId: mine.id, can: { assign: false, review: false, declareConflict: false, decide: false } });
      const wrapper = await mountPanel();

      expect(wrapper.get('[data-testid="my-conflict"]').text()).toContain('We calibrate. You do not review this proposal.');
    });
  });

  describe('the proposers', () => {
    it('should say when reviews will be shown when the proposal is not decided yet', async () => {
      answer = reviews({ audience: 'proposers', assignments: [], summary: null, eligibleReviewers: [] });
      const wrapper = await mountPanel();

      expect(wrapper.get('[data-testid="reviews-after-decision"]').text()).toContain('once the office has decided');
      expect(wrapper.text()).not.toContain('Tomas Vell');
    });

    it('should show the decision message and the anonymous feedback after the decision', async () => {
      answer = reviews({
        audience: 'proposers',
        assignments: [],
        summary: null,
        eligibleReviewers: [],
        decisionMessage: 'Granted in part: drop L = 24.',
        feedback: [{ scores: { merit: 4, feasibility: 3, costJustification: 5 }, toProposers: 'A clear plan.' }],
      });
      const wrapper = await mountPanel(campaignFixture({ state: 'partly-granted', grantedCoreHours: 600_000, can: NO_CAN }));

      expect(wrapper.get('[data-testid="decision-message"]').text()).toContain('Granted in part: drop L = 24.');
      expect(wrapper.get('[data-testid="feedback-1"]').text()).toContain('A clear plan.');
      expect(wrapper.get('[data-testid="feedback-1"]').get('[data-testid="score-costJustification"]').text()).toContain('5 of 5');
    });
  });

  describe('withdrawn campaigns', () => {
    it('should tell the proposers there are no reviews rather than promise them after a decision', async () => {
      answer = reviews({ audience: 'proposers', assignments: [], summary: null, eligibleReviewers: [] });
      const wrapper = await mountPanel(campaignFixture({ state: 'withdrawn', grantedCoreHours: null, can: NO_CAN }));

      expect(wrapper.find('[data-testid="reviews-withdrawn"]').exists()).toBe(true);
      expect(wrapper.find('[data-testid="reviews-after-decision"]').exists()).toBe(false);
    });
  });

  describe('drafts', () => {
    it('should show nothing and ask for nothing when the campaign is a draft', async () => {
      const wrapper = await mountPanel(campaignFixture({ state: 'draft', grantedCoreHours: null, can: NO_CAN }));

      expect(wrapper.find('[data-testid="reviews-panel"]').exists()).toBe(false);
      expect(vi.mocked(fetch)).not.toHaveBeenCalled();
    });
  });
});
