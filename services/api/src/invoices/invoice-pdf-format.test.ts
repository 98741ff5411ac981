import { describe, expect, it } from 'vitest';
import { formatAmount, formatBasisPoints, formatCoreHours, formatDay, formatMonth } from './invoice-pdf-format';
import { isDrawable, printable } from './invoice-pdf-fonts';

describe('invoice-pdf-format', () => {
  describe('formatCoreHours', () => {
    it('should print three decimals and group thousands when given milli-core-hours', () => {
      expect(formatCoreHours(1_234_567)).toBe('1,234.567');
      expect(formatCoreHours(20_000_375)).toBe('20,000.375');
      expect(formatCoreHours(5)).toBe('0.005');
      expect(formatCoreHours(0)).toBe('0.000');
    });

    it('should lead with a minus when the line is a credit', () => {
      expect(formatCoreHours(-4_250_500)).toBe('-4,250.500');
      expect(formatCoreHours(-2)).toBe('-0.002');
    });

    it('should keep every digit when the figure is beyond 2^53 / 1000', () => {
      expect(formatCoreHours(Number.MAX_SAFE_INTEGER)).toBe('9,007,199,254,740.991');
    });
  });

  describe('formatBasisPoints', () => {
    it('should print a percentage without trailing zeros when given basis points', () => {
      expect(formatBasisPoints(2000)).toBe('20%');
      expect(formatBasisPoints(2050)).toBe('20.5%');
      expect(formatBasisPoints(775)).toBe('7.75%');
      expect(formatBasisPoints(5)).toBe('0.05%');
      expect(formatBasisPoints(0)).toBe('0%');
    });
  });

  describe('dates', () => {
    it('should name the month when given an ISO day or month', () => {
      expect(formatDay('2027-04-05')).toBe('5 April 2027');
      expect(formatDay('2027-12-31')).toBe('31 December 2027');
      expect(formatMonth('2027-03')).toBe('Mar 2027');
    });
  });

  describe('formatAmount', () => {
    it('should be formatMinor when the font has the currency sign', () => {
      expect(formatAmount(123_456, 'EUR')).toBe('€1,234.56');
      expect(formatAmount(-17_002, 'EUR')).toBe('-€170.02');
      expect(formatAmount(1235, 'JPY')).toBe('¥1,235');
      expect(formatAmount(1_234_567, 'BHD')).toBe('BHD\u00a01,234.567');
    });

    it('should put the ISO code for the sign when the font lacks it', () => {
      expect(formatAmount(123_456, 'INR')).toBe('INR\u00a01,234.56');
      expect(formatAmount(-500, 'ILS')).toBe('-ILS\u00a05.00');
      expect(formatAmount(1500, 'KRW')).toBe('KRW\u00a01,500');
    });
  });
});

describe('invoice-pdf-fonts', () => {
  describe('printable', () => {
    it('should keep text the font draws', () => {
      const text = 'Orrin Quantum Devices Ltd. — Zürich, €1,234.56 −5';
      expect(printable(text)).toBe(text);
    });

    it('should drop accents the font lacks and keep the letter when a name has letters beyond latin-1', () => {
      expect(printable('Łódź, Kraków, Brno–Žabovřesky, Ősz')).toBe('Lódz, Kraków, Brno–Zabovresky, Osz');
    });

    it('should use plain spaces and hyphens and drop marks when Intl or a paste brings others', () => {
      expect(printable('1\u202f234\u2009kg\u2011x\u200e')).toBe('1 234 kg-x');
      expect(printable('量子')).toBe('??');
      expect([...printable('Ωmega ₹ ℃')].every(isDrawable)).toBe(true);
    });
  });
});
