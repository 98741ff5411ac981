import { describe, expect, it } from 'vitest';
import { RateCard, RateCardInput } from './rate-card.schema';

const input = { currency: 'EUR', unitPriceMinor: 250, taxRateBasisPoints: 2100, effectiveFrom: '2027-01-01' };
const issuesOf = (value: unknown) => (RateCardInput.safeParse(value).error?.issues ?? []).map((i) => [i.path, i.message]);

describe('rate card schemas', () => {
  describe('RateCardInput defaults', () => {
    it('should fill in no tiers, no discount, no reverse charge and 30 days when they are left out', () => {
      expect(RateCardInput.parse(input)).toEqual({ ...input, tiers: [], discountBasisPoints: 0, reverseCharge: false, paymentTermsDays: 30 });
    });

    it('should keep what is given when every field is sent', () => {
      const full = { ...input, tiers: [{ fromCoreHours: 1000, unitPriceMinor: 200 }], discountBasisPoints: 500, reverseCharge: true, paymentTermsDays: 14 };
      expect(RateCardInput.parse(full)).toEqual(full);
    });

    it('should refuse a field it does not know', () => {
      expect(issuesOf({ ...input, price: 3 })).toEqual([[[], 'Unrecognized key: "price"']]);
    });
  });

  describe('RateCardInput currency', () => {
    it('should refuse a currency that ISO 4217 does not list', () => {
      expect(issuesOf({ ...input, currency: 'XYZ' })).toEqual([[['currency'], 'XYZ is not an ISO 4217 currency']]);
    });

    it('should refuse a pseudo-currency without a minor unit (ISO 4217: XXX and XTS have N.A.)', () => {
      expect(issuesOf({ ...input, currency: 'XTS' })).toEqual([[['currency'], 'XTS is not an ISO 4217 currency']]);
    });

    it('should ask for upper-case letters when the code is not three of them', () => {
      expect(issuesOf({ ...input, currency: 'eur' })).toEqual([[['currency'], 'a currency is three upper-case letters, e.g. EUR']]);
      expect(issuesOf({ ...input, currency: 'EURO' })).toEqual([[['currency'], 'a currency is three upper-case letters, e.g. EUR']]);
    });

    it('should accept zero- and three-decimal currencies', () => {
      expect(RateCardInput.parse({ ...input, currency: 'JPY' }).currency).toBe('JPY');
      expect(RateCardInput.parse({ ...input, currency: 'BHD' }).currency).toBe('BHD');
    });
  });

  describe('RateCardInput prices and rates', () => {
    it('should refuse a negative price per core-hour', () => {
      expect(issuesOf({ ...input, unitPriceMinor: -1 })).toEqual([[['unitPriceMinor'], 'the price per core-hour cannot be negative']]);
    });

    it('should refuse a negative price in a tier at its index', () => {
      expect(issuesOf({ ...input, tiers: [{ fromCoreHours: 10, unitPriceMinor: -5 }] })).toEqual([[['tiers', 0, 'unitPriceMinor'], 'the price per core-hour cannot be negative']]);
    });

    it('should refuse a fraction of a minor unit', () => {
      expect(issuesOf({ ...input, unitPriceMinor: 2.5 })).toEqual([[['unitPriceMinor'], 'the price per core-hour is a whole number of minor units (e.g. cents)']]);
    });

    it('should accept a price of 0 (free compute) and rates of 0 and 100 %', () => {
      expect(issuesOf({ ...input, unitPriceMinor: 0, taxRateBasisPoints: 0, discountBasisPoints: 10_000 })).toEqual([]);
    });

    it('should refuse rates above 100 % or below 0', () => {
      expect(issuesOf({ ...input, taxRateBasisPoints: 10_001, discountBasisPoints: -1 })).toEqual([
        [['discountBasisPoints'], 'the discount cannot be negative'],
        [['taxRateBasisPoints'], 'the tax rate is at most 10000 bp (100 %)'],
      ]);
    });

    it('should refuse payment terms beyond a year', () => {
      expect(issuesOf({ ...input, paymentTermsDays: 366 })).toEqual([[['paymentTermsDays'], 'payment terms are at most 365 days']]);
    });

    it('should refuse a start that is not a calendar date', () => {
      expect(issuesOf({ ...input, effectiveFrom: '2027-02-30' })).toEqual([[['effectiveFrom'], 'effective from must be a date, e.g. 2027-01-01']]);
      expect(issuesOf({ ...input, effectiveFrom: '2027-01-01T00:00:00Z' })).toEqual([[['effectiveFrom'], 'effective from must be a date, e.g. 2027-01-01']]);
    });
  });

  describe('RateCardInput tiers', () => {
    it('should accept tiers when they start at strictly ascending core-hours', () => {
      const tiers = [{ fromCoreHours: 1000, unitPriceMinor: 250 }, { fromCoreHours: 5000, unitPriceMinor: 200 }];
      expect(RateCardInput.parse({ ...input, tiers }).tiers).toEqual(tiers);
    });

    it('should refuse tiers at the one out of order when they are not ascending', () => {
      const tiers = [{ fromCoreHours: 5000, unitPriceMinor: 200 }, { fromCoreHours: 1000, unitPriceMinor: 250 }];
      expect(issuesOf({ ...input, tiers })).toEqual([[['tiers', 1, 'fromCoreHours'], 'each tier must start above the one before: tier 2 starts at 1000 core-hours, tier 1 at 5000']]);
    });

    it('should refuse two tiers starting at the same volume', () => {
      const tiers = [{ fromCoreHours: 1000, unitPriceMinor: 250 }, { fromCoreHours: 1000, unitPriceMinor: 200 }];
      expect(issuesOf({ ...input, tiers })).toEqual([[['tiers', 1, 'fromCoreHours'], 'each tier must start above the one before: tier 2 starts at 1000 core-hours, tier 1 at 1000']]);
    });

    it('should refuse a tier starting at 0 core-hours, where the card price already applies', () => {
      expect(issuesOf({ ...input, tiers: [{ fromCoreHours: 0, unitPriceMinor: 200 }] })).toEqual([[['tiers', 0, 'fromCoreHours'], 'a tier starts at 1 core-hour or more']]);
    });
  });

  describe('RateCard', () => {
    it('should read a stored card as the api returns it', () => {
      const stored = {
        ...RateCardInput.parse(input),
        id: '7f1c3a52-8a4e-4d1b-9a52-1c0a3e0b6d11',
        institutionId: '0b6d117f-1c3a-4d1b-8a4e-9a521c0a3e0b',
        effectiveTo: null,
        createdAt: '2027-01-01T09:30:00.000Z',
        createdByName: null,
      };
      expect(RateCard.parse(stored)).toEqual(stored);
    });
  });
});
