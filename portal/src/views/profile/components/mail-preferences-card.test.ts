import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import MailPreferencesCard from './mail-preferences-card.vue';

let stored: Record<string, boolean>;
let patches: unknown[];
let refuse: boolean;
const json = (status: number, body: unknown) => new Response(JSON.stringify(body), { status, headers: { 'content-type': 'application/json' } });

function serve(url: string, init?: RequestInit): Response {
  if (url !== '/api/v1/me/mail-preferences') return json(404, { error: { code: 'not_found', message: `no ${url}` } });
  if (init?.method === 'PATCH') {
    if (refuse) return json(503, { error: { code: 'unavailable', message: 'The api is resting.' } });
    const patch = JSON.parse(String(init.body)) as Record<string, boolean>;
    patches.push(patch);
    stored = { ...stored, ...patch };
  }
  return json(200, stored);
}

function mountCard() {
  setActivePinia(createPinia());
  return mount(MailPreferencesCard, { global: { plugins: [[PrimeVue, { theme: 'none' }], ToastService] }, attachTo: document.body });
}

const isOn = (wrapper: ReturnType<typeof mountCard>, kind: string) => (wrapper.get(`#mail-${kind}`).element as HTMLInputElement).checked;

describe('MailPreferencesCard', () => {
  beforeEach(() => {
    stored = { 'proposal-submitted': true, 'usage-threshold': true, 'round-closing': false };
    patches = [];
    refuse = false;
    vi.stubGlobal('fetch', vi.fn((url: string, init?: RequestInit) => Promise.resolve(serve(url, init))));
  });

  afterEach(() => {
    vi.unstubAllGlobals();
    document.body.innerHTML = '';
  });

  describe('the switches', () => {
    it('should show one switch per optional mail and say which mails always go out', async () => {
      const wrapper = mountCard();
      await flushPromises();
      expect(wrapper.findAll('input[type="checkbox"]')).toHaveLength(3);
      expect(isOn(wrapper, 'round-closing')).toBe(false);
      expect(wrapper.text()).toContain('An allocation round closes in 14 days');
      expect(wrapper.text()).toContain('Review assignments and decisions on your proposals are always mailed');
    });

    it('should save a change at once, sending only that kind', async () => {
      const wrapper = mountCard();
      await flushPromises();
      await wrapper.get('#mail-usage-threshold').setValue(false);
      await flushPromises();
      expect(patches).toEqual([{ 'usage-threshold': false }]);
      expect(isOn(wrapper, 'usage-threshold')).toBe(false);
    });

    it('should show the stored value again when saving fails', async () => {
      const wrapper = mountCard();
      await flushPromises();
      refuse = true;
      await wrapper.get('#mail-proposal-submitted').setValue(false);
      await flushPromises();
      expect(isOn(wrapper, 'proposal-submitted')).toBe(true);
    });
  });
});
