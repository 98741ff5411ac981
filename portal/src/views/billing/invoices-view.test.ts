import type { Institution, Invoice, InvoiceRun, Role } from '@localis/shared';
import { flushPromises } from '@vue/test-utils';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { useSessionStore } from '../../stores/session.store';
import { jsonResponse as json, notServed, stubFetch } from '../../test/fetch-stub';
import { memoryRouter, mountPage, resetTestPage } from '../../test/mount-in-app';
import InvoicesView from './invoices-view.vue';
import { formatCalendarDay } from './lib/invoice-format';
import { draftFixture, invoiceFixture, invoiceRunFixture, KESTREL_ID, ORRIN_ID } from './test/billing-fixture';

const API = '/api/v1';
const issued = invoiceFixture();
const overdue = invoiceFixture({ id: '7d2e3f4a-5b6c-4d7e-8f9a-0b1c2d3e4f5b', number: 'LOC-2027-0002', periodFrom: '2027-01-01', periodTo: '2027-01-31', dueOn: '2027-03-02', overdue: true, totalMinor: 12_345 });
const draft = draftFixture({ id: '8e3f4a5b-6c7d-4e8f-9a0b-1c2d3e4f5a6c', periodFrom: '2027-04-01', periodTo: '2027-04-30' });

const partner: Institution = { id: ORRIN_ID, name: 'Orrin Quantum Devices Ltd.', kind: 'partner', country: 'GB', billingEmail: 'accounts@orrin.example', createdAt: '2026-01-01T00:00:00.000Z' } as Institution;
const member: Institution = { ...partner, id: KESTREL_ID, name: 'Kestrel University', kind: 'member', billingEmail: null };

let invoices: Invoice[];
let runs: InvoiceRun[];
let requests: { method: string; url: string; body: unknown }[];

function serve(url: string, init?: RequestInit): Response {
  const method = init?.method ?? 'GET';
  const body = init?.body ? JSON.parse(String(init.body)) : undefined;
  requests.push({ method, url, body });
  if (url.startsWith(`${API}/invoices`) && method === 'GET') return json(200, { items: invoices });
  if (url === `${API}/invoice-runs` && method === 'GET') return json(200, { items: runs });
  if (url === `${API}/invoice-runs` && method === 'POST') {
    const run = invoiceRunFixture({ id: '2e3f4a5b-6c7d-4e8f-8a9b-0c1d2e3f4a5b', periodFrom: body.from, periodTo: body.to, state: 'queued', drafted: 0, finishedAt: null, createdAt: '2027-04-02T08:00:00.000Z' });
    runs = [run, ...runs];
    return json(202, run);
  }
  if (url.startsWith(`${API}/institutions`)) return json(200, { items: [member, partner], total: 2, limit: 200, offset: 0 });
  return notServed(url);
}

const invoiceAsks = () => requests.filter((r) => r.method === 'GET' && r.url.startsWith(`${API}/invoices`)).map((r) => r.url);

async function mountList(roles: Role[], path = '/invoices') {
  const router = memoryRouter([
    { path: '/invoices', name: 'invoices', component: InvoicesView },
    { path: '/invoices/:id', name: 'invoice-detail' },
    { path: '/institutions/:id/rate-cards', name: 'institution-rate-cards' },
  ]);
  const wrapper = await mountPage(router, path, () => {
    useSessionStore().person = { id: '2c3d4e5f-6a7b-4c8d-9e0f-1a2b3c4d5e6f', name: 'Tamsin Greer', email: 'tamsin@orrin.example', institutionId: roles.includes('billing') ? ORRIN_ID : null, roles };
  });
  return { wrapper, router };
}

