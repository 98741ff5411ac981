import type { Invoice, Role } from '@localis/shared';
import { flushPromises } from '@vue/test-utils';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { useSessionStore } from '../../stores/session.store';
import { jsonResponse as json, notServed, stubFetch } from '../../test/fetch-stub';
import { memoryRouter, mountPage, resetTestPage } from '../../test/mount-in-app';
import InvoiceDetailView from './invoice-detail-view.vue';
import { draftFixture, INVOICE_ID, invoiceFixture } from './test/billing-fixture';

const BASE = `/api/v1/invoices/${INVOICE_ID}`;
const PAY_URL = 'http://127.0.0.1:12111/checkout/cs_test_7';

let invoice: Invoice;
let requests: { method: string; url: string; body: unknown }[];
/** What the api answers to the next GETs of the invoice, in turn; then `invoice` again. */
let nextReads: Invoice[];

function serve(url: string, init?: RequestInit): Response {
  const method = init?.method ?? 'GET';
  const body = init?.body ? JSON.parse(String(init.body)) : undefined;
  requests.push({ method, url, body });
  if (url === BASE && method === 'GET') return json(200, nextReads.shift() ?? invoice);
  if (url === `${BASE}/issue` && method === 'POST') {
    invoice = { ...invoice, state: 'issued', number: 'LOC-2027-0008', issuedOn: '2027-04-02', dueOn: '2027-05-02', hasPdf: true };
    return json(200, invoice);
  }
  if (url === `${BASE}/void` && method === 'POST') {
    invoice = { ...invoice, state: 'void', voidReason: body.reason, creditNoteNumber: 'CN-2027-0001' };
    return json(200, invoice);
  }
  if (url === `${BASE}/pay` && method === 'POST') return json(200, { url: PAY_URL });
  return notServed(url);
}

const reads = () => requests.filter((r) => r.method === 'GET' && r.url === BASE).length;

async function mountDetail(roles: Role[], path = `/invoices/${INVOICE_ID}`) {
  const router = memoryRouter([
    { path: '/invoices', name: 'invoices' },
    { path: '/invoices/:id', name: 'invoice-detail', component: InvoiceDetailView, props: true },
  ]);
  const host = await mountPage(router, path, () => {
    useSessionStore().person = { id: '2c3d4e5f-6a7b-4c8d-9e0f-1a2b3c4d5e6f', name: 'Tamsin Greer', email: 'tamsin@orrin.example', institutionId: invoice.institutionId, roles };
  });
  return host.getComponent(InvoiceDetailView);
}

type Page = Awaited<ReturnType<typeof mountDetail>>;
const actions = (page: Page) => ['issue', 'void', 'pay', 'pdf'].filter((a) => page.find(`[data-testid="invoice-${a}"]`).exists());

