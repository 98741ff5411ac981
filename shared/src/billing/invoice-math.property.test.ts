import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { computeInvoice, type CampaignMonthUsage, type InvoicePricing, reconcile } from './invoice-math';

/**
 * Whether `result` is numerator / denominator rounded half away from zero, checked from the
 * definition rather than by calling the same function: the error is at most half a unit, and an
 * exact half moves away from zero (common practice for invoice rounding).
 */
function isRoundedHalfAwayFromZero(result: number, numerator: bigint, denominator: bigint): boolean {
  const error = BigInt(result) * denominator - numerator; // denominator > 0
  const twice = 2n * (error < 0n ? -error : error);
  if (twice > denominator) return false;
  if (twice < denominator) return true;
  return error > 0n === numerator > 0n;
}

const tier = fc.record({ fromCoreHours: fc.integer({ min: 1, max: 20_000 }), unitPriceMinor: fc.integer({ min: 0, max: 100_000 }) });
const pricing: fc.Arbitrary<InvoicePricing> = fc.record({
  currency: fc.constantFrom('EUR', 'JPY', 'BHD'),
  unitPriceMinor: fc.integer({ min: 0, max: 100_000 }),
  // Strictly ascending starts, as the schema requires.
  tiers: fc.uniqueArray(tier, { selector: (t) => t.fromCoreHours, maxLength: 4 }).map((ts) => [...ts].sort((a, b) => a.fromCoreHours - b.fromCoreHours)),
  discountBasisPoints: fc.oneof(fc.constant(0), fc.integer({ min: 0, max: 10_000 })),
  taxRateBasisPoints: fc.oneof(fc.constantFrom(0, 2100, 2000), fc.integer({ min: 0, max: 10_000 })),
  reverseCharge: fc.boolean(),
});

/** A few campaigns, two of them sharing a title, so the id decides their order. */
const CAMPAIGNS = [
  { campaignId: '00000000-0000-4000-8000-000000000001', campaignTitle: 'Anderson 3D sweep' },
  { campaignId: '00000000-0000-4000-8000-000000000002', campaignTitle: 'Quantum Hall plateaus' },
  { campaignId: '00000000-0000-4000-8000-000000000003', campaignTitle: 'Sweep' },
  { campaignId: '00000000-0000-4000-8000-000000000004', campaignTitle: 'Sweep' },
  { campaignId: '00000000-0000-4000-8000-000000000005', campaignTitle: 'Boundary multifractality' },
];
const usageRow: fc.Arbitrary<CampaignMonthUsage> = fc
  .record({
    campaign: fc.constantFrom(...CAMPAIGNS),
    month: fc.constantFrom('2027-01', '2027-02', '2027-03'),
    // Mostly usage, some refunds, some zero; up to 20000 core-hours so tiers are crossed.
    netMilli: fc.oneof({ arbitrary: fc.integer({ min: 0, max: 20_000_000 }), weight: 4 }, { arbitrary: fc.integer({ min: -5_000_000, max: 0 }), weight: 1 }),
  })
  .map(({ campaign, month, netMilli }) => ({ ...campaign, month, netMilli }));
const usage = fc.array(usageRow, { maxLength: 30 });

/** Net usage per campaign and month, as computeInvoice sees it. */
function netByCampaignMonth(rows: readonly CampaignMonthUsage[]) {
  const net = new Map<string, number>();
  for (const u of rows) net.set(`${u.month} ${u.campaignId}`, (net.get(`${u.month} ${u.campaignId}`) ?? 0) + u.netMilli);
  return net;
}

