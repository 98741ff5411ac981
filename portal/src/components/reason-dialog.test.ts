import { flushPromises } from '@vue/test-utils';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { defineComponent, h, ref } from 'vue';
import { z } from 'zod';
import { memoryRouter, mountPage, resetTestPage } from '../test/mount-in-app';
import ReasonDialog from './reason-dialog.vue';

interface Thing {
  id: string;
  name: string;
}

const THING: Thing = { id: 't1', name: 'the sample' };
const IDS = { dialog: 'retire-dialog', form: 'retire-form', reason: 'retire-reason', submit: 'retire-submit' };
const Schema = z.object({ reason: z.string().trim().min(5, 'say why in at least 5 characters') }).strict();

/** A page holding the dialog the way the billing and archive pages do: v-model on the record. */
async function mountHost(save: (thing: Thing, input: { reason: string }) => Promise<Thing>) {
  const subject = ref<Thing | null>(null);
  const saved: Thing[] = [];
  const Host = defineComponent({
    setup: () => () =>
      h(ReasonDialog<Thing, Thing>, {
        subject: subject.value,
        'onUpdate:subject': (next: Thing | null) => (subject.value = next),
        schema: Schema,
        header: (t: Thing) => `Retire ${t.name}`,
        intro: 'A retired thing is kept.',
        hint: 'Kept with the thing.',
        submitLabel: 'Retire',
        failureTitle: 'The thing was not retired',
        ids: IDS,
        save,
        onSaved: (t: Thing) => saved.push(t),
      }),
  });
  // On a page of a router: the dialog asks before unsaved words are closed away, on leaving too.
  const wrapper = await mountPage(memoryRouter([{ path: '/', component: Host }]), '/');
  return { wrapper, subject, saved };
}

describe('ReasonDialog', () => {
  afterEach(resetTestPage);

  describe('opening', () => {
    it('should open for the given record, name it in the header and label the reason box', async () => {
      const { wrapper, subject } = await mountHost(vi.fn());
      expect(wrapper.find(`[data-testid="${IDS.dialog}"]`).exists()).toBe(false);
      subject.value = THING;
      await flushPromises();
      expect(wrapper.get(`[data-testid="${IDS.dialog}"]`).text()).toContain('Retire the sample');
      expect(wrapper.get(`label[for="${IDS.reason}"]`).text()).toBe('Reason');
      expect(wrapper.get(`[data-testid="${IDS.reason}"]`).attributes('id')).toBe(IDS.reason);
    });
  });

  describe('saving', () => {
    it('should refuse a short reason without saving, then save the record with the reason, hand it on and close', async () => {
      const save = vi.fn((thing: Thing) => Promise.resolve({ ...thing, name: 'retired' }));
      const { wrapper, subject, saved } = await mountHost(save);
      subject.value = THING;
      await flushPromises();
      await wrapper.get(`[data-testid="${IDS.reason}"]`).setValue('no');
      await wrapper.get(`#${IDS.form}`).trigger('submit');
      await flushPromises();
      expect(document.body.textContent).toContain('Say why in at least 5 characters');
      expect(save).not.toHaveBeenCalled();

      await wrapper.get(`[data-testid="${IDS.reason}"]`).setValue('  counted twice  ');
      await wrapper.get(`#${IDS.form}`).trigger('submit');
      await flushPromises();
      expect(save).toHaveBeenCalledExactlyOnceWith(THING, { reason: 'counted twice' });
      expect(saved).toEqual([{ id: 't1', name: 'retired' }]);
      expect(subject.value).toBeNull();
    });
  });
});
