import { flushPromises, mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { describe, expect, it } from 'vitest';
import { campaignFixture } from '../test/campaign-fixture';
import TransitionDialog from './transition-dialog.vue';

function mountDialog(action: 'submit' | 'withdraw' | 'start-review' | null) {
  return mount(TransitionDialog, {
    props: { action, campaign: campaignFixture(), busy: false },
    global: { plugins: [[PrimeVue, { theme: 'none' }]], stubs: { teleport: true } },
    attachTo: document.body,
  });
}

describe('TransitionDialog', () => {
  describe('asking', () => {
    it('should say what withdrawing means and offer a red button when withdrawing', async () => {
      const wrapper = mountDialog('withdraw');
      await flushPromises();
      expect(wrapper.text()).toContain('withdrawn for good');
      expect(wrapper.find('[data-testid="transition-confirm"]').text()).toBe('Withdraw campaign');
      expect(wrapper.find('[data-testid="transition-confirm"]').classes()).toContain('p-button-danger');
      wrapper.unmount();
    });

    it('should label the note field when the dialog is open', async () => {
      const wrapper = mountDialog('submit');
      await flushPromises();
      const label = wrapper.find('label[for="transition-note"]');
      expect(label.text()).toBe('Note (optional)');
      expect(wrapper.find('#transition-note').exists()).toBe(true);
      wrapper.unmount();
    });
  });

  describe('confirming', () => {
    it('should pass the trimmed note when one is written', async () => {
      const wrapper = mountDialog('submit');
      await flushPromises();
      await wrapper.find('#transition-note').setValue('  Follows the 2026 pilot.  ');
      await wrapper.find('form').trigger('submit');
      expect(wrapper.emitted('confirm')).toEqual([['Follows the 2026 pilot.']]);
      wrapper.unmount();
    });

    it('should pass no note when the field is left empty', async () => {
      const wrapper = mountDialog('start-review');
      await flushPromises();
      await wrapper.find('form').trigger('submit');
      expect(wrapper.emitted('confirm')).toEqual([[undefined]]);
      wrapper.unmount();
    });

    it('should keep the dialog open with the error beside the note when the note is too long', async () => {
      const wrapper = mountDialog('withdraw');
      await flushPromises();
      await wrapper.find('#transition-note').setValue('x'.repeat(2001));
      await wrapper.find('form').trigger('submit');
      expect(wrapper.emitted('confirm')).toBeUndefined();
      expect(wrapper.find('#transition-note-error').text()).toBe('A note may have at most 2000 characters');
      wrapper.unmount();
    });
  });
});
