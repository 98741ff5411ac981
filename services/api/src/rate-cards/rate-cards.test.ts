import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { RateCard, RateCardList } from '@localis/shared';
import { createInstitution, createPerson, startTestApp, tokenFor, type TestApp } from '../../test/harness';
import { bearerCaller, type ApiCall } from '../../test/archive-upload';
import { AuditLog } from '../db/models';

let t: TestApp;
let partnerId: string;
let memberId: string;
let admin: ApiCall;
let billing: ApiCall;
let otherBilling: ApiCall;

const card = (effectiveFrom: string, overrides: Record<string, unknown> = {}) => ({
  currency: 'EUR', unitPriceMinor: 12, tiers: [{ fromCoreHours: 100_000, unitPriceMinor: 9 }], discountBasisPoints: 500, taxRateBasisPoints: 2100, paymentTermsDays: 30, effectiveFrom, ...overrides,
});

beforeAll(async () => {
  t = await startTestApp();
  const partner = await createInstitution(t, 'partner');
  const otherPartner = await createInstitution(t, 'partner');
  partnerId = partner.id;
  memberId = (await createInstitution(t)).id;
  admin = bearerCaller(t.url, await tokenFor(t, await createPerson(t, { roles: ['admin'], label: 'office' })));
  billing = bearerCaller(t.url, await tokenFor(t, await createPerson(t, { roles: ['billing'], institutionId: partner.id, label: 'billing' })));
  otherBilling = bearerCaller(t.url, await tokenFor(t, await createPerson(t, { roles: ['billing'], institutionId: otherPartner.id, label: 'other-billing' })));
}, 120_000);
afterAll(async () => t.close());

describe('rate cards', () => {
  it('should create a card, close the one before the day before the next starts, and audit both', async () => {
    const first = await admin('POST', `/institutions/${partnerId}/rate-cards`, card('2027-01-01'));
    expect(first.status).toBe(201);
    const a = (await first.json()) as RateCard;
    expect(a).toMatchObject({ currency: 'EUR', unitPriceMinor: 12, discountBasisPoints: 500, reverseCharge: false, effectiveFrom: '2027-01-01', effectiveTo: null, createdByName: 'Test office' });

    const second = await admin('POST', `/institutions/${partnerId}/rate-cards`, card('2027-07-01', { unitPriceMinor: 14, reverseCharge: true, taxRateBasisPoints: 0 }));
    expect(second.status).toBe(201);
    const { items } = (await (await billing('GET', `/institutions/${partnerId}/rate-cards`)).json()) as RateCardList;
    expect(items.map((c) => [c.effectiveFrom, c.effectiveTo, c.unitPriceMinor])).toEqual([
      ['2027-07-01', null, 14],
      ['2027-01-01', '2027-06-30', 12],
    ]);
    const audits = await AuditLog.findAll({ where: { action: 'rate-card.created', targetId: partnerId } });
    expect(audits).toHaveLength(2);
  });

  it('should only let prices change forward in time', async () => {
    const res = await admin('POST', `/institutions/${partnerId}/rate-cards`, card('2027-03-01'));
    expect(res.status).toBe(409);
    expect(((await res.json()) as { error: { message: string } }).error.message).toMatch(/starts on 2027-07-01; a new one must start after it/);
  });

  it('should refuse a negative price or an unknown currency with 422 and what to change', async () => {
    const negative = await admin('POST', `/institutions/${partnerId}/rate-cards`, card('2028-01-01', { unitPriceMinor: -1 }));
    expect(negative.status).toBe(422);
    expect(JSON.stringify(await negative.json())).toMatch(/cannot be negative/);
    const unknown = await admin('POST', `/institutions/${partnerId}/rate-cards`, card('2028-01-01', { currency: 'XYZ' }));
    expect(unknown.status).toBe(422);
    expect(JSON.stringify(await unknown.json())).toMatch(/XYZ is not an ISO 4217 currency/);
  });

  it('should keep rate cards to partners, and each partner’s cards to its own billing contacts', async () => {
    const member = await admin('POST', `/institutions/${memberId}/rate-cards`, card('2027-01-01'));
    expect(member.status).toBe(409);
    expect(((await member.json()) as { error: { message: string } }).error.message).toMatch(/member institution/);
    expect((await otherBilling('GET', `/institutions/${partnerId}/rate-cards`)).status).toBe(403);
    expect((await billing('POST', `/institutions/${partnerId}/rate-cards`, card('2029-01-01'))).status).toBe(403);
    expect((await admin('GET', '/institutions/00000000-0000-4000-8000-000000000000/rate-cards')).status).toBe(404);
  });
});
