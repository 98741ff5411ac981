import type { Ledger, LedgerEntry } from '@localis/shared';
import { flushPromises } from '@vue/test-utils';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { useSessionStore } from '../../stores/session.store';
import { jsonResponse as json, notServed, stubFetch } from '../../test/fetch-stub';
import { mountPage, resetTestPage } from '../../test/mount-in-app';
import CampaignLedgerView from './campaign-ledger-view.vue';
import { CAN_NOTHING, campaignFixture, testRouter } from './test/campaign-fixture';
import { ledgerEntryFixture } from './test/ledger-fixture';

const campaign = campaignFixture({ state: 'granted', can: { ...CAN_NOTHING, recordRuns: true, transfer: true } });
const BASE = `/api/v1/campaigns/${campaign.id}`;

function entry(id: string, kind: LedgerEntry['kind'], coreHours: number, balanceAfter: number, createdAt: string, over: Partial<LedgerEntry> = {}): LedgerEntry {
  return ledgerEntryFixture(kind, coreHours, balanceAfter, createdAt, { id, actorName: 'Orla Fenn', ...over });
}

let ledger: Ledger;
let requests: { method: string; url: string; body: unknown }[];

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
  return notServed(url);
}

async function mountLedger(roles: string[]) {
  const router = testRouter({ path: '/campaigns/:id/ledger', name: 'campaign-ledger', component: CampaignLedgerView, props: true });
  const host = await mountPage(router, `/campaigns/${campaign.id}/ledger`, () => {
    useSessionStore().person = { id: '0a1b2c3d-4e5f-4a6b-8c7d-9e0f1a2b3c4d', name: 'Orla Fenn', email: 'orla@example.org', institutionId: null, roles: roles as never };
  });
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
    stubFetch(serve);
  });

  afterEach(() => {
    resetTestPage();
    vi.restoreAllMocks();
  });

  describe('what it shows', () => {
    it('should show the balances, the overdraft policy and every entry newest first', async () => {
      const wrapper = await mountLedger(['pi']);
      expect(wrapper.get('[data-testid="ledger-granted"]').text()).toBe('1,000 core-hours');
      expect(wrapper.get('[data-testid="ledger-remaining"]').text()).toBe('−50.5 core-hours');
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
