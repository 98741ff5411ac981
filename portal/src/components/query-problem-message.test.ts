import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { describe, expect, it } from 'vitest';
import QueryProblemMessage from './query-problem-message.vue';

function mountMessage(problem: string | null) {
  return mount(QueryProblemMessage, { props: { problem }, global: { plugins: [[PrimeVue, { theme: 'none' }]] } });
}

describe('QueryProblemMessage', () => {
  describe('showing', () => {
    it('should name the problem when the address has one', () => {
      const wrapper = mountMessage('status: Invalid option');
      expect(wrapper.text()).toContain('The address has a filter Localis cannot use (status: Invalid option).');
    });

    it('should show nothing when the address is fine', () => {
      expect(mountMessage(null).find('.p-message').exists()).toBe(false);
    });
  });

  describe('clearing', () => {
    it('should ask to clear the filters when the button is pressed', async () => {
      const wrapper = mountMessage('limit: Too big');
      await wrapper.get('button').trigger('click');
      expect(wrapper.emitted('clear')).toHaveLength(1);
    });
  });
});
