import type { Institution, RateCard, Role } from '@localis/shared';
import { flushPromises } from '@vue/test-utils';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { useSessionStore } from '../../stores/session.store';
import { jsonResponse as json, notServed, stubFetch } from '../../test/fetch-stub';
import { memoryRouter, mountPage, resetTestPage } from '../../test/mount-in-app';
import { rateCardFixture, KESTREL_ID, ORRIN_ID } from './test/billing-fixture';
import RateCardsView from './rate-cards-view.vue';

const CARDS = `/api/v1/institutions/${ORRIN_ID}/rate-cards`;
const partner = { id: ORRIN_ID, name: 'Orrin Quantum Devices Ltd.', kind: 'partner', country: 'GB', billingEmail: 'accounts@orrin.example', createdAt: '2026-01-01T00:00:00.000Z' } as Institution;
const member = { ...partner, id: KESTREL_ID, name: 'Kestrel University', kind: 'member', billingEmail: null } as Institution;

const older = rateCardFixture({ id: '5e6f7a8b-9c0d-4e1f-8a2b-3c4d5e6f7a8b', unitPriceMinor: 300, tiers: [], effectiveFrom: '2026-01-01', effectiveTo: '2026-12-31', createdByName: null });

let cards: RateCard[];
let requests: { method: string; url: string; body: unknown }[];
/** The api's answer to the next POST, when a test wants a refusal. */
let refusal: Response | null;

function serve(url: string, init?: RequestInit): Response {
  const method = init?.method ?? 'GET';
  const body = init?.body ? JSON.parse(String(init.body)) : undefined;
  requests.push({ method, url, body });
  if (url.startsWith('/api/v1/institutions?')) return json(200, { items: [member, partner], total: 2, limit: 200, offset: 0 });
  if (url === CARDS && method === 'GET') return json(200, { items: cards });
  if (url === CARDS && method === 'POST') {
    if (refusal) return refusal;
    const created = rateCardFixture({ ...body, id: '9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d', createdAt: '2027-04-15T09:00:00.000Z' });
    cards = [created, ...cards.map((c) => (c.effectiveTo ? c : { ...c, effectiveTo: '2027-04-30' }))];
    return json(201, created);
  }
  return notServed(url);
}

const posts = () => requests.filter((r) => r.method === 'POST');

async function mountCards(roles: Role[], institutionId = ORRIN_ID) {
  const router = memoryRouter([
    { path: '/invoices', name: 'invoices' },
    { path: '/admin/institutions', name: 'admin-institutions' },
    { path: '/institutions/:id/rate-cards', name: 'institution-rate-cards', component: RateCardsView, props: true },
  ]);
  const host = await mountPage(router, `/institutions/${institutionId}/rate-cards`, () => {
    useSessionStore().person = { id: '2c3d4e5f-6a7b-4c8d-9e0f-1a2b3c4d5e6f', name: 'Maren Holt', email: 'maren@coldwater.example', institutionId: roles.includes('billing') ? ORRIN_ID : null, roles };
  });
  return host.getComponent(RateCardsView);
}

type Page = Awaited<ReturnType<typeof mountCards>>;

async function openForm(page: Page) {
  await page.get('[data-testid="new-rate-card"]').trigger('click');
  await flushPromises();
}

async function submit(page: Page) {
  await page.get('#rate-card-form').trigger('submit');
  await flushPromises();
}

const errorOf = (id: string) => document.getElementById(`${id}-error`)?.textContent ?? null;

