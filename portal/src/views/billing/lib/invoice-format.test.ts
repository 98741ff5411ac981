import { describe, expect, it } from 'vitest';
import { formatBasisPoints, formatCalendarDay, formatCoreHoursMilli, formatMonth, formatPeriod, formatUnitPrice, invoiceNumberText } from './invoice-format';

const en = { locale: 'en-GB' };

describe('invoice-format', () => {
  describe('formatCalendarDay', () => {
    it('should write the day itself whatever the reader’s zone, when the day is a calendar date', () => {
      expect(formatCalendarDay('2027-03-31', en)).toBe('31 Mar 2027');
      expect(formatCalendarDay('2027-03-31', { ...en, timeZone: 'America/New_York' })).toBe('31 Mar 2027');
    });

    it('should write nothing when there is no day yet (a draft has no due date)', () => {
      expect(formatCalendarDay(null)).toBe('');
    });
  });

  describe('formatPeriod', () => {
    it('should name one month when the period is a single month', () => {
      expect(formatMonth('2027-03', en)).toBe('Mar 2027');
      expect(formatPeriod('2027-03-01', '2027-03-31', en)).toBe('Mar 2027');
    });

    it('should name the first and last month when the period spans several', () => {
      expect(formatPeriod('2026-12-01', '2027-02-28', en)).toBe('Dec 2026 – Feb 2027');
    });
  });

  describe('formatCoreHoursMilli', () => {
    it('should show three decimals from the thousandths, with grouping', () => {
      expect(formatCoreHoursMilli(1_234_500)).toBe('1,234.500 core-hours');
      expect(formatCoreHoursMilli(7)).toBe('0.007 core-hours');
      expect(formatCoreHoursMilli(0)).toBe('0.000 core-hours');
    });

    it('should give a credit line the typographic minus when it is negative', () => {
      expect(formatCoreHoursMilli(-2_000_250)).toBe('−2,000.250 core-hours');
    });
  });

  describe('rates and prices', () => {
    it('should write basis points as a percentage (1 bp = 0.01 %)', () => {
      expect([2100, 550, 1, 0, 10_000].map(formatBasisPoints)).toEqual(['21 %', '5.5 %', '0.01 %', '0 %', '100 %']);
    });

    it('should write a unit price in its currency per core-hour', () => {
      expect(formatUnitPrice(250, 'EUR')).toBe('€2.50 per core-hour');
      expect(formatUnitPrice(1234, 'BHD')).toBe('BHD\u00a01.234 per core-hour');
    });

    it('should call an invoice without a number a draft', () => {
      expect(invoiceNumberText({ number: null })).toBe('Draft');
      expect(invoiceNumberText({ number: 'LOC-2027-0007' })).toBe('LOC-2027-0007');
    });
  });
});
