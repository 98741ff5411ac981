import { flushPromises, mount, RouterLinkStub } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import { describe, expect, it } from 'vitest';
import { h } from 'vue';
import { ApiError } from '../../../api/api-error';
import HomeCard from './home-card.vue';

function mountCard(props: Partial<InstanceType<typeof HomeCard>['$props']> & { load: () => Promise<void> }) {
  return mount(HomeCard, {
    props: { title: 'Open rounds', icon: 'pi pi-calendar', testId: 'card-test', link: { name: 'admin-rounds' }, linkText: 'All of them', ...props },
    slots: { default: () => h('p', { class: 'content' }, 'The content') },
    global: { plugins: [[PrimeVue, { theme: 'none' }], ToastService], stubs: { RouterLink: RouterLinkStub } },
  });
}

describe('HomeCard', () => {
  describe('loading', () => {
    it('should show its content and footer when the load is done', async () => {
      let finish!: () => void;
      const wrapper = mountCard({ load: () => new Promise<void>((resolve) => (finish = resolve)) });
      await flushPromises();
      expect(wrapper.get('[data-testid="card-test"]').attributes('aria-busy')).toBe('true');
      expect(wrapper.find('.content').exists()).toBe(false);
      expect(wrapper.find('footer').exists()).toBe(false);

      finish();
      await flushPromises();
      expect(wrapper.get('[data-testid="card-test"]').attributes('aria-busy')).toBe('false');
      expect(wrapper.get('.content').text()).toBe('The content');
      const link = wrapper.getComponent(RouterLinkStub);
      expect(link.props('to')).toEqual({ name: 'admin-rounds' });
      expect(link.text()).toBe('All of them');
    });

    it('should say what failed and load again when Try again is pressed', async () => {
      let calls = 0;
      const wrapper = mountCard({
        load: async () => {
          calls += 1;
          if (calls === 1) throw new ApiError(503, 'unavailable', 'The api is resting.');
        },
      });
      await flushPromises();
      expect(wrapper.text()).toContain('The api is resting.');
      expect(wrapper.find('.content').exists()).toBe(false);

      await wrapper.get('button').trigger('click');
      await flushPromises();
      expect(calls).toBe(2);
      expect(wrapper.get('.content').text()).toBe('The content');
    });
  });

  describe('the count', () => {
    it('should stand beside the title when above zero', async () => {
      const wrapper = mountCard({ load: async () => {}, count: 3, countSeverity: 'warn', countLabel: '3 campaigns' });
      await flushPromises();
      const badge = wrapper.get('.head-extra .p-tag');
      expect(badge.text()).toBe('3');
      expect(badge.attributes('aria-label')).toBe('3 campaigns');
    });

    it('should not show when zero', async () => {
      const wrapper = mountCard({ load: async () => {}, count: 0 });
      await flushPromises();
      expect(wrapper.find('.head-extra .p-tag').exists()).toBe(false);
    });
  });
});
