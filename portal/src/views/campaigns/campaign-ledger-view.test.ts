import type { Ledger, LedgerEntry } from '@localis/shared';
import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import ConfirmationService from 'primevue/confirmationservice';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { defineComponent } from 'vue';
import { createMemoryHistory, createRouter } from 'vue-router';
import { useSessionStore } from '../../stores/session.store';
import CampaignLedgerView from './campaign-ledger-view.vue';
import { campaignFixture } from './test/campaign-fixture';

const campaign = campaignFixture({
  state: 'granted',
  can: { edit: false, submit: false, withdraw: false, startReview: false, decide: false, recordRuns: true, transfer: true },
});
const BASE = `/api/v1/campaigns/${campaign.id}`;

function entry(id: string, kind: LedgerEntry['kind'], coreHours: number, balanceAfter: number, createdAt: string, over: Partial<LedgerEntry> = {}): LedgerEntry {
  return {
    id,
    campaignId: campaign.id,
    kind,
    coreHours,
    balanceAfter,
    runId: null,
    externalJobId: null,
    counterpartCampaignId: null,
    counterpartTitle: null,
    reason: null,
    overdraft: false,
    actorName: 'Orla Fenn',
    createdAt,
    ...over,
  };
}

let ledger: Ledger;
let requests: { method: string; url: string; body: unknown }[];

const json = (status: number, body: unknown) => new Response(JSON.stringify(body), { status, headers: { 'content-type': 'application/json' } });

function serve(url: string, init?: RequestInit): Response {
  const method = init?.method ?? 'GET';
  requests.push({ method, url, body: init?.body ? JSON.parse(String(init.body)) : undefined });
  if (url === BASE) return json(200, campaign);
  if (url === `${BASE}/ledger`) return json(200, ledger);
  if (url === `${BASE}/ledger/adjustments` && method === 'POST') {
    const { coreHours, reason } = JSON.parse(String(init?.body)) as { coreHours: number; reason: string };
    const added = entry('4', 'adjustment', coreHours, ledger.remaining + coreHours, '2027-04-10T00:00:00.000Z', { reason });
    ledger = { ...ledger, granted: ledger.granted + coreHours, remaining: ledger.remaining + coreHours, entries: [...ledger.entries, added] };
    return json(201, added);
  }
  return json(404, { error: { code: 'not_found', message: `no ${url}` } });
}

async function mountLedger(roles: string[]) {
  const Blank = defineComponent({ template: '<p>page</p>' });
  const router = createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/campaigns', name: 'campaigns', component: Blank },
      { path: '/campaigns/:id', name: 'campaign-detail', component: Blank },
      { path: '/campaigns/:id/ledger', name: 'campaign-ledger', component: CampaignLedgerView, props: true },
      { path: '/campaigns/:id/runs', name: 'campaign-runs', component: Blank },
    ],
  });
  await router.push(`/campaigns/${campaign.id}/ledger`);
  await router.isReady();
  const pinia = createPinia();
  setActivePinia(pinia);
  useSessionStore().person = { id: '0a1b2c3d-4e5f-4a6b-8c7d-9e0f1a2b3c4d', name: 'Orla Fenn', email: 'orla@example.org', institutionId: null, roles: roles as never };
  const Host = defineComponent({ template: '<RouterView />' });
  const host = mount(Host, {
    global: { plugins: [pinia, router, [PrimeVue, { theme: 'none' }], ToastService, ConfirmationService], stubs: { teleport: true } },
    attachTo: document.body,
  });
  await flushPromises();
  return host.getComponent(CampaignLedgerView);
}

