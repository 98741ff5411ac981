import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { describe, expect, it } from 'vitest';
import { campaignFixture, testRouter } from '../test/campaign-fixture';
import CampaignHeader from './campaign-header.vue';

function mountHeader(can: Partial<ReturnType<typeof campaignFixture>['can']>, state: ReturnType<typeof campaignFixture>['state'] = 'draft') {
  const campaign = campaignFixture({ state, can: { edit: false, submit: false, withdraw: false, startReview: false, decide: false, recordRuns: false, transfer: false, uploadResults: false, attachFiles: false, withdrawArchives: false, ...can } });
  return mount(CampaignHeader, { props: { campaign }, global: { plugins: [[PrimeVue, { theme: 'none' }], testRouter()] } });
}

const shown = (wrapper: ReturnType<typeof mountHeader>) =>
  ['edit-campaign', 'submit-campaign', 'withdraw-campaign', 'start-review', 'print-campaign'].filter((id) => wrapper.find(`[data-testid="${id}"]`).exists());

describe('CampaignHeader', () => {
  describe('actions', () => {
    it('should offer only Print when the person may change nothing', () => {
      expect(shown(mountHeader({}))).toEqual(['print-campaign']);
    });

    it('should offer Edit, Submit and Withdraw when the PI looks at a draft', () => {
      expect(shown(mountHeader({ edit: true, submit: true, withdraw: true }))).toEqual(['edit-campaign', 'submit-campaign', 'withdraw-campaign', 'print-campaign']);
    });

    it('should offer Start review when an admin looks at a submitted proposal', () => {
      expect(shown(mountHeader({ startReview: true }, 'submitted'))).toEqual(['start-review', 'print-campaign']);
    });

    it('should link Edit to the edit page when editing is allowed', () => {
      const wrapper = mountHeader({ edit: true });
      expect(wrapper.find('[data-testid="edit-campaign"]').attributes('href')).toBe('/campaigns/3a4b5c6d-7e8f-4a0b-9c1d-2e3f4a5b6c7d/edit');
    });

    it('should ask for the state change when a transition button is pressed', async () => {
      const wrapper = mountHeader({ withdraw: true });
      await wrapper.find('[data-testid="withdraw-campaign"]').trigger('click');
      expect(wrapper.emitted('transition')).toEqual([['withdraw']]);
    });
  });

  describe('facts', () => {
    it('should show the state, the request with its unit and the machine when rendered', () => {
      const wrapper = mountHeader({}, 'in-review');
      expect(wrapper.find('[data-testid="campaign-state"]').attributes('data-state')).toBe('in-review');
      expect(wrapper.text()).toContain('1.25 M core-hours');
      expect(wrapper.text()).toContain('cluster-a');
      expect(wrapper.text()).toContain('Ilse Marrow');
    });
  });
});
