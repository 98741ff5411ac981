import { describe, expect, it } from 'vitest';
import { formatMinor } from './currency';
import { computeInvoice, CREDIT_NOTE, dueOn, halfAwayFromZero, type InvoicePricing, reconcile, REVERSE_CHARGE_NOTE } from './invoice-math';

const A = '00000000-0000-4000-8000-00000000000a';
const B = '00000000-0000-4000-8000-00000000000b';
const C = '00000000-0000-4000-8000-00000000000c';

/** EUR 2.50 per core-hour, 21 % VAT, no tiers, no discount. */
const card = (overrides: Partial<InvoicePricing> = {}): InvoicePricing => ({
  currency: 'EUR',
  unitPriceMinor: 250,
  tiers: [],
  discountBasisPoints: 0,
  taxRateBasisPoints: 2100,
  reverseCharge: false,
  ...overrides,
});

/** Only the figures of each line, to compare with the sums worked out by hand. */
const figures = (lines: ReturnType<typeof computeInvoice>['lines']) =>
  lines.map((l) => [l.month, l.campaignTitle, l.tier, l.coreHoursMilli, l.unitPriceMinor, l.amountMinor, l.discountMinor, l.taxMinor]);

describe('invoice-math', () => {
  describe('halfAwayFromZero', () => {
    it('should round an exact half away from zero in both signs (common practice for invoice amounts)', () => {
      expect(halfAwayFromZero(5n, 2n)).toBe(3n);
      expect(halfAwayFromZero(-5n, 2n)).toBe(-3n);
      expect(halfAwayFromZero(1n, 2n)).toBe(1n);
      expect(halfAwayFromZero(-1n, 2n)).toBe(-1n);
    });

    it('should round to the nearest integer when the remainder is not a half', () => {
      expect(halfAwayFromZero(7n, 3n)).toBe(2n); // 2.333...
      expect(halfAwayFromZero(-7n, 3n)).toBe(-2n);
      expect(halfAwayFromZero(8n, 3n)).toBe(3n); // 2.666...
      expect(halfAwayFromZero(-8n, 3n)).toBe(-3n);
      expect(halfAwayFromZero(1499n, 1000n)).toBe(1n);
      expect(halfAwayFromZero(-1499n, 1000n)).toBe(-1n);
    });

    it('should leave exact quotients and zero alone', () => {
      expect(halfAwayFromZero(12n, 4n)).toBe(3n);
      expect(halfAwayFromZero(0n, 7n)).toBe(0n);
    });

    it('should take the sign of the quotient when the denominator is negative', () => {
      expect(halfAwayFromZero(5n, -2n)).toBe(-3n);
      expect(halfAwayFromZero(-5n, -2n)).toBe(3n);
    });

    it('should stay exact beyond 2^53', () => {
      // (2^60 + 1) / 2 = 576460752303423488.5 -> 576460752303423489
      expect(halfAwayFromZero(2n ** 60n + 1n, 2n)).toBe(2n ** 59n + 1n);
    });

    it('should refuse to divide by zero', () => {
      expect(() => halfAwayFromZero(1n, 0n)).toThrow(RangeError);
    });
  });

  describe('computeInvoice, plain EUR with 21 % tax', () => {
    // Anderson 3D sweep: 1234.567 core-hours x EUR 2.50 = 1_234_567 x 250 / 1000 = 308_641.75 -> 308_642 cents
    //   tax 308_642 x 2100 / 10000 = 64_814.82 -> 64_815
    // Quantum Hall plateaus: 500 core-hours x 250 = 125_000; tax 125_000 x 0.21 = 26_250
    // subtotal 308_642 + 125_000 = 433_642; tax 64_815 + 26_250 = 91_065; total 433_642 + 91_065 = 524_707 = EUR 5,247.07
    const usage = [
      { month: '2027-03', campaignId: B, campaignTitle: 'Quantum Hall plateaus', netMilli: 500_000 },
      { month: '2027-03', campaignId: A, campaignTitle: 'Anderson 3D sweep', netMilli: 1_234_567 },
    ];

    it('should price each campaign on one line, ordered by title, when there are no tiers', () => {
      expect(figures(computeInvoice(card(), usage).lines)).toEqual([
        ['2027-03', 'Anderson 3D sweep', null, 1_234_567, 250, 308_642, 0, 64_815],
        ['2027-03', 'Quantum Hall plateaus', null, 500_000, 250, 125_000, 0, 26_250],
      ]);
    });

    it('should add up the lines to subtotal, tax and total', () => {
      const invoice = computeInvoice(card(), usage);
      expect([invoice.subtotalMinor, invoice.discountMinor, invoice.taxMinor, invoice.totalMinor]).toEqual([433_642, 0, 91_065, 524_707]);
      expect(formatMinor(invoice.totalMinor, invoice.currency)).toBe('€5,247.07');
      expect(invoice.notes).toEqual([]);
    });

    it('should describe each line with its campaign, month and price', () => {
      expect(computeInvoice(card(), usage).lines[0].description).toBe('Anderson 3D sweep, 2027-03: core-hours at the base price');
    });

    it('should give no line when a campaign used nothing, or its usage cancels out', () => {
      const invoice = computeInvoice(card(), [
        ...usage,
        { month: '2027-03', campaignId: C, campaignTitle: 'Idle campaign', netMilli: 0 },
        { month: '2027-04', campaignId: C, campaignTitle: 'Idle campaign', netMilli: 40_000 },
        { month: '2027-04', campaignId: C, campaignTitle: 'Idle campaign', netMilli: -40_000 },
      ]);
      expect(invoice.lines.map((l) => l.campaignTitle)).toEqual(['Anderson 3D sweep', 'Quantum Hall plateaus']);
    });

    it('should add up several rows of the same campaign and month into one', () => {
      const split = [
        { month: '2027-03', campaignId: A, campaignTitle: 'Anderson 3D sweep', netMilli: 1_000_000 },
        { month: '2027-03', campaignId: A, campaignTitle: 'Anderson 3D sweep', netMilli: 234_567 },
        usage[0],
      ];
      expect(computeInvoice(card(), split)).toEqual(computeInvoice(card(), usage));
    });
  });

  describe('computeInvoice, tiers', () => {
    // Base EUR 3.00; from 1000 core-hours in a month EUR 2.50; from 5000 EUR 2.00. No tax.
    // April, in title order: Alpha 800, Beta 700, Gamma 5000 core-hours.
    //   Alpha  0–800:     800 at base  -> 800_000 x 300 / 1000 = 240_000
    //   Beta   800–1500:  200 at base  -> 200_000 x 300 / 1000 =  60_000   (straddles 1000: two lines)
    //                     500 at tier 1 -> 500_000 x 250 / 1000 = 125_000
    //   Gamma  1500–6500: 3500 at tier 1 -> 3_500_000 x 250 / 1000 = 875_000 (straddles 5000: two lines)
    //                     1500 at tier 2 -> 1_500_000 x 200 / 1000 = 300_000
    // May starts again from 0: Alpha 1200 -> 1000 at base 300_000 + 200 at tier 1 50_000.
    // subtotal 240_000 + 60_000 + 125_000 + 875_000 + 300_000 + 300_000 + 50_000 = 1_950_000
    const tiered = card({ unitPriceMinor: 300, taxRateBasisPoints: 0, tiers: [{ fromCoreHours: 1000, unitPriceMinor: 250 }, { fromCoreHours: 5000, unitPriceMinor: 200 }] });
    const usage = [
      { month: '2027-05', campaignId: A, campaignTitle: 'Alpha', netMilli: 1_200_000 },
      { month: '2027-04', campaignId: C, campaignTitle: 'Gamma', netMilli: 5_000_000 },
      { month: '2027-04', campaignId: B, campaignTitle: 'Beta', netMilli: 700_000 },
      { month: '2027-04', campaignId: A, campaignTitle: 'Alpha', netMilli: 800_000 },
    ];

    it('should split a campaign into one line per tier when its usage straddles a boundary', () => {
      expect(figures(computeInvoice(tiered, usage).lines)).toEqual([
        ['2027-04', 'Alpha', null, 800_000, 300, 240_000, 0, 0],
        ['2027-04', 'Beta', null, 200_000, 300, 60_000, 0, 0],
        ['2027-04', 'Beta', 0, 500_000, 250, 125_000, 0, 0],
        ['2027-04', 'Gamma', 0, 3_500_000, 250, 875_000, 0, 0],
        ['2027-04', 'Gamma', 1, 1_500_000, 200, 300_000, 0, 0],
        ['2027-05', 'Alpha', null, 1_000_000, 300, 300_000, 0, 0],
        ['2027-05', 'Alpha', 0, 200_000, 250, 50_000, 0, 0],
      ]);
      expect(computeInvoice(tiered, usage).subtotalMinor).toBe(1_950_000);
    });

    it('should name the tier and where it starts in the description', () => {
      expect(computeInvoice(tiered, usage).lines[4].description).toBe('Gamma, 2027-04: core-hours beyond 5000 in the month (tier 2)');
    });

    it('should give no empty line when a campaign ends exactly on a boundary', () => {
      // Alpha 0–1000 exactly at base (300_000); Beta 1000–1001 at tier 1 (250).
      const lines = computeInvoice(tiered, [
        { month: '2027-04', campaignId: A, campaignTitle: 'Alpha', netMilli: 1_000_000 },
        { month: '2027-04', campaignId: B, campaignTitle: 'Beta', netMilli: 1_000 },
      ]).lines;
      expect(figures(lines)).toEqual([
        ['2027-04', 'Alpha', null, 1_000_000, 300, 300_000, 0, 0],
        ['2027-04', 'Beta', 0, 1_000, 250, 250, 0, 0],
      ]);
    });

    it('should order campaigns with the same title by id when titles tie', () => {
      // Both 'Sweep', 0.6 core-hours each, tier from 1 core-hour: the smaller id fills the base price first.
      const lines = computeInvoice(card({ tiers: [{ fromCoreHours: 1, unitPriceMinor: 100 }], taxRateBasisPoints: 0 }), [
        { month: '2027-04', campaignId: B, campaignTitle: 'Sweep', netMilli: 600 },
        { month: '2027-04', campaignId: A, campaignTitle: 'Sweep', netMilli: 600 },
      ]).lines;
      // A: 600 at 250 -> 150; B: 400 at 250 -> 100 and 200 at 100 -> 20
      expect(lines.map((l) => [l.campaignId, l.tier, l.coreHoursMilli, l.amountMinor])).toEqual([
        [A, null, 600, 150],
        [B, null, 400, 100],
        [B, 0, 200, 20],
      ]);
    });
  });

  describe('computeInvoice, discount', () => {
    // EUR 1.99 per core-hour, 12.5 % discount, 19 % tax, 3333.333 core-hours:
    //   amount   3_333_333 x 199 / 1000 = 663_333.267 -> 663_333
    //   discount 663_333 x 1250 / 10000 = 82_916.625 -> 82_917
    //   tax      (663_333 - 82_917) x 1900 / 10000 = 580_416 x 0.19 = 110_279.04 -> 110_279
    //   total    663_333 - 82_917 + 110_279 = 690_695
    it('should take the discount before tax, each rounded on the line', () => {
      const invoice = computeInvoice(card({ unitPriceMinor: 199, discountBasisPoints: 1250, taxRateBasisPoints: 1900 }), [
        { month: '2027-06', campaignId: A, campaignTitle: 'Anderson 3D sweep', netMilli: 3_333_333 },
      ]);
      expect(figures(invoice.lines)).toEqual([['2027-06', 'Anderson 3D sweep', null, 3_333_333, 199, 663_333, 82_917, 110_279]]);
      expect([invoice.subtotalMinor, invoice.discountMinor, invoice.taxMinor, invoice.totalMinor]).toEqual([663_333, 82_917, 110_279, 690_695]);
      expect(invoice.discountBasisPoints).toBe(1250);
    });
  });

  describe('computeInvoice, reverse charge', () => {
    // As the plain EUR invoice (subtotal 433_642), but the customer accounts for VAT: tax 0, total 433_642.
    it('should charge no tax and say the customer accounts for VAT', () => {
      const invoice = computeInvoice(card({ reverseCharge: true }), [
        { month: '2027-03', campaignId: A, campaignTitle: 'Anderson 3D sweep', netMilli: 1_234_567 },
        { month: '2027-03', campaignId: B, campaignTitle: 'Quantum Hall plateaus', netMilli: 500_000 },
      ]);
      expect(invoice.lines.map((l) => l.taxMinor)).toEqual([0, 0]);
      expect([invoice.subtotalMinor, invoice.taxMinor, invoice.totalMinor]).toEqual([433_642, 0, 433_642]);
      expect(invoice.reverseCharge).toBe(true);
      expect(invoice.taxRateBasisPoints).toBe(2100);
      expect(invoice.notes).toEqual([REVERSE_CHARGE_NOTE]);
    });
  });

  describe('computeInvoice, rounding at exactly half a minor unit', () => {
    const one = (pricing: InvoicePricing, netMilli: number) =>
      figures(computeInvoice(pricing, [{ month: '2027-03', campaignId: A, campaignTitle: 'Anderson 3D sweep', netMilli }]).lines)[0].slice(3);

    it('should round the amount half away from zero in both signs', () => {
      // 0.1 core-hour x 25 cents = 100 x 25 / 1000 = 2.5 -> 3; the credit -2.5 -> -3
      const pricing = card({ unitPriceMinor: 25, taxRateBasisPoints: 0 });
      expect(one(pricing, 100)).toEqual([100, 25, 3, 0, 0]);
      expect(one(pricing, -100)).toEqual([-100, 25, -3, 0, 0]);
    });

    it('should round the discount half away from zero in both signs', () => {
      // 10 core-hours x 1 cent = 10; 5 % of 10 = 0.5 -> 1; the credit -0.5 -> -1
      const pricing = card({ unitPriceMinor: 1, discountBasisPoints: 500, taxRateBasisPoints: 0 });
      expect(one(pricing, 10_000)).toEqual([10_000, 1, 10, 1, 0]);
      expect(one(pricing, -10_000)).toEqual([-10_000, 1, -10, -1, 0]);
    });

    it('should round the tax half away from zero in both signs', () => {
      // 10 cents at 5 % tax = 0.5 -> 1; the credit -0.5 -> -1
      const pricing = card({ unitPriceMinor: 1, taxRateBasisPoints: 500 });
      expect(one(pricing, 10_000)).toEqual([10_000, 1, 10, 0, 1]);
      expect(one(pricing, -10_000)).toEqual([-10_000, 1, -10, 0, -1]);
    });

    it('should round just below a half towards zero', () => {
      // 1.499 core-hours x 1 cent = 1.499 -> 1; 1.5 -> 2; and the same negated
      const pricing = card({ unitPriceMinor: 1, taxRateBasisPoints: 0 });
      expect([one(pricing, 1_499)[2], one(pricing, 1_500)[2], one(pricing, -1_499)[2], one(pricing, -1_500)[2]]).toEqual([1, 2, -1, -2]);
    });
  });

  describe('computeInvoice, currencies with 0 and 3 minor digits', () => {
    it('should price whole yen when the currency is JPY (ISO 4217: JPY has 0 minor units)', () => {
      // 1234.567 core-hours x JPY 12 = 14_814.804 -> 14_815; 10 % tax 1_481.5 -> 1_482; total 16_297
      const invoice = computeInvoice(card({ currency: 'JPY', unitPriceMinor: 12, taxRateBasisPoints: 1000 }), [
        { month: '2027-03', campaignId: A, campaignTitle: 'Anderson 3D sweep', netMilli: 1_234_567 },
      ]);
      expect([invoice.subtotalMinor, invoice.taxMinor, invoice.totalMinor]).toEqual([14_815, 1_482, 16_297]);
      expect(formatMinor(invoice.totalMinor, invoice.currency)).toBe('¥16,297');
    });

    it('should price fils when the currency is BHD (ISO 4217: BHD has 3 minor units)', () => {
      // 2500.321 core-hours x BHD 0.045 = 2_500_321 x 45 / 1000 = 112_514.445 -> 112_514 fils
      // 10 % tax 11_251.4 -> 11_251; total 112_514 + 11_251 = 123_765 = BHD 123.765
      const invoice = computeInvoice(card({ currency: 'BHD', unitPriceMinor: 45, taxRateBasisPoints: 1000 }), [
        { month: '2027-03', campaignId: A, campaignTitle: 'Anderson 3D sweep', netMilli: 2_500_321 },
      ]);
      expect([invoice.subtotalMinor, invoice.taxMinor, invoice.totalMinor]).toEqual([112_514, 11_251, 123_765]);
      expect(formatMinor(invoice.totalMinor, invoice.currency)).toBe('BHD\u00a0123.765');
    });
  });

  describe('computeInvoice, a refund making a month negative', () => {
    // Base EUR 3.00, from 1000 core-hours EUR 2.50, 21 % tax.
    // March: Anderson 3D sweep 1000 core-hours: 1_000_000 x 300 / 1000 = 300_000; tax 63_000.
    // April: 200 core-hours of a March run refunded (Anderson net -200), Boundary multifractality 1500.
    //   credit   -200_000 x 300 / 1000 = -60_000 at the base price; tax -12_600
    //   Boundary: the month's positive volume is 1500 (the credit does not count), so 1000 at base
    //   300_000 (tax 63_000) and 500 at tier 1: 500_000 x 250 / 1000 = 125_000 (tax 26_250).
    // subtotal 300_000 - 60_000 + 300_000 + 125_000 = 665_000
    // tax 63_000 - 12_600 + 63_000 + 26_250 = 139_650; total 804_650
    const pricing = card({ unitPriceMinor: 300, tiers: [{ fromCoreHours: 1000, unitPriceMinor: 250 }] });
    const usage = [
      { month: '2027-04', campaignId: B, campaignTitle: 'Boundary multifractality', netMilli: 1_500_000 },
      { month: '2027-04', campaignId: A, campaignTitle: 'Anderson 3D sweep', netMilli: -200_000 },
      { month: '2027-03', campaignId: A, campaignTitle: 'Anderson 3D sweep', netMilli: 1_000_000 },
    ];

    it('should credit the net negative usage at the base price on its own line', () => {
      const invoice = computeInvoice(pricing, usage);
      expect(figures(invoice.lines)).toEqual([
        ['2027-03', 'Anderson 3D sweep', null, 1_000_000, 300, 300_000, 0, 63_000],
        ['2027-04', 'Anderson 3D sweep', null, -200_000, 300, -60_000, 0, -12_600],
        ['2027-04', 'Boundary multifractality', null, 1_000_000, 300, 300_000, 0, 63_000],
        ['2027-04', 'Boundary multifractality', 0, 500_000, 250, 125_000, 0, 26_250],
      ]);
      expect(invoice.lines[1].description).toBe('Anderson 3D sweep, 2027-04: credit for core-hours returned, at the base price');
    });

    it('should add the credit into the totals and explain it in a note', () => {
      const invoice = computeInvoice(pricing, usage);
      expect([invoice.subtotalMinor, invoice.discountMinor, invoice.taxMinor, invoice.totalMinor]).toEqual([665_000, 0, 139_650, 804_650]);
      expect(invoice.notes).toEqual([CREDIT_NOTE]);
    });

    it('should give a negative total when the period holds only a refund', () => {
      // -60_000 - 0 + (-12_600) = -72_600
      expect(computeInvoice(pricing, [usage[1]]).totalMinor).toBe(-72_600);
    });
  });

  describe('computeInvoice, input it refuses', () => {
    it('should refuse usage that is not a whole number of milli-core-hours', () => {
      expect(() => computeInvoice(card(), [{ month: '2027-03', campaignId: A, campaignTitle: 'X', netMilli: 1.5 }])).toThrow('must be a whole number');
    });

    it('should refuse a month that is not YYYY-MM', () => {
      expect(() => computeInvoice(card(), [{ month: '2027-3', campaignId: A, campaignTitle: 'X', netMilli: 1 }])).toThrow('the usage month 2027-3 is not written YYYY-MM');
    });

    it('should refuse tiers that are not strictly ascending', () => {
      const pricing = card({ tiers: [{ fromCoreHours: 50, unitPriceMinor: 1 }, { fromCoreHours: 50, unitPriceMinor: 1 }] });
      expect(() => computeInvoice(pricing, [])).toThrow('strictly ascending');
    });

    it('should refuse an invoice whose figures would pass 2^53 minor units rather than round them', () => {
      const pricing = card({ unitPriceMinor: 1_000_000_000, taxRateBasisPoints: 0 });
      expect(() => computeInvoice(pricing, [{ month: '2027-03', campaignId: A, campaignTitle: 'X', netMilli: 2 ** 50 }])).toThrow('beyond what Localis can represent');
    });
  });

  describe('reconcile', () => {
    const usage = [
      { month: '2027-03', campaignId: A, campaignTitle: 'Anderson 3D sweep', netMilli: 1_000_000 },
      { month: '2027-04', campaignId: A, campaignTitle: 'Anderson 3D sweep', netMilli: -200_000 },
      { month: '2027-04', campaignId: B, campaignTitle: 'Boundary multifractality', netMilli: 1_500_000 },
      { month: '2027-04', campaignId: C, campaignTitle: 'Idle', netMilli: 0 },
    ];

    it('should find nothing when the lines bill exactly the usage', () => {
      const pricing = card({ tiers: [{ fromCoreHours: 1000, unitPriceMinor: 200 }] });
      expect(reconcile(computeInvoice(pricing, usage).lines, usage)).toEqual([]);
    });

    it('should list each campaign and month whose lines differ from the usage', () => {
      const lines = computeInvoice(card(), usage).lines.filter((l) => l.coreHoursMilli > 0);
      const extra = { campaignId: C, month: '2027-05', coreHoursMilli: 7 };
      expect(reconcile([...lines, extra], usage)).toEqual([
        { campaignId: A, month: '2027-04', invoicedMilli: 0, usageMilli: -200_000 },
        { campaignId: C, month: '2027-05', invoicedMilli: 7, usageMilli: 0 },
      ]);
    });
  });

  describe('dueOn', () => {
    it('should add the payment terms in calendar days', () => {
      expect(dueOn('2027-03-01', 30)).toBe('2027-03-31');
      expect(dueOn('2027-01-31', 30)).toBe('2027-03-02'); // February 2027 has 28 days
      expect(dueOn('2028-02-28', 1)).toBe('2028-02-29'); // 2028 is a leap year
      expect(dueOn('2027-12-15', 30)).toBe('2028-01-14');
    });

    it('should be the issue day itself when the terms are 0 days', () => {
      expect(dueOn('2027-03-29', 0)).toBe('2027-03-29');
    });

    it('should refuse a date that is not in the calendar, and fractional terms', () => {
      expect(() => dueOn('2027-02-30', 30)).toThrow('not a date');
      expect(() => dueOn('2027-02-03', 1.5)).toThrow('whole number of days');
    });
  });
});
