import type { PoolUsage } from '@localis/shared';
import { flushPromises } from '@vue/test-utils';
import InputNumber from 'primevue/inputnumber';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { defineComponent, h } from 'vue';
import { jsonResponse as json, notServed, stubFetch } from '../../../test/fetch-stub';
import { mountPage, resetTestPage } from '../../../test/mount-in-app';
import { CAN_NOTHING, campaignFixture, testRouter } from '../test/campaign-fixture';
import DecisionForm from './decision-form.vue';

const CAMPAIGN = campaignFixture({
  state: 'in-review',
  requestedCoreHours: 1_250_000,
  grantedCoreHours: null,
  can: { ...CAN_NOTHING, withdraw: true, decide: true },
});

function pool(unallocated: number): PoolUsage {
  return { roundId: CAMPAIGN.roundId, machine: 'cluster-a', pool: 5_000_000, granted: 5_000_000 - unallocated, used: 0, remaining: 5_000_000 - unallocated, unallocated, groups: [] };
}

let decisionAnswer: (body: Record<string, unknown>) => Response;
let fetchMock: ReturnType<typeof stubFetch>;

function serve(url: string, init?: RequestInit): Response {
  if (url === `/api/v1/campaigns/${CAMPAIGN.id}/decision` && init?.method === 'POST') return decisionAnswer(JSON.parse(String(init.body)));
  return notServed(url);
}

async function mountForm(unallocated = 2_000_000, meanRecommended: number | null = 800_000) {
  const Page = defineComponent({ render: () => h(DecisionForm, { campaign: CAMPAIGN, pool: pool(unallocated), meanRecommended }) });
  // The app's confirmation dialog sits beside the page, as in app.vue.
  const host = await mountPage(testRouter({ path: '/campaigns/:id/decision', name: 'campaign-decision', component: Page }), `/campaigns/${CAMPAIGN.id}/decision`);
  return { host, form: host.getComponent(DecisionForm) };
}

type Mounted = Awaited<ReturnType<typeof mountForm>>;
const byTestId = (m: Mounted, id: string) => m.form.get(`[data-testid="${id}"]`);
const posts = () => fetchMock.mock.calls.filter(([, init]) => init?.method === 'POST');

async function choose(m: Mounted, label: string): Promise<void> {
  const button = byTestId(m, 'decision-outcome').findAll('button').find((b) => b.text() === label);
  await button!.trigger('click');
  await flushPromises();
}

async function partOf(m: Mounted, coreHours: number): Promise<void> {
  await choose(m, 'Grant part');
  m.form.getComponent(InputNumber).vm.$emit('update:modelValue', coreHours);
  await flushPromises();
}

describe('DecisionForm', { timeout: 20_000 }, () => {
  beforeEach(() => {
    fetchMock = stubFetch(serve);
    decisionAnswer = (body) => json(200, { ...CAMPAIGN, state: body.outcome === 'decline' ? 'declined' : 'granted' });
  });

  afterEach(resetTestPage);

  describe('the pool', () => {
    it('should refuse granting all beside the outcome as soon as it is chosen when the pool has less left than the request', async () => {
      const m = await mountForm(1_000_000);

      await choose(m, 'Grant all');

      expect(m.form.get('#decision-outcome-error').text()).toBe(
        'The request of 1,250,000 core-hours is more than the 1,000,000 core-hours left unallocated in the cluster-a pool: grant part of it or decline',
      );
      expect(byTestId(m, 'pool-unallocated-after').text()).toContain('−250,000 core-hours · more than the pool has');

      await byTestId(m, 'decision-message').setValue('Granted in full: the committee found the plan sound.');
      await m.form.get('form').trigger('submit');
      await flushPromises();
      expect(posts()).toHaveLength(0);
      expect(document.querySelector('.p-confirmdialog')).toBeNull();
    });

    it('should show the pool after a partial grant and refuse a part larger than what is left', async () => {
      const m = await mountForm(500_000);

      await partOf(m, 400_000);
      expect(byTestId(m, 'pool-unallocated-after').text()).toBe('100,000 core-hours');
      expect(m.form.find('#decision-core-hours-error').exists()).toBe(false);

      await partOf(m, 600_000);
      expect(m.form.get('#decision-core-hours-error').text()).toBe('That is more than the 500,000 core-hours left unallocated in the cluster-a pool');
    });
  });

  describe('deciding', () => {
    it('should ask for the core-hours and the message beside their fields when a partial grant is left empty', async () => {
      const m = await mountForm();
      await choose(m, 'Grant part');

      await m.form.get('form').trigger('submit');
      await flushPromises();

      expect(m.form.get('#decision-core-hours-error').text()).toBe('Give the core-hours of a partial grant');
      expect(m.form.get('#decision-message-error').text()).toBe('Write the proposers a message of at least 10 characters');
      expect(posts()).toHaveLength(0);
    });

    it('should fill in the reviewers mean recommendation when asked', async () => {
      const m = await mountForm();
      await choose(m, 'Grant part');

      await byTestId(m, 'use-mean-recommendation').trigger('click');
      await flushPromises();

      expect(m.form.getComponent(InputNumber).props('modelValue')).toBe(800_000);
    });

    it('should confirm, then send the partial grant and tell the page when it is recorded', async () => {
      const m = await mountForm();
      await partOf(m, 600_000);
      await byTestId(m, 'decision-message').setValue('Granted in part: the largest size is not needed for nu.');

      await m.form.get('form').trigger('submit');
      await flushPromises();
      const dialog = document.querySelector('.p-confirmdialog')!;
      expect(dialog.textContent).toContain(`Grant “${CAMPAIGN.title}” 600,000 of the 1,250,000 core-hours it requests.`);
      (dialog.querySelector('.p-confirmdialog-accept-button') as HTMLButtonElement).click();
      await flushPromises();

      expect(posts()).toHaveLength(1);
      expect(JSON.parse(String(posts()[0][1]?.body))).toEqual({
        outcome: 'grant-part',
        coreHours: 600_000,
        message: 'Granted in part: the largest size is not needed for nu.',
      });
      expect(m.form.emitted('decided')?.[0]?.slice(1)).toEqual(['grant-part', 600_000]);
    });

    it('should send nothing when the confirmation is cancelled', async () => {
      const m = await mountForm();
      await choose(m, 'Decline');
      await byTestId(m, 'decision-message').setValue('Declined: the grid misses the critical disorder.');

      await m.form.get('form').trigger('submit');
      await flushPromises();
      (document.querySelector('.p-confirmdialog-reject-button') as HTMLButtonElement).click();
      await flushPromises();

      expect(posts()).toHaveLength(0);
      expect(m.form.emitted('decided')).toBeUndefined();
    });

    it('should ask the page to read the pool again when the server refuses the grant with 409', async () => {
      decisionAnswer = () => json(409, { error: { code: 'conflict', message: 'The pool has 900,000 core-hours left.' } });
      const m = await mountForm();
      await choose(m, 'Grant all');
      await byTestId(m, 'decision-message').setValue('Granted in full: the committee found the plan sound.');

      await m.form.get('form').trigger('submit');
      await flushPromises();
      (document.querySelector('.p-confirmdialog-accept-button') as HTMLButtonElement).click();
      await flushPromises();

      expect(posts()).toHaveLength(1);
      expect(m.form.emitted('stale')).toHaveLength(1);
      expect(m.form.emitted('decided')).toBeUndefined();
    });
  });
});
