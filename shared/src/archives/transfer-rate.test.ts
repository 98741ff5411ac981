import { describe, expect, it } from 'vitest';
import { TransferRate } from './transfer-rate';

describe('TransferRate', () => {
  describe('the smoothed speed', () => {
    it('should be 0 until two samples are in', () => {
      const rate = new TransferRate(5000);
      expect(rate.perSecond()).toBe(0);
      rate.add(0, 0);
      expect(rate.perSecond()).toBe(0);
    });

    it('should average over the window when parts finish in bursts', () => {
      const rate = new TransferRate(5000);
      rate.add(0, 0);
      rate.add(1000, 8_000_000);
      rate.add(2000, 8_000_000);
      rate.add(3000, 16_000_000);
      expect(rate.perSecond()).toBeCloseTo(16_000_000 / 3, 3);
    });

    it('should measure from the last sample before the window, forgetting older ones', () => {
      const rate = new TransferRate(5000);
      rate.add(0, 0);
      rate.add(1000, 100_000_000);
      rate.add(7000, 106_000_000);
      rate.add(10_000, 109_000_000);
      // Anchor at 1 s (the last sample before 10 s − 5 s): 9 MB over 9 s.
      expect(rate.perSecond()).toBeCloseTo(1_000_000, 3);
    });

    it('should start anew after a reset', () => {
      const rate = new TransferRate(5000);
      rate.add(0, 0);
      rate.add(1000, 1000);
      rate.reset();
      rate.add(5000, 1000);
      expect(rate.perSecond()).toBe(0);
    });
  });
});