describe('invoice-math properties', () => {
  describe('computeInvoice on random usage and rate cards', () => {
    it('should bill exactly the usage of every campaign and month (reconcile finds nothing)', () => {
      fc.assert(fc.property(pricing, usage, (p, u) => {
        expect(reconcile(computeInvoice(p, u).lines, u)).toEqual([]);
      }), { numRuns: 300 });
    });

    it('should make total = subtotal - discount + tax, each the sum of its line figures', () => {
      fc.assert(fc.property(pricing, usage, (p, u) => {
        const invoice = computeInvoice(p, u);
        const sum = (pick: (l: (typeof invoice.lines)[number]) => number) => invoice.lines.reduce((s, l) => s + pick(l), 0);
        expect(invoice.subtotalMinor).toBe(sum((l) => l.amountMinor));
        expect(invoice.discountMinor).toBe(sum((l) => l.discountMinor));
        expect(invoice.taxMinor).toBe(sum((l) => l.taxMinor));
        expect(invoice.totalMinor).toBe(invoice.subtotalMinor - invoice.discountMinor + invoice.taxMinor);
      }), { numRuns: 300 });
    });

    it('should round every figure of every line once, half away from zero, to a whole minor unit', () => {
      fc.assert(fc.property(pricing, usage, (p, u) => {
        for (const l of computeInvoice(p, u).lines) {
          for (const v of [l.coreHoursMilli, l.unitPriceMinor, l.amountMinor, l.discountMinor, l.taxMinor]) expect(Number.isSafeInteger(v)).toBe(true);
          expect(isRoundedHalfAwayFromZero(l.amountMinor, BigInt(l.coreHoursMilli) * BigInt(l.unitPriceMinor), 1000n)).toBe(true);
          expect(isRoundedHalfAwayFromZero(l.discountMinor, BigInt(l.amountMinor) * BigInt(p.discountBasisPoints), 10_000n)).toBe(true);
          if (p.reverseCharge) expect(l.taxMinor).toBe(0);
          else expect(isRoundedHalfAwayFromZero(l.taxMinor, BigInt(l.amountMinor - l.discountMinor) * BigInt(p.taxRateBasisPoints), 10_000n)).toBe(true);
        }
      }), { numRuns: 300 });
    });

    it("should price each month's positive volume by the tiers it reaches, and credit refunds at the base price", () => {
      fc.assert(fc.property(pricing, usage, (p, u) => {
        const invoice = computeInvoice(p, u);
        const tiers = p.tiers ?? [];
        const bands = [{ from: 0, price: p.unitPriceMinor }, ...tiers.map((t) => ({ from: t.fromCoreHours * 1000, price: t.unitPriceMinor }))];
        const net = netByCampaignMonth(u);
        for (const month of new Set(u.map((r) => r.month))) {
          const volume = [...net].filter(([k, v]) => k.startsWith(month) && v > 0).reduce((s, [, v]) => s + v, 0);
          const lines = invoice.lines.filter((l) => l.month === month);
          bands.forEach((band, i) => {
            const to = i + 1 < bands.length ? bands[i + 1].from : Infinity;
            const expected = Math.max(0, Math.min(volume, to) - band.from);
            const billed = lines.filter((l) => l.coreHoursMilli > 0 && l.tier === (i === 0 ? null : i - 1));
            expect(billed.reduce((s, l) => s + l.coreHoursMilli, 0)).toBe(expected);
            for (const l of billed) expect(l.unitPriceMinor).toBe(band.price);
          });
          for (const credit of lines.filter((l) => l.coreHoursMilli < 0)) {
            expect([credit.tier, credit.unitPriceMinor, credit.coreHoursMilli]).toEqual([null, p.unitPriceMinor, net.get(`${month} ${credit.campaignId}`)]);
          }
        }
        expect(invoice.lines.every((l) => l.coreHoursMilli !== 0)).toBe(true);
      }), { numRuns: 300 });
    });

    it('should not depend on the order the usage arrives in', () => {
      fc.assert(fc.property(pricing, usage, fc.array(fc.nat()), (p, u, keys) => {
        const shuffled = u.map((row, i) => ({ row, key: keys[i] ?? i })).sort((a, b) => a.key - b.key).map((x) => x.row);
        expect(computeInvoice(p, shuffled)).toEqual(computeInvoice(p, u));
      }), { numRuns: 200 });
    });
  });
});
