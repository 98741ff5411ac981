import { describe, expect, it } from 'vitest';
import { runPeriodErrors, runPeriodInput, type RunPeriodValues } from './invoice-run-period';

const values = (over: Partial<RunPeriodValues>): RunPeriodValues => ({ mode: 'month', month: '', fromMonth: '', toMonth: '', ...over });

describe('invoice-run-period', () => {
  describe('runPeriodInput', () => {
    it('should run from the first to the last day of the chosen month', () => {
      expect(runPeriodInput(values({ month: '2027-02' }))).toEqual({ input: { from: '2027-02-01', to: '2027-02-28' }, errors: null });
    });

    it('should run from the first day of the first month to the last day of the last in a custom range', () => {
      expect(runPeriodInput(values({ mode: 'range', fromMonth: '2027-01', toMonth: '2027-03' }))).toEqual({ input: { from: '2027-01-01', to: '2027-03-31' }, errors: null });
    });

    it('should ask for the months when they are not chosen', () => {
      expect(runPeriodInput(values({})).errors).toEqual({ month: 'choose the month to invoice' });
      expect(runPeriodInput(values({ mode: 'range', fromMonth: '2027-01' })).errors).toEqual({ toMonth: 'choose the last month' });
    });

    it('should refuse a range that ends before it starts, beside the last month', () => {
      expect(runPeriodInput(values({ mode: 'range', fromMonth: '2027-03', toMonth: '2027-01' })).errors).toEqual({ toMonth: 'the period must end on or after its first day (2027-03-01)' });
    });

    it('should refuse a range longer than the api allows (366 days)', () => {
      const { errors } = runPeriodInput(values({ mode: 'range', fromMonth: '2027-01', toMonth: '2028-01' }));
      expect(errors?.toMonth).toMatch(/^an invoice run covers at most 366 days; this period has 396/);
    });
  });

  describe('runPeriodErrors', () => {
    it('should put the server’s details about from and to beside the box they came from', () => {
      const details = [{ path: ['to'], message: 'ends too late' }, { path: [], message: 'overlaps a running run' }];
      expect(runPeriodErrors(details, 'range')).toEqual({ toMonth: 'ends too late', fromMonth: 'overlaps a running run' });
      expect(runPeriodErrors(details, 'month')).toEqual({ month: 'ends too late' });
    });
  });
});
