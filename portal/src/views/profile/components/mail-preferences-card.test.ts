import { flushPromises } from '@vue/test-utils';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { jsonResponse as json, notServed, stubFetch } from '../../../test/fetch-stub';
import { mountInApp, resetTestPage } from '../../../test/mount-in-app';
import MailPreferencesCard from './mail-preferences-card.vue';

let stored: Record<string, boolean>;
let patches: unknown[];
let refuse: boolean;

function serve(url: string, init?: RequestInit): Response {
  if (url !== '/api/v1/me/mail-preferences') return notServed(url);
  if (init?.method === 'PATCH') {
    if (refuse) return json(503, { error: { code: 'unavailable', message: 'The api is resting.' } });
    const patch = JSON.parse(String(init.body)) as Record<string, boolean>;
    patches.push(patch);
    stored = { ...stored, ...patch };
  }
  return json(200, stored);
}

const mountCard = () => mountInApp(MailPreferencesCard);

const isOn = (wrapper: Awaited<ReturnType<typeof mountCard>>, kind: string) => (wrapper.get(`#mail-${kind}`).element as HTMLInputElement).checked;

describe('MailPreferencesCard', () => {
  beforeEach(() => {
    stored = { 'proposal-submitted': true, 'usage-threshold': true, 'round-closing': false };
    patches = [];
    refuse = false;
    stubFetch(serve);
  });

  afterEach(resetTestPage);

  describe('the switches', () => {
    it('should show one switch per optional mail and say which mails always go out', async () => {
      const wrapper = await mountCard();
      expect(wrapper.findAll('input[type="checkbox"]')).toHaveLength(3);
      expect(isOn(wrapper, 'round-closing')).toBe(false);
      expect(wrapper.text()).toContain('An allocation round closes in 14 days');
      expect(wrapper.text()).toContain('Review assignments and decisions on your proposals are always mailed');
    });

    it('should save a change at once, sending only that kind', async () => {
      const wrapper = await mountCard();
      await wrapper.get('#mail-usage-threshold').setValue(false);
      await flushPromises();
      expect(patches).toEqual([{ 'usage-threshold': false }]);
      expect(isOn(wrapper, 'usage-threshold')).toBe(false);
    });

    it('should show the stored value again when saving fails', async () => {
      const wrapper = await mountCard();
      refuse = true;
      await wrapper.get('#mail-proposal-submitted').setValue(false);
      await flushPromises();
      expect(isOn(wrapper, 'proposal-submitted')).toBe(true);
    });
  });
});
