import { InstitutionInput, type Institution, type InstitutionPatch } from '@localis/shared';
import { flushPromises, mount } from '@vue/test-utils';
import ConfirmationService from 'primevue/confirmationservice';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import { describe, expect, it } from 'vitest';
import { defineComponent, h, ref } from 'vue';
import { createMemoryHistory, createRouter, RouterView } from 'vue-router';
import { useRecordDialog } from './use-record-dialog';
import { useZodForm } from './use-zod-form';

const KESTREL: Institution = {
  id: '5d0c2b3e-8f4a-4c1d-9e2b-7a6f5e4d3c21',
  name: 'Kestrel University',
  kind: 'member',
  country: 'GB',
  billingEmail: null,
  createdAt: '2026-12-01T00:00:00.000Z',
};

const formOf = (i: Institution | null) => ({ name: i?.name ?? '', kind: i?.kind ?? 'member', country: i?.country ?? '', billingEmail: i?.billingEmail ?? null });
const changes = (input: InstitutionInput, before: Institution): InstitutionPatch => (input.name !== before.name ? { name: input.name } : {});

async function setup(record: Institution | null) {
  const calls: { created: InstitutionInput[]; updated: [string, InstitutionPatch][]; saved: [Institution, boolean][] } = { created: [], updated: [], saved: [] };
  const visible = ref(false);
  let dialog!: ReturnType<typeof useRecordDialog<Institution, InstitutionInput, InstitutionPatch, ReturnType<typeof formOf>>>;
  let form!: ReturnType<typeof useZodForm<typeof InstitutionInput, ReturnType<typeof formOf>>>;
  const Probe = defineComponent({
    setup() {
      form = useZodForm(InstitutionInput, () => formOf(record));
      dialog = useRecordDialog({
        visible,
        form,
        record: () => record,
        formOf,
        create: async (input: InstitutionInput) => (calls.created.push(input), { ...KESTREL, ...input }),
        update: async (id: string, patch: InstitutionPatch) => (calls.updated.push([id, patch]), { ...KESTREL, ...patch }),
        changes,
        onSaved: (saved, created) => calls.saved.push([saved, created]),
        failureTitle: 'The institution was not saved',
      });
      return () => null;
    },
  });
  // Inside a route, as dialogs are: the unsaved-changes guard also watches leaving the page.
  const router = createRouter({ history: createMemoryHistory(), routes: [{ path: '/', component: Probe }] });
  await router.push('/');
  const Host = defineComponent({ render: () => h(RouterView) });
  mount(Host, { global: { plugins: [router, [PrimeVue, { theme: 'none' }], ToastService, ConfirmationService] } });
  await router.isReady();
  return { calls, visible, dialog: () => dialog, form: () => form };
}

describe('useRecordDialog', () => {
  describe('saving', () => {
    it('should create the record and say it is new when there was none', async () => {
      const { calls, visible, dialog, form } = await setup(null);
      visible.value = true;
      await flushPromises();
      Object.assign(form().values.value, { name: 'Brennmoor Institute', country: 'DE' });
      await dialog().submit();
      expect(calls.created).toEqual([{ name: 'Brennmoor Institute', kind: 'member', country: 'DE', billingEmail: null }]);
      expect(calls.saved.map(([saved, created]) => [saved.name, created])).toEqual([['Brennmoor Institute', true]]);
      expect(visible.value).toBe(false);
    });

    it('should send only the changed fields when editing', async () => {
      const { calls, visible, dialog, form } = await setup(KESTREL);
      visible.value = true;
      await flushPromises();
      form().values.value.name = 'Kestrel University of Science';
      await dialog().submit();
      expect(calls.updated).toEqual([[KESTREL.id, { name: 'Kestrel University of Science' }]]);
      expect(calls.saved.map(([, created]) => created)).toEqual([false]);
    });

    it('should save nothing and close when nothing changed', async () => {
      const { calls, visible, dialog } = await setup(KESTREL);
      visible.value = true;
      await flushPromises();
      await dialog().submit();
      expect(calls.updated).toEqual([]);
      expect(calls.saved).toEqual([]);
      expect(visible.value).toBe(false);
    });
  });
});
