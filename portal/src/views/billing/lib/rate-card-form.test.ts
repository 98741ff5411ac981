import { describe, expect, it } from 'vitest';
import { rateCardFixture } from '../test/billing-fixture';
import { currencyLabel, currencyOptions, rateCardFormOf, RateCardFormSchema, tierErrors, type RateCardFormValues } from './rate-card-form';

const values = (over: Partial<RateCardFormValues> = {}): RateCardFormValues => ({
  currency: 'EUR',
  unitPrice: '2.50',
  tiers: [],
  discountPercent: 0,
  taxPercent: 21,
  reverseCharge: false,
  paymentTermsDays: 30,
  effectiveFrom: '2027-05-01',
  ...over,
});

const issuesOf = (v: RateCardFormValues) => (RateCardFormSchema.safeParse(v).error?.issues ?? []).map((i) => [i.path, i.message]);

describe('rate-card-form', () => {
  describe('RateCardFormSchema', () => {
    it('should give the api’s RateCardInput in minor units and basis points', () => {
      const v = values({ tiers: [{ fromCoreHours: 10_000, unitPrice: '2' }], discountPercent: 5.5 });
      expect(RateCardFormSchema.parse(v)).toEqual({
        currency: 'EUR',
        unitPriceMinor: 250,
        tiers: [{ fromCoreHours: 10_000, unitPriceMinor: 200 }],
        discountBasisPoints: 550,
        taxRateBasisPoints: 2100,
        reverseCharge: false,
        paymentTermsDays: 30,
        effectiveFrom: '2027-05-01',
      });
    });

    it('should read prices with the currency’s own digits (JPY none, BHD three)', () => {
      expect(RateCardFormSchema.parse(values({ currency: 'JPY', unitPrice: '1234' })).unitPriceMinor).toBe(1234);
      expect(RateCardFormSchema.parse(values({ currency: 'BHD', unitPrice: '1.234' })).unitPriceMinor).toBe(1234);
    });

    it('should charge no tax when reverse charge is chosen, whatever rate was typed', () => {
      expect(RateCardFormSchema.parse(values({ reverseCharge: true, taxPercent: 21 })).taxRateBasisPoints).toBe(0);
      expect(RateCardFormSchema.parse(values({ reverseCharge: true, taxPercent: null })).taxRateBasisPoints).toBe(0);
    });

    it('should refuse a price with more decimals than the currency has, at the input’s path', () => {
      expect(issuesOf(values({ unitPrice: '2.505' }))).toEqual([[['unitPriceMinor'], 'EUR has 2 decimals: write at most 2 after the point, e.g. 12.34']]);
    });

    it('should put tier problems on their row and field', () => {
      const tiers = [{ fromCoreHours: 5000, unitPrice: '2' }, { fromCoreHours: null, unitPrice: 'x' }, { fromCoreHours: 1000, unitPrice: '1' }];
      expect(issuesOf(values({ tiers }))).toEqual([
        [['tiers', 1, 'fromCoreHours'], 'enter the core-hours where this tier starts'],
        [['tiers', 1, 'unitPriceMinor'], 'write the amount in digits, e.g. 12.34'],
      ]);
    });

    it('should apply the schema’s own order rule once every tier can be read', () => {
      const tiers = [{ fromCoreHours: 5000, unitPrice: '2' }, { fromCoreHours: 1000, unitPrice: '1' }];
      expect(issuesOf(values({ tiers }))).toEqual([[['tiers', 1, 'fromCoreHours'], 'each tier must start above the one before: tier 2 starts at 1000 core-hours, tier 1 at 5000']]);
    });

    it('should ask for a tax rate unless reverse charge is chosen, and refuse rates above 100 %', () => {
      expect(issuesOf(values({ taxPercent: null }))).toEqual([[['taxRateBasisPoints'], 'enter the tax rate (0 when no tax is charged)']]);
      expect(issuesOf(values({ discountPercent: 120 }))).toEqual([[['discountBasisPoints'], 'the discount is at most 10000 bp (100 %)']]);
    });

    it('should let the currency’s own error speak when no currency is chosen', () => {
      expect(issuesOf(values({ currency: '' }))).toEqual([[['currency'], 'a currency is three upper-case letters, e.g. EUR']]);
    });

    it('should refuse a start that is not a date', () => {
      expect(issuesOf(values({ effectiveFrom: '' }))).toEqual([[['effectiveFrom'], 'effective from must be a date, e.g. 2027-01-01']]);
    });
  });

  describe('rateCardFormOf', () => {
    it('should start from the latest card, prices in major units, from the first of next month', () => {
      expect(rateCardFormOf(rateCardFixture(), new Date(2027, 3, 15))).toEqual({
        currency: 'EUR',
        unitPrice: '2.50',
        tiers: [{ fromCoreHours: 10_000, unitPrice: '2.00' }],
        discountPercent: 5,
        taxPercent: 21,
        reverseCharge: false,
        paymentTermsDays: 30,
        effectiveFrom: '2027-05-01',
      });
    });

    it('should start empty in euros with 30 days when the partner has no card yet', () => {
      expect(rateCardFormOf(null, new Date(2027, 11, 2))).toMatchObject({ currency: 'EUR', unitPrice: '', tiers: [], taxPercent: null, paymentTermsDays: 30, effectiveFrom: '2028-01-01' });
    });
  });

  describe('currencies and tier errors', () => {
    it('should name each currency with its decimals, and add an earlier card’s currency to the common ones', () => {
      expect(currencyLabel('JPY')).toBe('JPY · Japanese Yen (no decimals)');
      expect(currencyLabel('BHD')).toBe('BHD · Bahraini Dinar (3 decimals)');
      const codes = currencyOptions(['KWD', 'EUR', 'XTS']).map((o) => o.value);
      expect(codes[0]).toBe('EUR');
      expect(codes.filter((c) => c === 'EUR')).toHaveLength(1);
      expect(codes).toContain('KWD');
      expect(codes).not.toContain('XTS');
    });

    it('should sort issues onto tier rows, and keep an issue about the whole list apart', () => {
      expect(tierErrors([{ path: ['tiers', 0, 'unitPriceMinor'], message: 'm1' }, { path: ['tiers'], message: 'at most 20' }, { path: ['currency'], message: 'x' }])).toEqual({
        list: 'at most 20',
        rows: { 0: { unitPriceMinor: 'm1' } },
      });
    });
  });
});