describe('RateCardsView', { timeout: 20_000 }, () => {
  beforeEach(() => {
    vi.useFakeTimers({ toFake: ['Date'] });
    vi.setSystemTime(new Date(2027, 3, 15, 12));
    requests = [];
    refusal = null;
    cards = [rateCardFixture(), older];
    stubFetch(serve);
  });

  afterEach(() => {
    resetTestPage();
    vi.useRealTimers();
  });

  describe('the list', () => {
    it('should show a partner’s cards newest first with price, tiers, discount, tax and terms', async () => {
      const page = await mountCards(['billing']);
      expect(page.get('h1').text()).toBe('Rate cards: Orrin Quantum Devices Ltd.');
      const rows = page.findAll('[data-testid="rate-cards-table"] tbody tr');
      expect(rows).toHaveLength(2);
      const latest = rows[0].text();
      expect(latest).toContain('onwards');
      expect(latest).toContain('Latest');
      expect(latest).toContain('€2.50 per core-hour');
      expect(latest).toContain('from 10,000 core-hours a month: €2.00 per core-hour');
      expect(latest).toContain('5 %');
      expect(latest).toContain('21 %');
      expect(latest).toContain('30 days');
      expect(rows[1].text()).toContain('€3.00 per core-hour');
      expect(rows[1].text()).toContain('none');
    });

    it('should say reverse charge in place of a tax rate', async () => {
      cards = [rateCardFixture({ reverseCharge: true, taxRateBasisPoints: 0 })];
      const page = await mountCards(['billing']);
      expect(page.get('[data-testid="rate-cards-table"] tbody tr').text()).toContain('Reverse charge');
    });

    it('should offer a billing contact no form', async () => {
      const page = await mountCards(['billing']);
      expect(page.find('[data-testid="new-rate-card"]').exists()).toBe(false);
    });

    it('should offer no form for a member institution, and say why', async () => {
      cards = [];
      const page = await mountCards(['admin'], KESTREL_ID);
      expect(page.find('[data-testid="new-rate-card"]').exists()).toBe(false);
      expect(page.get('[data-testid="rate-cards-member"]').text()).toContain('Kestrel University is a member institution');
    });
  });

  describe('a new card', () => {
    it('should start from the latest card and send it in minor units and basis points', async () => {
      const page = await mountCards(['admin']);
      await openForm(page);
      expect((page.get('[data-testid="rate-price"]').element as HTMLInputElement).value).toBe('2.50');
      expect((page.get('[data-testid="tier-price-0"]').element as HTMLInputElement).value).toBe('2.00');
      expect((page.get('[data-testid="rate-from"]').element as HTMLInputElement).value).toBe('2027-05-01');

      await page.get('[data-testid="rate-price"]').setValue('2.75');
      await page.get('[data-testid="tier-price-0"]').setValue('2.2');
      await submit(page);
      expect(posts()).toEqual([
        {
          method: 'POST',
          url: CARDS,
          body: {
            currency: 'EUR',
            unitPriceMinor: 275,
            tiers: [{ fromCoreHours: 10_000, unitPriceMinor: 220 }],
            discountBasisPoints: 500,
            taxRateBasisPoints: 2100,
            reverseCharge: false,
            paymentTermsDays: 30,
            effectiveFrom: '2027-05-01',
          },
        },
      ]);
      const rows = page.findAll('[data-testid="rate-cards-table"] tbody tr');
      expect(rows).toHaveLength(3);
      expect(rows[0].text()).toContain('€2.75 per core-hour');
      expect(document.body.textContent).toContain('Rate card added');
    });

    it('should refuse a price with more decimals than the currency has, beside the field, before sending', async () => {
      const page = await mountCards(['admin']);
      await openForm(page);
      await page.get('[data-testid="rate-price"]').setValue('2.505');
      await page.get('[data-testid="tier-price-0"]').setValue('two');
      await submit(page);
      expect(errorOf('rate-price')).toBe('EUR has 2 decimals: write at most 2 after the point, e.g. 12.34');
      expect(errorOf('tier-0-price')).toBe('write the amount in digits, e.g. 12.34');
      expect(posts()).toEqual([]);
    });

    it('should read a price in whole yen when the currency has no minor unit', async () => {
      cards = [rateCardFixture({ currency: 'JPY', unitPriceMinor: 400, tiers: [] })];
      const page = await mountCards(['admin']);
      await openForm(page);
      expect((page.get('[data-testid="rate-price"]').element as HTMLInputElement).value).toBe('400');
      await page.get('[data-testid="rate-price"]').setValue('412.5');
      await submit(page);
      expect(errorOf('rate-price')).toBe('JPY has no minor unit: write whole amounts, e.g. 1234');
      await page.get('[data-testid="rate-price"]').setValue('1234');
      await submit(page);
      expect(posts().map((p) => (p.body as { unitPriceMinor: number }).unitPriceMinor)).toEqual([1234]);
    });

    it('should send a three-decimal currency’s price in its minor units', async () => {
      cards = [rateCardFixture({ currency: 'BHD', unitPriceMinor: 1000, tiers: [] })];
      const page = await mountCards(['admin']);
      await openForm(page);
      await page.get('[data-testid="rate-price"]').setValue('1.234');
      await submit(page);
      expect(posts().map((p) => p.body)).toMatchObject([{ currency: 'BHD', unitPriceMinor: 1234 }]);
    });

    it('should put the server’s 409 beside the start date and keep the dialog open', async () => {
      refusal = json(409, { error: { code: 'conflict', message: 'The latest rate card of Orrin Quantum Devices Ltd. starts on 2027-01-01; a new one must start after it (prices change forward in time).' } });
      const page = await mountCards(['admin']);
      await openForm(page);
      await page.get('[data-testid="rate-from"]').setValue('2026-12-01');
      await submit(page);
      expect(errorOf('rate-from')).toContain('a new one must start after it');
      expect(page.find('#rate-card-form').exists()).toBe(true);
    });

    it('should put the server’s 422 details beside the fields and tier rows they name', async () => {
      refusal = json(422, {
        error: {
          code: 'invalid',
          message: 'Some fields of the body are not valid.',
          details: [
            { path: ['tiers', 0, 'fromCoreHours'], message: 'a tier starts at 1 core-hour or more' },
            { path: ['paymentTermsDays'], message: 'payment terms are at most 365 days' },
          ],
        },
      });
      const page = await mountCards(['admin']);
      await openForm(page);
      await submit(page);
      expect(errorOf('tier-0-from')).toBe('a tier starts at 1 core-hour or more');
      expect(errorOf('rate-terms')).toBe('Payment terms are at most 365 days');
      expect(document.body.textContent).toContain('The rate card was not added');
    });

    it('should charge no tax and disable the rate when reverse charge is chosen', async () => {
      const page = await mountCards(['admin']);
      await openForm(page);
      await page.get('#rate-reverse-charge').setValue(true);
      await flushPromises();
      expect(page.get('#rate-tax').attributes('disabled')).toBeDefined();
      await submit(page);
      expect(posts().map((p) => p.body)).toMatchObject([{ reverseCharge: true, taxRateBasisPoints: 0 }]);
    });
  });
});
