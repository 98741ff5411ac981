import { describe, expect, it } from 'vitest';
import { InvoiceLine, InvoiceRunInput, VoidInvoiceInput } from './invoice.schema';

const issuesOf = (schema: typeof InvoiceRunInput | typeof VoidInvoiceInput, value: unknown) =>
  (schema.safeParse(value).error?.issues ?? []).map((i) => [i.path, i.message]);

describe('invoice schemas', () => {
  describe('InvoiceRunInput', () => {
    it('should accept a quarter', () => {
      expect(InvoiceRunInput.parse({ from: '2027-01-01', to: '2027-03-31' })).toEqual({ from: '2027-01-01', to: '2027-03-31' });
    });

    it('should accept one month, February of a leap year included', () => {
      expect(issuesOf(InvoiceRunInput, { from: '2027-03-01', to: '2027-03-31' })).toEqual([]);
      expect(issuesOf(InvoiceRunInput, { from: '2028-02-01', to: '2028-02-29' })).toEqual([]);
    });

    it('should refuse a period that cuts a month, since tiers count whole calendar months', () => {
      expect(issuesOf(InvoiceRunInput, { from: '2027-03-02', to: '2027-03-31' })).toEqual([[['from'], 'an invoice run starts on the first day of a month (tiers count whole calendar months)']]);
      expect(issuesOf(InvoiceRunInput, { from: '2027-03-01', to: '2027-03-30' })).toEqual([[['to'], 'an invoice run ends on the last day of a month (tiers count whole calendar months)']]);
    });

    it('should refuse at to when the period ends before it starts', () => {
      expect(issuesOf(InvoiceRunInput, { from: '2027-04-01', to: '2027-03-31' })).toEqual([[['to'], 'the period must end on or after its first day (2027-04-01)']]);
    });

    it('should accept 366 days when the period is a leap year', () => {
      expect(issuesOf(InvoiceRunInput, { from: '2028-01-01', to: '2028-12-31' })).toEqual([]);
    });

    it('should refuse more than 366 days and say how long the period is', () => {
      expect(issuesOf(InvoiceRunInput, { from: '2027-01-01', to: '2028-01-31' })).toEqual([
        [['to'], 'an invoice run covers at most 366 days; this period has 396: run it in shorter periods'],
      ]);
    });

    it('should refuse a date that is not in the calendar', () => {
      expect(issuesOf(InvoiceRunInput, { from: '2027-02-29', to: '2027-03-31' })).toEqual([[['from'], 'from must be a date, e.g. 2027-01-01']]);
    });
  });

  describe('VoidInvoiceInput', () => {
    it('should keep a reason without its surrounding spaces', () => {
      expect(VoidInvoiceInput.parse({ reason: '  billed to the wrong partner ' })).toEqual({ reason: 'billed to the wrong partner' });
    });

    it('should refuse an empty or blank reason', () => {
      expect(issuesOf(VoidInvoiceInput, { reason: '   ' })).toEqual([[['reason'], 'give the reason for voiding the invoice']]);
      expect(issuesOf(VoidInvoiceInput, {})).toEqual([[['reason'], 'give the reason for voiding the invoice']]);
    });

    it('should refuse a reason longer than 500 characters', () => {
      expect(issuesOf(VoidInvoiceInput, { reason: 'x'.repeat(501) })).toEqual([[['reason'], 'a reason may have at most 500 characters']]);
      expect(issuesOf(VoidInvoiceInput, { reason: 'x'.repeat(500) })).toEqual([]);
    });
  });

  describe('InvoiceLine', () => {
    it('should refuse a month that is not YYYY-MM', () => {
      const line = { campaignId: '7f1c3a52-8a4e-4d1b-9a52-1c0a3e0b6d11', campaignTitle: 'A', month: '2027-13', tier: null, description: 'A', coreHoursMilli: 1, unitPriceMinor: 1, amountMinor: 0, discountMinor: 0, taxMinor: 0 };
      expect(InvoiceLine.safeParse(line).error?.issues.map((i) => i.message)).toEqual(['a month is written YYYY-MM, e.g. 2027-03']);
    });
  });
});
