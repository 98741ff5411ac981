import { describe, expect, it } from 'vitest';
import { ledgerEntryFixture as entry } from '../test/ledger-fixture';
import { burnDownSeries, burnDownTickUnit, usageLevel, usedShare } from './ledger-burn-down';

const t = (iso: string) => new Date(iso).getTime();

describe('ledger-burn-down', () => {
  describe('burnDownSeries', () => {
    it('should give empty lines when the ledger has no entries', () => {
      expect(burnDownSeries({ entries: [], overdraftAllowance: 0 })).toEqual({ remaining: [], granted: [], floor: [] });
    });

    it('should follow the balance after each entry and hold the last one until now', () => {
      const series = burnDownSeries(
        {
          overdraftAllowance: 0,
          entries: [
            entry('grant', 1000, 1000, '2027-04-01T00:00:00.000Z'),
            entry('debit', -250.5, 749.5, '2027-04-03T12:00:00.000Z'),
            entry('refund', 50.5, 800, '2027-04-04T00:00:00.000Z'),
          ],
        },
        new Date('2027-05-01T00:00:00Z'),
      );
      expect(series.remaining).toEqual([
        { x: t('2027-04-01T00:00:00Z'), y: 1000 },
        { x: t('2027-04-03T12:00:00Z'), y: 749.5 },
        { x: t('2027-04-04T00:00:00Z'), y: 800 },
        { x: t('2027-05-01T00:00:00Z'), y: 800 },
      ]);
    });

    it('should move the grant line with adjustments and transfers but not with runs or expiry', () => {
      const series = burnDownSeries(
        {
          overdraftAllowance: 0,
          entries: [
            entry('grant', 1000, 1000, '2027-04-01T00:00:00.000Z'),
            entry('debit', -400, 600, '2027-04-02T00:00:00.000Z'),
            entry('adjustment', 200, 800, '2027-04-03T00:00:00.000Z'),
            entry('transfer', -100, 700, '2027-04-04T00:00:00.000Z'),
            entry('expiry', -700, 0, '2027-04-05T00:00:00.000Z'),
          ],
        },
        new Date('2027-04-06T00:00:00Z'),
      );
      expect(series.granted.map((p) => p.y)).toEqual([1000, 1000, 1200, 1100, 1100, 1100]);
    });

    it('should sort the entries by time when they arrive out of order', () => {
      const series = burnDownSeries(
        {
          overdraftAllowance: 0,
          entries: [entry('debit', -10, 90, '2027-04-02T00:00:00.000Z'), entry('grant', 100, 100, '2027-04-01T00:00:00.000Z')],
        },
        new Date('2027-04-01T00:00:00Z'),
      );
      expect(series.remaining.map((p) => p.y)).toEqual([100, 90, 90]);
      // A clock behind the last entry does not draw the line backwards.
      expect(series.remaining[2].x).toBe(t('2027-04-02T00:00:00Z'));
    });

    it('should draw the overdraft floor below zero when the round allows one', () => {
      const series = burnDownSeries({ overdraftAllowance: 100, entries: [entry('grant', 1000, 1000, '2027-04-01T00:00:00.000Z')] }, new Date('2027-04-10T00:00:00Z'));
      expect(series.floor).toEqual([
        { x: t('2027-04-01T00:00:00Z'), y: -100 },
        { x: t('2027-04-10T00:00:00Z'), y: -100 },
      ]);
    });
  });

  describe('usedShare', () => {
    it('should give the share of the grant used, beyond 1 in an overdraft, and 0 without a grant', () => {
      expect(usedShare({ granted: 1000, used: 250 })).toBe(0.25);
      expect(usedShare({ granted: 1000, used: 1100 })).toBeCloseTo(1.1);
      expect(usedShare({ granted: 0, used: 0 })).toBe(0);
      expect(usedShare({ granted: 1000, used: -5 })).toBe(0);
    });
  });

  describe('burnDownTickUnit', () => {
    const at = (...times: string[]) => ({ remaining: times.map((t) => ({ x: new Date(t).getTime(), y: 0 })) });

    it('should read in times of day when every point falls within two days', () => {
      expect(burnDownTickUnit(at('2027-03-01T08:00:00Z', '2027-03-01T17:30:00Z'))).toBe('time');
      expect(burnDownTickUnit(at('2027-03-01T08:00:00Z', '2027-03-03T08:00:00Z'))).toBe('time');
    });

    it('should read in dates when the points span more than two days', () => {
      expect(burnDownTickUnit(at('2027-03-01T08:00:00Z', '2027-03-03T08:00:01Z'))).toBe('date');
    });

    it('should read in dates when there is nothing to draw', () => {
      expect(burnDownTickUnit({ remaining: [] })).toBe('date');
    });
  });

  describe('usageLevel', () => {
    it('should stay plain below three quarters of the grant', () => {
      expect(usageLevel(0)).toBe('ok');
      expect(usageLevel(0.7499)).toBe('ok');
    });

    it('should warn from 75 % and turn to over from 100 %', () => {
      expect(usageLevel(0.75)).toBe('warn');
      expect(usageLevel(0.9999)).toBe('warn');
      expect(usageLevel(1)).toBe('over');
      expect(usageLevel(1.2)).toBe('over');
    });
  });
});
