import type { Notice } from '@localis/shared';
import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { describe, expect, it } from 'vitest';
import NoticeList from './notice-list.vue';

const info: Notice = { code: 'pilot-extrapolation', severity: 'info', field: 'pilotTimings', message: 'The largest size is more than 2× the largest pilot.' };
const warning: Notice = { code: 'grid-misses-critical-disorder', severity: 'warning', field: 'disorder', message: 'The disorder grid does not bracket W_c = 16.54.' };

function mountList(notices: Notice[], fieldLabel?: (field: string) => string | null) {
  return mount(NoticeList, { props: { notices, fieldLabel }, global: { plugins: [[PrimeVue, { theme: 'none' }]] } });
}

describe('NoticeList', () => {
  describe('showing notices', () => {
    it('should show each notice with its severity and message, warnings first, when there are notices', () => {
      const wrapper = mountList([info, warning]);

      const items = wrapper.findAll('li');
      expect(items.map((li) => li.attributes('data-testid'))).toEqual(['notice-grid-misses-critical-disorder', 'notice-pilot-extrapolation']);
      const first = wrapper.get('[data-testid="notice-grid-misses-critical-disorder"]');
      expect(first.classes()).toContain('warning');
      expect(first.text()).toContain('Warning');
      expect(first.text()).toContain('does not bracket W_c = 16.54');
      const second = wrapper.get('[data-testid="notice-pilot-extrapolation"]');
      expect(second.classes()).toContain('info');
      expect(second.text()).toContain('Note');
      expect(wrapper.find('[data-testid="notices-empty"]').exists()).toBe(false);
    });

    it('should say there are no notices when the plan raises none', () => {
      const wrapper = mountList([]);

      expect(wrapper.findAll('li')).toHaveLength(0);
      expect(wrapper.get('[data-testid="notices-empty"]').text()).toContain('No notices');
    });
  });

  describe('going to the field', () => {
    it('should offer the field a notice is about and emit it when the button is pressed', async () => {
      const wrapper = mountList([warning, info], (field) => (field === 'disorder' ? 'Disorder W' : null));

      const button = wrapper.get('[data-testid="notice-grid-misses-critical-disorder"] button');
      expect(button.text()).toBe('Go to Disorder W');
      expect(wrapper.find('[data-testid="notice-pilot-extrapolation"] button').exists()).toBe(false);

      await button.trigger('click');
      expect(wrapper.emitted('go')).toEqual([['disorder']]);
    });

    it('should offer no buttons when the page cannot show the fields', () => {
      const wrapper = mountList([warning]);

      expect(wrapper.find('button').exists()).toBe(false);
    });
  });
});
