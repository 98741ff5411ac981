import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { describe, expect, it } from 'vitest';
import { toLocalInput } from '../lib/local-datetime';
import LocalDateTimeInput from './local-date-time-input.vue';

function mountBox(modelValue: string) {
  return mount(LocalDateTimeInput, {
    props: { modelValue, id: 'run-started', 'data-testid': 'run-started' },
    global: { plugins: [[PrimeVue, { theme: 'none' }]] },
  });
}

describe('LocalDateTimeInput', () => {
  describe('showing', () => {
    it('should show the ISO time in local time, and pass its attributes to the box', () => {
      const wrapper = mountBox('2027-02-01T08:00:00.000Z');
      const input = wrapper.get('input');
      expect(input.attributes()).toMatchObject({ type: 'datetime-local', id: 'run-started', 'data-testid': 'run-started' });
      expect((input.element as HTMLInputElement).value).toBe(toLocalInput('2027-02-01T08:00:00.000Z'));
    });
  });

  describe('typing', () => {
    it('should hand back ISO UTC, and an empty string once the box is cleared', async () => {
      const wrapper = mountBox('');
      await wrapper.get('input').setValue(toLocalInput('2027-02-03T11:00:00Z'));
      await wrapper.get('input').setValue('');
      expect(wrapper.emitted('update:modelValue')).toEqual([['2027-02-03T11:00:00.000Z'], ['']]);
    });
  });
});
