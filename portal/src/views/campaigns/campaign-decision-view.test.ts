import type { Campaign, CampaignReviews, PoolUsage } from '@localis/shared';
import { flushPromises } from '@vue/test-utils';
import { afterEach, describe, expect, it } from 'vitest';
import { jsonResponse as json, notServed, stubFetch } from '../../test/fetch-stub';
import { mountPage, resetTestPage } from '../../test/mount-in-app';
import CampaignDecisionView from './campaign-decision-view.vue';
import { CAN_NOTHING, campaignFixture, testRouter } from './test/campaign-fixture';
import { campaignReviewsFixture } from './test/review-fixture';

const DECIDABLE = { ...CAN_NOTHING, withdraw: true, decide: true };
const POOL: PoolUsage = {
  roundId: '9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d',
  machine: 'cluster-a',
  pool: 5_000_000,
  granted: 3_000_000,
  used: 0,
  remaining: 3_000_000,
  unallocated: 2_000_000,
  groups: [],
};

let campaign: Campaign;

function reviews(): CampaignReviews {
  return campaignReviewsFixture({
    summary: { reviews: 2, meanScores: { merit: 4.5, feasibility: 3.5, costJustification: 4 }, meanRecommendedCoreHours: 1_000_000 },
    can: { assign: true, review: false, declareConflict: false, decide: true },
  });
}

function serve(url: string, init?: RequestInit): Response {
  const base = `/api/v1/campaigns/${campaign.id}`;
  if (url === `${base}/decision` && init?.method === 'POST') return json(200, { ...campaign, state: 'declined', grantedCoreHours: 0 });
  if (url === `${base}/reviews`) return json(200, reviews());
  if (url === `${base}/pool`) return json(200, POOL);
  if (url === base) return json(200, campaign);
  return notServed(url);
}

async function mountView() {
  stubFetch(serve);
  const router = testRouter({ path: '/campaigns/:id/decision', name: 'campaign-decision', component: CampaignDecisionView, props: true });
  const wrapper = await mountPage(router, `/campaigns/${campaign.id}/decision`);
  return { wrapper, router };
}

describe('CampaignDecisionView', { timeout: 20_000 }, () => {
  afterEach(resetTestPage);

  it('should show the request, the reviewers means and the pool before any outcome is chosen', async () => {
    campaign = campaignFixture({ state: 'in-review', grantedCoreHours: null, can: DECIDABLE });
    const { wrapper } = await mountView();

    expect(wrapper.get('[data-testid="decision-requested"]').text()).toBe('1.25 M core-hours');
    expect(wrapper.get('[data-testid="mean-merit"]').text()).toContain('4.5');
    expect(wrapper.get('[data-testid="mean-recommended"]').text()).toContain('80 % of the request');
    expect(wrapper.get('[data-testid="pool-unallocated-before"]').text()).toBe('2,000,000 core-hours');
    expect(wrapper.get('[data-testid="pool-grant"]').text()).toBe('not chosen yet');
  });

  it('should go back to the campaign and say so when the decision is recorded', async () => {
    campaign = campaignFixture({ state: 'in-review', grantedCoreHours: null, can: DECIDABLE });
    const { wrapper, router } = await mountView();

    await wrapper.get('[data-testid="decision-outcome"]').findAll('button').find((b) => b.text() === 'Decline')!.trigger('click');
    await wrapper.get('[data-testid="decision-message"]').setValue('Declined: the grid misses the critical disorder.');
    await wrapper.get('[data-testid="decision-form"]').trigger('submit');
    await flushPromises();
    (document.querySelector('.p-confirmdialog-accept-button') as HTMLButtonElement).click();
    await flushPromises();

    expect(router.currentRoute.value.name).toBe('campaign-detail');
    expect(document.body.textContent).toContain('Decision recorded');
    expect(document.body.textContent).toContain(`“${campaign.title}” is declined.`);
  });

  it('should explain and offer no form when the campaign can no longer be decided', async () => {
    campaign = campaignFixture({ state: 'granted', grantedCoreHours: 1_250_000, can: { ...DECIDABLE, decide: false, withdraw: false } });
    const { wrapper } = await mountView();

    expect(wrapper.get('[data-testid="not-decidable"]').text()).toContain('This campaign is granted');
    expect(wrapper.find('[data-testid="decision-form"]').exists()).toBe(false);
  });
});
