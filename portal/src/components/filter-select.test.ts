import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import Select from 'primevue/select';
import { describe, expect, it } from 'vitest';
import FilterSelect from './filter-select.vue';

const OPTIONS = [
  { label: 'Open', value: 'open' },
  { label: 'Closed', value: 'closed' },
];

function mountFilter(props: Partial<InstanceType<typeof FilterSelect>['$props']> = {}) {
  return mount(FilterSelect, {
    props: { idPrefix: 'rounds', name: 'status', label: 'Status', modelValue: undefined, options: OPTIONS, placeholder: 'Any status', ...props },
    global: { plugins: [[PrimeVue, { theme: 'none' }]] },
  });
}

describe('FilterSelect', () => {
  describe('labels', () => {
    it('should tie the label to the select when rendered', () => {
      const wrapper = mountFilter();
      const label = wrapper.get('label');
      expect(label.attributes()).toMatchObject({ id: 'rounds-status-label', for: 'rounds-status' });
      expect(label.text()).toBe('Status');
      const select = wrapper.get('[data-testid="rounds-filter-status"]');
      expect(select.find('#rounds-status').exists()).toBe(true);
      expect(select.html()).toContain('aria-labelledby="rounds-status-label"');
    });

    it('should show the error beside the select when the address holds a refused value', () => {
      const wrapper = mountFilter({ error: 'Invalid option' });
      expect(wrapper.get('#rounds-status-error').text()).toBe('Invalid option');
      expect(wrapper.get('[data-testid="rounds-filter-status"]').html()).toContain('aria-describedby="rounds-status-error"');
    });
  });

  describe('choosing', () => {
    it('should pass on the chosen value, or null when cleared', async () => {
      const wrapper = mountFilter({ modelValue: 'open' });
      const select = wrapper.getComponent(Select);
      expect(select.props('modelValue')).toBe('open');
      select.vm.$emit('update:modelValue', 'closed');
      select.vm.$emit('update:modelValue', null);
      expect(wrapper.emitted('update:modelValue')).toEqual([['closed'], [null]]);
    });
  });
});
