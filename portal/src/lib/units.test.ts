import { describe, expect, it } from 'vitest';
import { formatBytes, formatCoreHours, formatCoreHoursExact, formatCoreHoursPrecise, formatCoreHoursSigned, formatGiB, formatShare } from './units';

describe('units', () => {
  describe('formatCoreHours', () => {
    it('should write the typographic minus when the amount is negative', () => {
      expect(formatCoreHours(-12_345)).toBe('−12.3 k core-hours');
      expect(formatCoreHours(-850)).toBe('−850 core-hours');
    });

    it('should write whole core-hours with separators when the amount is below ten thousand', () => {
      expect(formatCoreHours(850)).toBe('850 core-hours');
      expect(formatCoreHours(9_876.4)).toBe('9,876 core-hours');
      expect(formatCoreHours(0)).toBe('0 core-hours');
    });

    it('should use three significant digits and k, M or G when the amount is large', () => {
      expect(formatCoreHours(12_345)).toBe('12.3 k core-hours');
      expect(formatCoreHours(4_560_000)).toBe('4.56 M core-hours');
      expect(formatCoreHours(2.5e9)).toBe('2.5 G core-hours');
    });

    it('should keep two significant digits when the amount is below one core-hour', () => {
      expect(formatCoreHours(0.2543)).toBe('0.25 core-hours');
    });

    it('should give empty text when there is no number', () => {
      expect(formatCoreHours(null)).toBe('');
      expect(formatCoreHours(Number.NaN)).toBe('');
    });
  });

  describe('formatCoreHoursExact', () => {
    it('should write every digit when the figure must add up', () => {
      expect(formatCoreHoursExact(1_234_567)).toBe('1,234,567 core-hours');
    });

    it('should write the typographic minus when the figure is negative', () => {
      expect(formatCoreHoursExact(-250_000)).toBe('−250,000 core-hours');
      expect(formatCoreHoursExact(-0.4)).toBe('0 core-hours');
    });
  });

  describe('formatCoreHoursPrecise', () => {
    it('should keep up to three decimals when the amount comes from the ledger', () => {
      expect(formatCoreHoursPrecise(1_234.5)).toBe('1,234.5 core-hours');
      expect(formatCoreHoursPrecise(0.125)).toBe('0.125 core-hours');
      expect(formatCoreHoursPrecise(2_000_000)).toBe('2,000,000 core-hours');
    });

    it('should write a minus sign when the balance is below zero, and no sign for what rounds to zero', () => {
      expect(formatCoreHoursPrecise(-1_536)).toBe('−1,536 core-hours');
      expect(formatCoreHoursPrecise(-0.0001)).toBe('0 core-hours');
    });

    it('should give empty text when there is no number', () => {
      expect(formatCoreHoursPrecise(null)).toBe('');
      expect(formatCoreHoursPrecise(Number.POSITIVE_INFINITY)).toBe('');
    });
  });

  describe('formatCoreHoursSigned', () => {
    it('should always show the sign of what an entry adds or takes away', () => {
      expect(formatCoreHoursSigned(500)).toBe('+500 core-hours');
      expect(formatCoreHoursSigned(-12.5)).toBe('−12.5 core-hours');
      expect(formatCoreHoursSigned(0)).toBe('0 core-hours');
      expect(formatCoreHoursSigned(undefined)).toBe('');
    });
  });

  describe('formatBytes', () => {
    it('should pick the binary unit that keeps the number readable', () => {
      expect(formatBytes(512)).toBe('512 B');
      expect(formatBytes(512 * 1024 ** 2)).toBe('512 MiB');
      expect(formatBytes(1.5 * 1024 ** 3)).toBe('1.5 GiB');
      expect(formatBytes(3.21 * 1024 ** 4)).toBe('3.21 TiB');
    });
  });

  describe('formatGiB', () => {
    it('should write any size in GiB when compared with a node', () => {
      expect(formatGiB(256 * 1024 ** 2)).toBe('0.25 GiB');
    });
  });

  describe('formatShare', () => {
    it('should write a share as a percentage with sensible precision', () => {
      expect(formatShare(0.4213)).toBe('42 %');
      expect(formatShare(0.0312)).toBe('3.1 %');
      expect(formatShare(0.0004)).toBe('< 0.1 %');
      expect(formatShare(0)).toBe('0 %');
    });
  });
});