describe('InvoicesView', { timeout: 20_000 }, () => {
  beforeEach(() => {
    requests = [];
    invoices = [issued, overdue];
    runs = [invoiceRunFixture()];
    stubFetch(serve);
  });

  afterEach(() => {
    resetTestPage();
    vi.useRealTimers();
  });

  describe('a billing contact', () => {
    it('should show the institution’s invoices to pay, latest period first, with totals in their currency and overdue in words', async () => {
      const { wrapper } = await mountList(['billing']);
      expect(invoiceAsks()).toEqual([`${API}/invoices?state=issued`]);
      const rows = wrapper.findAll('[data-testid="invoices-table"] tbody tr');
      expect(rows.map((r) => r.find('a').text())).toEqual(['LOC-2027-0007', 'LOC-2027-0002']);
      expect(rows[0].text()).toContain('Orrin Quantum Devices Ltd.');
      expect(rows[0].text()).toContain('Mar 2027');
      expect(rows[0].text()).toContain('€3,734.36');
      expect(rows[0].get('a').attributes('href')).toBe(`/invoices/${issued.id}`);
      expect(wrapper.get(`[data-testid="invoice-state-${issued.id}"]`).text()).toBe('Issued');
      expect(wrapper.get(`[data-testid="invoice-state-${overdue.id}"]`).text()).toBe('IssuedOverdue');
      expect(wrapper.text()).toContain('2 invoices');
    });

    it('should offer no invoice runs or office filters, and link to their own rate card', async () => {
      const { wrapper } = await mountList(['billing']);
      expect(wrapper.find('[data-testid="invoice-run-form"]').exists()).toBe(false);
      expect(wrapper.find('[data-testid="invoices-filter-state"]').exists()).toBe(false);
      expect(wrapper.get('[data-testid="own-rate-cards"]').attributes('href')).toBe(`/institutions/${ORRIN_ID}/rate-cards`);
      expect(requests.some((r) => r.url.includes('invoice-runs') || r.url.startsWith(`${API}/institutions`))).toBe(false);
    });

    it('should ask for overdue, paid or all invoices when chosen, and keep the choice in the address', async () => {
      const { wrapper, router } = await mountList(['billing']);
      const button = (label: string) => wrapper.get('[data-testid="invoices-show"]').findAll('button').find((b) => b.text() === label)!;
      await button('Overdue').trigger('click');
      await flushPromises();
      expect(router.currentRoute.value.query).toEqual({ show: 'overdue' });
      await button('Paid').trigger('click');
      await flushPromises();
      await button('All').trigger('click');
      await flushPromises();
      expect(invoiceAsks()).toEqual([`${API}/invoices?state=issued`, `${API}/invoices?overdue=true`, `${API}/invoices?state=paid`, `${API}/invoices`]);
    });

    it('should say there is nothing to pay when nothing is open', async () => {
      invoices = [];
      const { wrapper } = await mountList(['billing']);
      expect(wrapper.text()).toContain('Nothing to pay');
    });
  });

  describe('the office', () => {
    it('should list every invoice, a draft as "Draft", with partner and state filters kept in the address', async () => {
      invoices = [issued, overdue, draft];
      const { wrapper, router } = await mountList(['admin']);
      expect(invoiceAsks()).toEqual([`${API}/invoices`]);
      const rows = wrapper.findAll('[data-testid="invoices-table"] tbody tr');
      expect(rows[0].find('a').text()).toBe('Draft');
      expect(rows[0].text()).toContain('Apr 2027');

      await router.replace({ query: { state: 'draft', institutionId: ORRIN_ID, overdue: 'true' } });
      await flushPromises();
      expect(invoiceAsks().at(-1)).toBe(`${API}/invoices?state=draft&institutionId=${ORRIN_ID}&overdue=true`);
      expect(wrapper.find('[data-testid="invoices-clear-filters"]').exists()).toBe(true);
    });

    it('should offer only paying partners in the partner filter', async () => {
      const { wrapper } = await mountList(['admin']);
      await wrapper.get('[data-testid="invoices-filter-institutionId"]').trigger('click');
      await flushPromises();
      const options = [...document.querySelectorAll('.p-select-option')].map((o) => o.textContent?.trim());
      expect(options).toEqual(['Orrin Quantum Devices Ltd.']);
    });

    it('should explain a hand-edited partner id instead of sending it', async () => {
      const { wrapper } = await mountList(['admin'], '/invoices?institutionId=orrin');
      expect(wrapper.text()).toContain('institutionId must be an institution id');
      expect(invoiceAsks()).toEqual([]);
    });

    it('should run invoices for last month by default, for its first to its last day', async () => {
      vi.useFakeTimers({ toFake: ['Date'] });
      vi.setSystemTime(new Date(2027, 3, 15, 12));
      const { wrapper } = await mountList(['admin']);
      // Days are written in the reader's locale: the same formatter as the page.
      expect(wrapper.get('[data-testid="run-covers"]').text()).toContain(`Covers ${formatCalendarDay('2027-03-01')} to ${formatCalendarDay('2027-03-31')}.`);
      await wrapper.get('[data-testid="invoice-run-form"]').trigger('submit');
      await flushPromises();
      expect(requests.filter((r) => r.method === 'POST')).toEqual([{ method: 'POST', url: `${API}/invoice-runs`, body: { from: '2027-03-01', to: '2027-03-31' } }]);
    });

    it('should run a custom range of whole months, and refuse one that ends before it starts', async () => {
      const { wrapper } = await mountList(['admin']);
      await wrapper.get('[data-testid="run-mode"]').findAll('button').find((b) => b.text() === 'Several months')!.trigger('click');
      await wrapper.get('[data-testid="run-from-month"]').setValue('2027-03');
      await wrapper.get('[data-testid="run-to-month"]').setValue('2027-01');
      await wrapper.get('[data-testid="invoice-run-form"]').trigger('submit');
      await flushPromises();
      expect(wrapper.text()).toContain('The period must end on or after its first day (2027-03-01)');
      expect(requests.some((r) => r.method === 'POST')).toBe(false);

      await wrapper.get('[data-testid="run-from-month"]').setValue('2026-11');
      await wrapper.get('[data-testid="invoice-run-form"]').trigger('submit');
      await flushPromises();
      expect(requests.filter((r) => r.method === 'POST').map((r) => r.body)).toEqual([{ from: '2026-11-01', to: '2027-01-31' }]);
    });

    it('should show the runs, poll while one works, and read the invoices again once it is done', async () => {
      vi.useFakeTimers({ toFake: ['setInterval', 'clearInterval'] });
      const { wrapper } = await mountList(['admin']);
      expect(wrapper.get(`[data-testid="run-state-${runs[0].id}"]`).text()).toBe('Done');
      expect(wrapper.get('[data-testid="invoice-runs"]').text()).toContain('2 drafts made or updated');

      await wrapper.get('[data-testid="run-month"]').setValue('2027-03');
      await wrapper.get('[data-testid="invoice-run-form"]').trigger('submit');
      await flushPromises();
      const started = runs[0];
      expect(wrapper.get(`[data-testid="run-state-${started.id}"]`).text()).toBe('Queued');
      expect(wrapper.get('[data-testid="runs-live"]').text()).toContain('Updating every 2 seconds');
      const asked = invoiceAsks().length;

      runs = [{ ...started, state: 'running' }, ...runs.slice(1)];
      vi.advanceTimersByTime(2000);
      await flushPromises();
      expect(wrapper.get(`[data-testid="run-state-${started.id}"]`).text()).toBe('Running');
      expect(invoiceAsks().length).toBe(asked);

      invoices = [draft, issued, overdue];
      runs = [{ ...started, state: 'done', drafted: 1, finishedAt: '2027-04-02T08:00:04.000Z' }, ...runs.slice(1)];
      vi.advanceTimersByTime(2000);
      await flushPromises();
      expect(wrapper.get(`[data-testid="run-state-${started.id}"]`).text()).toBe('Done');
      expect(invoiceAsks().length).toBe(asked + 1);
      expect(wrapper.findAll('[data-testid="invoices-table"] tbody tr')).toHaveLength(3);
      expect(wrapper.get('[data-testid="runs-live"]').text()).toBe('');

      const runAsks = requests.filter((r) => r.url === `${API}/invoice-runs` && r.method === 'GET').length;
      vi.advanceTimersByTime(10_000);
      await flushPromises();
      expect(requests.filter((r) => r.url === `${API}/invoice-runs` && r.method === 'GET').length).toBe(runAsks);
    });

    it('should show why a run failed', async () => {
      runs = [invoiceRunFixture({ state: 'failed', error: 'Orrin Quantum Devices Ltd. has no rate card for 2027-03' })];
      const { wrapper } = await mountList(['admin']);
      expect(wrapper.get('[data-testid="invoice-runs"]').text()).toContain('has no rate card for 2027-03');
      expect(wrapper.get(`[data-testid="run-state-${runs[0].id}"]`).text()).toBe('Failed');
    });
  });
});
