import { z } from 'zod';
import { isIsoCurrency } from './currency';

/** An ISO 4217 code a partner can be invoiced in (see `isIsoCurrency`). */
export const CurrencyCode = z
  .string({ message: 'choose a currency, e.g. EUR' })
  .superRefine((code, ctx) => {
    if (!/^[A-Z]{3}$/.test(code)) ctx.addIssue({ code: 'custom', message: 'a currency is three upper-case letters, e.g. EUR' });
    else if (!isIsoCurrency(code)) ctx.addIssue({ code: 'custom', message: `${code} is not an ISO 4217 currency` });
  })
  .meta({ id: 'CurrencyCode' });
export type CurrencyCode = z.infer<typeof CurrencyCode>;

const PriceMinor = z
  .number({ message: 'the price per core-hour must be a number' })
  .int('the price per core-hour is a whole number of minor units (e.g. cents)')
  .min(0, 'the price per core-hour cannot be negative');

/** Basis points: 1 bp = 0.01 %, 10000 bp = 100 %. */
const BasisPoints = (what: string) =>
  z
    .number({ message: `the ${what} must be a number` })
    .int(`the ${what} is a whole number of basis points (1 bp = 0.01 %)`)
    .min(0, `the ${what} cannot be negative`)
    .max(10_000, `the ${what} is at most 10000 bp (100 %)`);

/**
 * From `fromCoreHours` core-hours of a partner's volume in a calendar month on, each further
 * core-hour costs `unitPriceMinor`; below the first tier the card's own price applies.
 */
export const RateCardTier = z
  .object({
    fromCoreHours: z.number({ message: 'a tier starts at a number of core-hours' }).int('a tier starts at a whole number of core-hours').min(1, 'a tier starts at 1 core-hour or more'),
    unitPriceMinor: PriceMinor,
  })
  .strict()
  .meta({ id: 'RateCardTier' });
export type RateCardTier = z.infer<typeof RateCardTier>;

const Tiers = z
  .array(RateCardTier)
  .max(20, 'a rate card has at most 20 tiers')
  .superRefine((tiers, ctx) => {
    for (let i = 1; i < tiers.length; i++) {
      if (tiers[i].fromCoreHours <= tiers[i - 1].fromCoreHours) {
        ctx.addIssue({
          code: 'custom',
          path: [i, 'fromCoreHours'],
          message: `each tier must start above the one before: tier ${i + 1} starts at ${tiers[i].fromCoreHours} core-hours, tier ${i} at ${tiers[i - 1].fromCoreHours}`,
        });
      }
    }
  });

/** The fields without defaults, shared by the input and the stored card. */
const RateCardFields = z.object({
  currency: CurrencyCode,
  /** The price of one core-hour in minor units (cents for EUR, yen for JPY, fils for BHD). */
  unitPriceMinor: PriceMinor,
  /** Graduated by the partner's volume in a calendar month; strictly ascending. */
  tiers: Tiers,
  discountBasisPoints: BasisPoints('discount'),
  taxRateBasisPoints: BasisPoints('tax rate'),
  /** No tax is charged; the invoice says the customer accounts for VAT. */
  reverseCharge: z.boolean({ message: 'reverse charge is yes or no' }),
  paymentTermsDays: z
    .number({ message: 'payment terms must be a number of days' })
    .int('payment terms are a whole number of days')
    .min(0, 'payment terms cannot be negative')
    .max(365, 'payment terms are at most 365 days'),
  effectiveFrom: z.iso.date({ message: 'effective from must be a date, e.g. 2027-01-01' }),
});

export const RateCardInput = RateCardFields.extend({
  tiers: Tiers.default([]),
  discountBasisPoints: RateCardFields.shape.discountBasisPoints.default(0),
  reverseCharge: RateCardFields.shape.reverseCharge.default(false),
  paymentTermsDays: RateCardFields.shape.paymentTermsDays.default(30),
})
  .strict()
  .meta({ id: 'RateCardInput' });
export type RateCardInput = z.infer<typeof RateCardInput>;

export const RateCard = RateCardFields.extend({
  id: z.uuid(),
  institutionId: z.uuid(),
  /** The day before the next card starts; null while the card is the latest. */
  effectiveTo: z.iso.date().nullable(),
  createdAt: z.iso.datetime(),
  createdByName: z.string().nullable(),
}).meta({ id: 'RateCard' });
export type RateCard = z.infer<typeof RateCard>;

export const RateCardList = z.object({ items: z.array(RateCard) }).meta({ id: 'RateCardList' });
export type RateCardList = z.infer<typeof RateCardList>;
