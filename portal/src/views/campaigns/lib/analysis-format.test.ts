import { describe, expect, it } from 'vitest';
import { decimalsFor, driftWords, formatChi2, formatInterval, formatProbability, formatSignificant, sizesText } from './analysis-format';

describe('analysis-format', () => {
  describe('estimates with intervals', () => {
    it('should keep two significant digits of the half-width, in the estimate and both ends', () => {
      expect(formatInterval({ value: 16.538261, lo: 16.521076, hi: 16.557226 })).toEqual({
        value: '16.538',
        lo: '16.521',
        hi: '16.557',
        text: '16.538 (16.521 to 16.557)',
      });
      expect(formatInterval({ value: 1.5242, lo: 1.4999, hi: 1.5452 }).text).toBe('1.524 (1.500 to 1.545)');
      expect(formatInterval({ value: 1.57, lo: 1.2, hi: 2.1 }).text).toBe('1.57 (1.20 to 2.10)');
    });

    it('should write negatives with a true minus and never "-0"', () => {
      expect(formatInterval({ value: -0.0001, lo: -0.3, hi: 0.3 }).value).toBe('0.00');
      expect(formatInterval({ value: -1.25, lo: -1.5, hi: -1 }).lo).toBe('−1.50');
    });

    it('should fall back to four decimals when the interval has no width', () => {
      expect(decimalsFor(0)).toBe(4);
      expect(decimalsFor(Number.NaN)).toBe(4);
      expect(decimalsFor(0.0123)).toBe(3);
      expect(decimalsFor(2.5)).toBe(1);
      expect(decimalsFor(40)).toBe(0);
    });
  });

  describe('fit figures', () => {
    it('should write p to three decimals and small ones in powers of ten', () => {
      expect(formatProbability(0.6089)).toBe('0.609');
      expect(formatProbability(0.00012)).toBe('1.2 × 10⁻⁴');
      expect(formatProbability(0)).toBe('0');
      expect(formatProbability(null)).toBe('—');
    });

    it('should write chi² with two decimals below 10 and one above', () => {
      expect(formatChi2(56.376)).toBe('56.4');
      expect(formatChi2(3.14159)).toBe('3.14');
      expect(formatSignificant(16.538261306)).toBe('16.54');
    });

    it('should list sizes as a sentence', () => {
      expect(sizesText([6, 8, 10, 12, 16])).toBe('6, 8, 10, 12 and 16');
      expect(sizesText([8])).toBe('8');
    });
  });

  describe('the drift of the crossings', () => {
    const crossing = (size: number, x: number) => ({ sizes: [size, size] as [number, number], size, x, xError: 0.01, value: 0.58, valueError: 0.001 });

    it('should say there is no drift when the slope is within two standard errors of zero', () => {
      const text = driftWords({ path: [crossing(7, 16.5), crossing(9, 16.52)], shifts: [], slopeVsInverseSize: { value: 1.8, error: 2.6 }, direction: 'none' }, 'W');
      expect(text).toContain('does not move measurably');
      expect(text).toContain('dW×/d(1/L) = 1.8 ± 2.6');
    });

    it('should name the direction and point at the irrelevant models when it drifts', () => {
      const text = driftWords({ path: [crossing(7, 16.3), crossing(9, 16.45)], shifts: [], slopeVsInverseSize: { value: -4.1, error: 0.5 }, direction: 'towards larger x' }, 'W');
      expect(text).toContain('towards larger W as L grows');
      expect(text).toContain('ni ≥ 1');
    });

    it('should say when there is nothing to measure', () => {
      expect(driftWords({ path: [], shifts: [], slopeVsInverseSize: null, direction: 'none' }, 'W')).toContain('No pair of successive sizes crosses');
      expect(driftWords({ path: [crossing(7, 16.5)], shifts: [], slopeVsInverseSize: null, direction: 'none' }, 'E')).toContain('Only one pair');
    });
  });
});