describe('CampaignLedgerView', { timeout: 20_000 }, () => {
  beforeEach(() => {
    requests = [];
    ledger = {
      campaignId: campaign.id,
      granted: 1000,
      used: 1050.5,
      expired: 0,
      remaining: -50.5,
      overdraftPercent: 10,
      overdraftAllowance: 100,
      alerted: [75, 90, 100],
      entries: [
        entry('1', 'grant', 1000, 1000, '2027-04-01T00:00:00.000Z', { actorName: null }),
        entry('2', 'debit', -800, 200, '2027-04-02T00:00:00.000Z', { externalJobId: '981234' }),
        entry('3', 'debit', -250.5, -50.5, '2027-04-03T00:00:00.000Z', { externalJobId: '981235', overdraft: true }),
      ],
    };
    vi.stubGlobal('fetch', vi.fn((url: string, init?: RequestInit) => Promise.resolve(serve(url, init))));
  });

  afterEach(() => {
    vi.unstubAllGlobals();
    vi.restoreAllMocks();
    document.body.innerHTML = '';
  });

  describe('what it shows', () => {
    it('should show the balances, the overdraft policy and every entry newest first', async () => {
      const wrapper = await mountLedger(['pi']);
      expect(wrapper.get('[data-testid="ledger-granted"]').text()).toBe('1,000 core-hours');
      expect(wrapper.get('[data-testid="ledger-remaining"]').text()).toBe('-50.5 core-hours');
      expect(wrapper.get('[data-testid="ledger-policy"]').text()).toContain('−100 core-hours (10 % of the grant)');
      const rows = wrapper.findAll('[data-testid="ledger-entries"] tbody tr');
      expect(rows).toHaveLength(3);
      expect(rows[0].text()).toContain('981235');
      expect(rows[0].text()).toContain('−250.5 core-hours');
      expect(rows[0].text()).toContain('Overdraft');
      expect(rows[2].text()).toContain('+1,000 core-hours');
    });

    it('should offer the PI a transfer but not the office’s adjustments and refunds', async () => {
      const wrapper = await mountLedger(['pi']);
      expect(wrapper.find('[data-testid="ledger-transfer"]').exists()).toBe(true);
      expect(wrapper.find('[data-testid="ledger-adjust"]').exists()).toBe(false);
      expect(wrapper.find('[data-testid="ledger-refund"]').exists()).toBe(false);
    });
  });

  describe('the CSV', () => {
    it('should hand over the entries as a CSV made in the browser', async () => {
      const blobs: Blob[] = [];
      vi.spyOn(URL, 'createObjectURL').mockImplementation((b) => (blobs.push(b as Blob), 'blob:ledger'));
      vi.spyOn(URL, 'revokeObjectURL').mockImplementation(() => undefined);
      const wrapper = await mountLedger(['pi']);
      await wrapper.get('[data-testid="ledger-csv"]').trigger('click');
      const text = await blobs[0].text();
      expect(text.split('\r\n')[0]).toBe('createdAt,kind,coreHours,balanceAfter,externalJobId,counterpartTitle,reason,overdraft,actorName,id');
      expect(text).toContain('2027-04-03T00:00:00.000Z,Run,-250.5,-50.5,981235,,,yes,Orla Fenn,3');
    });
  });

  describe('an adjustment', () => {
    it('should check the form, write the adjustment and show the new balance', async () => {
      const wrapper = await mountLedger(['admin']);
      await wrapper.get('[data-testid="ledger-adjust"]').trigger('click');
      await flushPromises();
      await wrapper.get('[data-testid="adjustment-submit"]').trigger('click');
      await flushPromises();
      expect(document.body.textContent).toContain('Core-hours must be a number');
      expect(document.body.textContent).toContain('Give a reason of at least 3 characters');
      expect(requests.some((r) => r.method === 'POST')).toBe(false);

      const hours = wrapper.get('#adjustment-hours');
      await hours.setValue('200');
      await hours.trigger('input');
      await hours.trigger('blur');
      await wrapper.get('[data-testid="adjustment-reason"]').setValue('Node failure on cluster-a');
      await wrapper.get('#adjustment-form').trigger('submit');
      await flushPromises();

      expect(requests.find((r) => r.method === 'POST')?.body).toEqual({ coreHours: 200, reason: 'Node failure on cluster-a' });
      expect(wrapper.get('[data-testid="ledger-remaining"]').text()).toBe('150 core-hours');
    });
  });
});
