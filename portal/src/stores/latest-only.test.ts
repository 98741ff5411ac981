import { describe, expect, it } from 'vitest';
import { forgetRequestsInFlight, latestOnly } from './latest-only';

describe('latestOnly', () => {
  describe('overlapping loads', () => {
    it('should let only the latest answer land when loads overlap', () => {
      const loads = latestOnly();
      const first = loads.begin();
      const second = loads.begin();
      expect(first.signal.aborted).toBe(true);
      expect(first.isCurrent()).toBe(false);
      expect(second.isCurrent()).toBe(true);
    });

    it('should drop an answer that arrives after sign-out when the stores were reset meanwhile', () => {
      const loads = latestOnly();
      const before = loads.begin();
      forgetRequestsInFlight();
      expect(before.isCurrent()).toBe(false);
      expect(loads.begin().isCurrent()).toBe(true);
    });
  });
});