describe('InvoiceDetailView', { timeout: 20_000 }, () => {
  beforeEach(() => {
    requests = [];
    nextReads = [];
    invoice = invoiceFixture();
    stubFetch(serve);
  });

  afterEach(() => {
    resetTestPage();
    vi.useRealTimers();
    vi.restoreAllMocks();
  });

  describe('what it shows', () => {
    it('should show the number, state, partner, dates, reference, lines and totals in the invoice’s currency', async () => {
      const page = await mountDetail(['billing']);
      expect(page.get('[data-testid="invoice-title"]').text()).toBe('Invoice LOC-2027-0007');
      expect(page.get('[data-testid="invoice-state"]').text()).toBe('Issued');
      const facts = page.get('[data-testid="invoice-facts"]').text();
      expect(facts).toContain('Orrin Quantum Devices Ltd.');
      expect(facts).toContain('Mar 2027');
      expect(facts).toContain('RF18 0000 0000 0000 0000 7');
      const line = page.get('[data-testid="invoice-lines"] tbody tr').text();
      expect(line).toContain('Critical disorder of the 3D Anderson model');
      expect(line).toContain('1,234.500 core-hours');
      expect(line).toContain('€2.50');
      expect(line).toContain('€3,086.25');
      const totals = page.get('[data-testid="invoice-totals"]').text();
      expect(totals).toContain('Subtotal€3,086.25');
      expect(totals).toContain('Tax (21 %)€648.11');
      expect(page.get('[data-testid="invoice-total"]').text()).toBe('€3,734.36');
      expect(page.get('[data-testid="invoice-caution"]').text()).toBe('Amounts are not tax advice; the finance office and local law decide.');
    });

    it('should say reverse charge instead of a tax rate, and list the invoice’s notes', async () => {
      invoice = invoiceFixture({ reverseCharge: true, taxRateBasisPoints: 0, taxMinor: 0, totalMinor: 308_625, notes: ['Reverse charge: the customer accounts for VAT.'] });
      const page = await mountDetail(['billing']);
      expect(page.get('[data-testid="invoice-tax"]').text()).toContain('Tax: reverse charge');
      expect(page.get('[data-testid="invoice-tax"]').text()).toContain('the customer accounts for it');
      expect(page.get('[data-testid="invoice-notes"]').text()).toBe('Reverse charge: the customer accounts for VAT.');
    });

    it('should mark an overdue invoice in words, not colour alone', async () => {
      invoice = invoiceFixture({ overdue: true });
      const page = await mountDetail(['billing']);
      expect(page.get('[data-testid="invoice-state"]').text()).toBe('IssuedOverdue');
      expect(page.get('[data-testid="invoice-due"]').text()).toContain('(overdue)');
    });

    it('should say calmly that a failed payment can be tried again', async () => {
      invoice = invoiceFixture({ paymentState: 'failed' });
      const page = await mountDetail(['billing']);
      expect(page.get('[data-testid="payment-failed"]').text()).toContain('did not go through. You can try again with Pay.');
      expect(actions(page)).toContain('pay');
    });

    it('should say when the invoice is not there or not the reader’s', async () => {
      stubFetch((url) => json(404, { error: { code: 'not_found', message: `no ${url}` } }));
      const page = await mountDetail(['billing']);
      expect(page.get('[data-testid="invoice-missing"]').text()).toContain('There is no invoice at this address');
    });
  });

  describe('actions by role and state', () => {
    it('should offer the office Issue alone on a draft, with no PDF yet', async () => {
      invoice = draftFixture();
      const page = await mountDetail(['admin']);
      expect(page.get('[data-testid="invoice-title"]').text()).toBe('Draft invoice');
      expect(actions(page)).toEqual(['issue']);
    });

    it('should offer the office Void, Pay and the PDF on an issued invoice', async () => {
      const page = await mountDetail(['admin']);
      expect(actions(page)).toEqual(['void', 'pay', 'pdf']);
      expect(page.get('[data-testid="invoice-pdf"]').attributes('href')).toBe(`/api/v1/invoices/${INVOICE_ID}/pdf`);
    });

    it('should offer a billing contact Pay and the PDF, never Issue or Void', async () => {
      expect(actions(await mountDetail(['billing']))).toEqual(['pay', 'pdf']);
    });

    it('should offer only the PDF once the invoice is paid', async () => {
      invoice = invoiceFixture({ state: 'paid', paidAt: '2027-04-20T10:00:00.000Z', paymentState: 'succeeded' });
      expect(actions(await mountDetail(['billing']))).toEqual(['pdf']);
    });
  });

  describe('issuing', () => {
    it('should ask first, then issue and show the new number', async () => {
      invoice = draftFixture();
      const page = await mountDetail(['admin']);
      await page.get('[data-testid="invoice-issue"]').trigger('click');
      await flushPromises();
      expect(document.querySelector('.p-confirmdialog')?.textContent).toContain('billing contacts of Orrin Quantum Devices Ltd. receive it by e-mail');
      (document.querySelector('.p-confirmdialog-accept-button') as HTMLButtonElement).click();
      await flushPromises();
      expect(requests.filter((r) => r.method === 'POST').map((r) => r.url)).toEqual([`${BASE}/issue`]);
      expect(page.get('[data-testid="invoice-title"]').text()).toBe('Invoice LOC-2027-0008');
      expect(actions(page)).toEqual(['void', 'pay', 'pdf']);
    });

    it('should issue nothing when the question is declined', async () => {
      invoice = draftFixture();
      const page = await mountDetail(['admin']);
      await page.get('[data-testid="invoice-issue"]').trigger('click');
      await flushPromises();
      (document.querySelector('.p-confirmdialog-reject-button') as HTMLButtonElement).click();
      await flushPromises();
      expect(requests.some((r) => r.method === 'POST')).toBe(false);
    });
  });

  describe('voiding', () => {
    it('should require a reason before anything is sent, then void with it', async () => {
      const page = await mountDetail(['admin']);
      await page.get('[data-testid="invoice-void"]').trigger('click');
      await flushPromises();
      await page.get('#void-invoice-form').trigger('submit');
      await flushPromises();
      expect(document.body.textContent).toContain('Give the reason for voiding the invoice');
      expect(requests.some((r) => r.method === 'POST')).toBe(false);

      await page.get('[data-testid="void-reason"]').setValue('Billed to the wrong partner');
      await page.get('#void-invoice-form').trigger('submit');
      await flushPromises();
      expect(requests.filter((r) => r.method === 'POST')).toEqual([{ method: 'POST', url: `${BASE}/void`, body: { reason: 'Billed to the wrong partner' } }]);
      expect(page.get('[data-testid="invoice-state"]').text()).toBe('Void');
      expect(page.get('[data-testid="invoice-facts"]').text()).toContain('Billed to the wrong partner');
      expect(page.get('[data-testid="invoice-facts"]').text()).toContain('CN-2027-0001');
      expect(actions(page)).toEqual(['pdf']);
    });
  });

  describe('paying', () => {
    it('should ask for the payment link and send the browser there', async () => {
      const assign = vi.spyOn(window.location, 'assign').mockImplementation(() => undefined);
      const page = await mountDetail(['billing']);
      await page.get('[data-testid="invoice-pay"]').trigger('click');
      await flushPromises();
      expect(requests.filter((r) => r.method === 'POST').map((r) => r.url)).toEqual([`${BASE}/pay`]);
      expect(assign).toHaveBeenCalledExactlyOnceWith(PAY_URL);
    });

    it('should stay and show the server’s words when the payment cannot start', async () => {
      const assign = vi.spyOn(window.location, 'assign').mockImplementation(() => undefined);
      stubFetch((url, init) =>
        url.endsWith('/pay') ? json(409, { error: { code: 'conflict', message: 'This invoice is already paid.' } }) : serve(url, init),
      );
      const page = await mountDetail(['billing']);
      await page.get('[data-testid="invoice-pay"]').trigger('click');
      await flushPromises();
      expect(assign).not.toHaveBeenCalled();
      expect(document.body.textContent).toContain('This invoice is already paid.');
    });
  });

  describe('back from the payment provider (?paid=1)', () => {
    it('should ask again every 2 s while confirming, without offering Pay meanwhile, and stop once the invoice shows paid', async () => {
      vi.useFakeTimers({ toFake: ['setInterval', 'clearInterval'] });
      nextReads = [invoiceFixture({ paymentState: 'pending' }), invoiceFixture({ paymentState: 'pending' })];
      invoice = invoiceFixture({ state: 'paid', paidAt: '2027-04-20T10:00:00.000Z', paymentState: 'succeeded' });
      const page = await mountDetail(['billing'], `/invoices/${INVOICE_ID}?paid=1`);
      expect(page.get('[data-testid="payment-confirming"]').text()).toContain('Confirming your payment…');
      expect(page.find('[data-testid="invoice-pay"]').exists()).toBe(false);

      vi.advanceTimersByTime(2000);
      await flushPromises();
      expect(page.get('[data-testid="payment-confirmed"]').text()).toContain('Payment received');
      expect(page.get('[data-testid="invoice-state"]').text()).toBe('Paid');
      const settled = reads();
      vi.advanceTimersByTime(20_000);
      await flushPromises();
      expect(reads()).toBe(settled);
    });

    it('should stop after about 30 s, say calmly that the payment is not confirmed yet and offer Pay again', async () => {
      vi.useFakeTimers({ toFake: ['setInterval', 'clearInterval'] });
      invoice = invoiceFixture({ paymentState: 'pending' });
      const page = await mountDetail(['billing'], `/invoices/${INVOICE_ID}?paid=1`);
      for (let s = 0; s < 30; s += 2) {
        vi.advanceTimersByTime(2000);
        await flushPromises();
      }
      expect(page.find('[data-testid="payment-confirming"]').exists()).toBe(false);
      expect(page.get('[data-testid="payment-unconfirmed"]').text()).toContain('The payment is not confirmed yet');
      expect(page.find('[data-testid="invoice-pay"]').exists()).toBe(true);
      const asked = reads();
      expect(asked).toBeLessThanOrEqual(17);
      vi.advanceTimersByTime(20_000);
      await flushPromises();
      expect(reads()).toBe(asked);
    });

    it('should not poll when the page is opened without the return mark', async () => {
      vi.useFakeTimers({ toFake: ['setInterval', 'clearInterval'] });
      const page = await mountDetail(['billing']);
      vi.advanceTimersByTime(10_000);
      await flushPromises();
      expect(reads()).toBe(1);
      expect(page.find('[data-testid="payment-confirming"]').exists()).toBe(false);
    });
  });
});
