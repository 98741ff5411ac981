import type { Campaign, CampaignReviews, PoolUsage } from '@localis/shared';
import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import ConfirmationService from 'primevue/confirmationservice';
import ConfirmDialog from 'primevue/confirmdialog';
import PrimeVue from 'primevue/config';
import Toast from 'primevue/toast';
import ToastService from 'primevue/toastservice';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { defineComponent, h } from 'vue';
import { RouterView } from 'vue-router';
import CampaignDecisionView from './campaign-decision-view.vue';
import { campaignFixture, testRouter } from './test/campaign-fixture';

const DECIDABLE = { edit: false, submit: false, withdraw: true, startReview: false, decide: true, recordRuns: false, transfer: false };
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

const json = (status: number, body: unknown) => new Response(JSON.stringify(body), { status, headers: { 'content-type': 'application/json' } });

let campaign: Campaign;
let fetchMock: ReturnType<typeof vi.fn>;

function reviews(): CampaignReviews {
  return {
    campaignId: campaign.id,
    audience: 'committee',
    assignments: [],
    summary: { reviews: 2, meanScores: { merit: 4.5, feasibility: 3.5, costJustification: 4 }, meanRecommendedCoreHours: 1_000_000 },
    feedback: [],
    decisionMessage: null,
    eligibleReviewers: [],
    can: { assign: true, review: false, declareConflict: false, decide: true },
    myAssignmentId: null,
  };
}

function serve(url: string, init?: RequestInit): Response {
  const base = `/api/v1/campaigns/${campaign.id}`;
  if (url === `${base}/decision` && init?.method === 'POST') return json(200, { ...campaign, state: 'declined', grantedCoreHours: 0 });
  if (url === `${base}/reviews`) return json(200, reviews());
  if (url === `${base}/pool`) return json(200, POOL);
  if (url === base) return json(200, campaign);
  return json(404, { error: { code: 'not_found', message: `no ${url}` } });
}

async function mountView() {
  fetchMock = vi.fn((url: string, init?: RequestInit) => Promise.resolve(serve(url, init)));
  vi.stubGlobal('fetch', fetchMock);
  const router = testRouter();
  router.addRoute({ path: '/campaigns/:id/decision', name: 'campaign-decision', component: CampaignDecisionView, props: true });
  await router.push(`/campaigns/${campaign.id}/decision`);
  await router.isReady();
  const pinia = createPinia();
  setActivePinia(pinia);
  const Host = defineComponent({ render: () => [h(RouterView), h(ConfirmDialog), h(Toast)] });
  const wrapper = mount(Host, {
    global: { plugins: [pinia, router, [PrimeVue, { theme: 'none' }], ToastService, ConfirmationService], stubs: { teleport: true } },
    attachTo: document.body,
  });
  await flushPromises();
  return { wrapper, router };
}

describe('CampaignDecisionView', { timeout: 20_000 }, () => {
  afterEach(() => {
    vi.unstubAllGlobals();
    document.body.innerHTML = '';
  });

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
