import { describe, expect, it } from 'vitest';
import { firstDayOf, firstOfNextMonth, isMonth, lastDayOf, previousMonth } from './month-range';

describe('month-range', () => {
  describe('the days of a month', () => {
    it('should give the first and last day of a month', () => {
      expect([firstDayOf('2027-03'), lastDayOf('2027-03')]).toEqual(['2027-03-01', '2027-03-31']);
      expect(lastDayOf('2027-04')).toBe('2027-04-30');
      expect(lastDayOf('2027-12')).toBe('2027-12-31');
    });

    it('should count February by the Gregorian leap-year rule (2028 leap, 2100 not, 2000 leap)', () => {
      expect([lastDayOf('2027-02'), lastDayOf('2028-02'), lastDayOf('2100-02'), lastDayOf('2000-02')]).toEqual(['2027-02-28', '2028-02-29', '2100-02-28', '2000-02-29']);
    });

    it('should accept only YYYY-MM months', () => {
      expect(['2027-03', '2027-12'].every(isMonth)).toBe(true);
      expect(['2027-13', '2027-3', '', '2027-03-01'].some(isMonth)).toBe(false);
    });
  });

  describe('defaults', () => {
    it('should propose the month before, across a year end', () => {
      expect(previousMonth(new Date(2027, 3, 15))).toBe('2027-03');
      expect(previousMonth(new Date(2027, 0, 1))).toBe('2026-12');
    });

    it('should propose the first of the next month, across a year end', () => {
      expect(firstOfNextMonth(new Date(2027, 3, 15))).toBe('2027-05-01');
      expect(firstOfNextMonth(new Date(2027, 11, 31))).toBe('2028-01-01');
    });
  });
});
