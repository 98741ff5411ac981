import { describe, expect, it } from 'vitest';
import { refundableCoreHours } from './refund';

describe('refund', () => {
  describe('refundableCoreHours', () => {
    it('should give what earlier refunds left of the debit, to the milli-core-hour', () => {
      expect(refundableCoreHours({ coreHours: 768, refundedCoreHours: 0 })).toBe(768);
      expect(refundableCoreHours({ coreHours: 0.3, refundedCoreHours: 0.1 })).toBe(0.2);
    });

    it('should give nothing when the run is refunded in full', () => {
      expect(refundableCoreHours({ coreHours: 100, refundedCoreHours: 100 })).toBe(0);
      expect(refundableCoreHours({ coreHours: 100, refundedCoreHours: 100.0004 })).toBe(0);
    });
  });
});
