import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { effectScope, nextTick, ref } from 'vue';
import { newCampaignValues, toSpecInput } from '../lib/campaign-form-values';
import { ESTIMATE_DELAY_MS, useLiveEstimate } from './use-live-estimate';

function setup() {
  const values = ref(newCampaignValues());
  const scope = effectScope();
  const live = scope.run(() => useLiveEstimate(() => toSpecInput(values.value.spec)))!;
  return { spec: values.value.spec, live, scope };
}

/** Lets the watcher see the change, then the pause pass. */
async function settle(): Promise<void> {
  await nextTick();
  vi.advanceTimersByTime(ESTIMATE_DELAY_MS + 1);
}

const codes = (live: ReturnType<typeof setup>['live']) => live.report.value?.notices.map((n) => n.code) ?? [];

describe('useLiveEstimate', () => {
  let scope: ReturnType<typeof setup>['scope'] | undefined;

  beforeEach(() => {
    vi.useFakeTimers();
  });

  afterEach(() => {
    scope?.stop();
    vi.useRealTimers();
  });

  describe('following the plan', () => {
    it('should estimate at once when the first plan is valid', () => {
      const t = setup();
      scope = t.scope;

      expect(t.live.report.value?.totalCoreHours).toBeGreaterThan(0);
      expect(t.live.report.value?.rows.map((r) => r.size)).toEqual([6, 8, 12, 16]);
      expect(t.live.specErrors.value).toEqual({});
    });

    it('should wait for the pause before estimating again when the plan changes', async () => {
      const t = setup();
      scope = t.scope;
      const before = t.live.report.value!.totalCoreHours;

      t.spec.sizes = '6, 8, 12, 16, 24';
      await nextTick();
      expect(t.live.report.value!.totalCoreHours).toBe(before);

      vi.advanceTimersByTime(ESTIMATE_DELAY_MS + 1);
      expect(t.live.report.value!.totalCoreHours).toBeGreaterThan(before);
      expect(t.live.report.value!.rows).toHaveLength(5);
    });
  });

  describe('notices', () => {
    it('should warn that the grid misses W_c when the disorder runs from 12 to 14, and stop when it runs from 15 to 18', async () => {
      const t = setup();
      scope = t.scope;
      expect(codes(t.live)).not.toContain('grid-misses-critical-disorder');

      t.spec.disorder.from = '12';
      t.spec.disorder.to = '14';
      await settle();
      expect(codes(t.live)).toContain('grid-misses-critical-disorder');

      t.spec.disorder.from = '15';
      t.spec.disorder.to = '18';
      await settle();
      expect(codes(t.live)).not.toContain('grid-misses-critical-disorder');
    });
  });

  describe('an invalid plan', () => {
    it('should keep the last estimate as stale and give the nested error when a field is wrong', async () => {
      const t = setup();
      scope = t.scope;
      const before = t.live.report.value!.totalCoreHours;

      t.spec.disorder.step = '-1';
      await settle();

      expect(t.live.stale.value).toBe(true);
      expect(t.live.report.value!.totalCoreHours).toBe(before);
      expect(t.live.specErrors.value).toEqual({ 'spec.disorder.step': 'step must be greater than 0' });

      t.spec.disorder.step = '0.5';
      await settle();
      expect(t.live.stale.value).toBe(false);
      expect(t.live.specErrors.value).toEqual({});
    });

    it('should say in words that a required number is missing when its box is emptied', async () => {
      const t = setup();
      scope = t.scope;

      t.spec.realizations = '';
      t.spec.node.coresPerNode = '';
      await settle();

      // The schema's own words where it has them, the form's otherwise; never zod's type jargon.
      for (const key of ['spec.realizations', 'spec.node.coresPerNode']) {
        expect(t.live.specErrors.value[key]).toMatch(/required|fill this in/);
        expect(t.live.specErrors.value[key]).not.toMatch(/Invalid input|expected number/);
      }
    });
  });
});
