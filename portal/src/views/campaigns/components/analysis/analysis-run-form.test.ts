import type { Analysis } from '@localis/shared';
import { flushPromises, type VueWrapper } from '@vue/test-utils';
import Select from 'primevue/select';
import Toast from 'primevue/toast';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { defineComponent, h } from 'vue';
import { jsonResponse as json, stubFetch } from '../../../../test/fetch-stub';
import { mountInApp, resetTestPage } from '../../../../test/mount-in-app';
import { analysisFixture } from '../../lib/analysis-fixture';
import { CAN_NOTHING, campaignFixture } from '../../test/campaign-fixture';
import AnalysisRunForm from './analysis-run-form.vue';

const campaign = campaignFixture({ state: 'granted', spec: { ...campaignFixture().spec, sizes: [6, 8, 10, 12, 16], energies: [0, 0.5] }, can: { ...CAN_NOTHING, recordRuns: true } });
const LIST = `/api/v1/campaigns/${campaign.id}/analyses`;

let host: VueWrapper | undefined;

async function mountForm(serve: (body: Record<string, unknown>) => Response) {
  const posted: Record<string, unknown>[] = [];
  stubFetch((url, init) => {
    if (url !== LIST || init?.method !== 'POST') return json(404, { error: { code: 'not_found', message: url } });
    const body = JSON.parse(String(init.body));
    posted.push(body);
    return serve(body);
  });
  const queued: Analysis[] = [];
  // With the toasts the app renders, so a refusal's words can be seen.
  host = await mountInApp(defineComponent({ render: () => h('div', [h(Toast), h(AnalysisRunForm, { campaign, shown: analysisFixture(), onQueued: (a: Analysis) => queued.push(a) })]) }));
  return { wrapper: host, posted, queued };
}

const select = (wrapper: VueWrapper, testId: string) => wrapper.findAllComponents(Select).find((s) => s.attributes('data-testid') === testId)!;

describe('AnalysisRunForm', () => {
  afterEach(() => {
    host?.unmount();
    host = undefined;
    resetTestPage();
    vi.restoreAllMocks();
  });

  describe('the choices', () => {
    it('should offer the campaign’s energies and sizes, starting from the analysis shown', async () => {
      const { wrapper } = await mountForm(() => json(202, {}));
      expect(select(wrapper, 'analysis-energy').props('options')).toEqual([
        { label: 'The one most points have', value: 'auto' },
        { label: 'E = 0', value: '0' },
        { label: 'E = 0.5', value: '0.5' },
      ]);
      for (const L of [6, 8, 10, 12, 16]) expect(wrapper.get(`[data-testid="analysis-size-${L}"] input`).element).toHaveProperty('checked', true);
      expect(wrapper.get('[data-testid="analysis-bootstrap"]').element).toHaveProperty('value', '20');
      expect(wrapper.find('[data-testid="analysis-nr"]').exists()).toBe(false);
    });

    it('should offer the orders once given is chosen, mi only with an irrelevant term', async () => {
      const { wrapper } = await mountForm(() => json(202, {}));
      await wrapper.get('[data-testid="analysis-orders-given"] input').setValue(true);
      expect(select(wrapper, 'analysis-nr').props('modelValue')).toBe(2);
      expect(select(wrapper, 'analysis-nr').props('options')!.map((o) => (o as { value: number }).value)).toEqual([1, 2, 3, 4]);
      expect(select(wrapper, 'analysis-mi').props('disabled')).toBe(true);
      select(wrapper, 'analysis-ni').vm.$emit('update:modelValue', 1);
      await flushPromises();
      expect(select(wrapper, 'analysis-mi').props('disabled')).toBe(false);
    });
  });

  describe('sending', () => {
    it('should send the orders, energy and observable chosen, and hand back the queued analysis', async () => {
      const queuedAnswer = analysisFixture({ state: 'queued', result: null });
      const { wrapper, posted, queued } = await mountForm(() => json(202, queuedAnswer));
      await wrapper.get('[data-testid="analysis-orders-given"] input').setValue(true);
      select(wrapper, 'analysis-nr').vm.$emit('update:modelValue', 3);
      select(wrapper, 'analysis-ni').vm.$emit('update:modelValue', 1);
      select(wrapper, 'analysis-energy').vm.$emit('update:modelValue', '0.5');
      select(wrapper, 'analysis-observable').vm.$emit('update:modelValue', 'lambda');
      await flushPromises();
      await wrapper.get('form').trigger('submit');
      await flushPromises();
      expect(posted).toEqual([{ observable: 'lambda', energy: 0.5, orders: { nr: 3, ni: 1, mr: 1, mi: 0 }, bootstrap: 20 }]);
      expect(queued.map((a) => a.id)).toEqual([queuedAnswer.id]);
    });

    it('should put the api’s objections beside the fields', async () => {
      const { wrapper } = await mountForm(() =>
        json(422, { error: { code: 'invalid', message: 'The request has errors.', details: [{ path: ['sizes'], message: 'L = 6 is in no verified archive' }] } }),
      );
      await wrapper.get('form').trigger('submit');
      await flushPromises();
      expect(wrapper.get('#analysis-sizes-error').text()).toBe('L = 6 is in no verified archive');
    });

    it('should say in a toast when the api refuses for another reason', async () => {
      const { wrapper } = await mountForm(() => json(403, { error: { code: 'forbidden', message: 'Only the campaign’s group and the office may ask for analyses.' } }));
      await wrapper.get('form').trigger('submit');
      await flushPromises();
      expect(document.body.textContent).toContain('The analysis could not be queued');
      expect(document.body.textContent).toContain('Only the campaign’s group and the office may ask for analyses.');
    });
  });
});
