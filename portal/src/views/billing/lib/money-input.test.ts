import { describe, expect, it } from 'vitest';
import { majorToMinor, minorToMajor } from './money-input';

const minor = (text: string, currency: string) => {
  const read = majorToMinor(text, currency);
  return read.ok ? read.minor : read.message;
};

describe('money-input', () => {
  describe('majorToMinor', () => {
    it('should count cents when the currency has 2 decimals (ISO 4217: EUR has 2 minor units)', () => {
      expect(minor('12.34', 'EUR')).toBe(1234);
      expect(minor('12.3', 'EUR')).toBe(1230);
      expect(minor('12', 'EUR')).toBe(1200);
      expect(minor('0.05', 'EUR')).toBe(5);
    });

    it('should count whole yen when the currency has no minor unit (ISO 4217: JPY has 0)', () => {
      expect(minor('1234', 'JPY')).toBe(1234);
    });

    it('should count fils when the currency has 3 decimals (ISO 4217: BHD has 3)', () => {
      expect(minor('1.234', 'BHD')).toBe(1234);
      expect(minor('1.2', 'BHD')).toBe(1200);
    });

    it('should read the digits exactly where a float would not (0.29 * 100 is 28.999… in binary)', () => {
      expect(minor('0.29', 'EUR')).toBe(29);
      expect(minor('1.005', 'BHD')).toBe(1005);
    });

    it('should refuse more decimals than the currency has, not round them', () => {
      expect(minor('12.345', 'EUR')).toBe('EUR has 2 decimals: write at most 2 after the point, e.g. 12.34');
      expect(minor('12.5', 'JPY')).toBe('JPY has no minor unit: write whole amounts, e.g. 1234');
      expect(minor('1.2345', 'BHD')).toBe('BHD has 3 decimals: write at most 3 after the point, e.g. 1.234');
    });

    it('should ask for an amount when the box is empty, and for digits when it holds something else', () => {
      expect(minor('  ', 'EUR')).toBe('enter an amount, e.g. 12.34');
      expect(minor('12,34', 'EUR')).toBe('write the decimals after a point, e.g. 12.34');
      expect(minor('1,234.50', 'EUR')).toBe('write the amount in digits, e.g. 12.34');
      expect(minor('12 EUR', 'EUR')).toBe('write the amount in digits, e.g. 12.34');
      expect(minor('1e3', 'EUR')).toBe('write the amount in digits, e.g. 12.34');
      expect(minor('-1', 'EUR')).toBe('an amount cannot be negative');
    });

    it('should ignore spaces around the amount', () => {
      expect(minor(' 2.50 ', 'EUR')).toBe(250);
    });

    it('should refuse an amount beyond what the api can carry exactly (2^53 - 1 minor units)', () => {
      expect(minor('90071992547409.91', 'EUR')).toBe(9_007_199_254_740_991);
      expect(minor('90071992547409.92', 'EUR')).toBe('this amount is too large');
    });

    it('should wait for a currency before reading an amount', () => {
      expect(minor('12.34', '')).toBe('choose the currency first');
      expect(minor('12.34', 'XTS')).toBe('choose the currency first');
    });
  });

  describe('minorToMajor', () => {
    it('should write minor units back in major units with every digit of the currency', () => {
      expect(minorToMajor(1234, 'EUR')).toBe('12.34');
      expect(minorToMajor(5, 'EUR')).toBe('0.05');
      expect(minorToMajor(1234, 'JPY')).toBe('1234');
      expect(minorToMajor(1234, 'BHD')).toBe('1.234');
      expect(minorToMajor(0, 'BHD')).toBe('0.000');
    });

    it('should give back what majorToMinor reads', () => {
      for (const [value, currency] of [[250, 'EUR'], [7, 'JPY'], [1, 'KWD'], [123_456_789, 'GBP']] as const) {
        expect(minor(minorToMajor(value, currency), currency)).toBe(value);
      }
    });
  });
});
