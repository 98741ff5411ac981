import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { effectScope, nextTick, ref } from 'vue';
import { usePolling } from './use-polling';

describe('usePolling', () => {
  beforeEach(() => vi.useFakeTimers());
  afterEach(() => vi.useRealTimers());

  function setup(initiallyActive = true) {
    const active = ref(initiallyActive);
    const route = ref('/');
    const poll = vi.fn(() => Promise.resolve());
    const scope = effectScope();
    scope.run(() => usePolling({ active: () => active.value, trigger: () => route.value, poll, intervalMs: 60_000 }));
    return { active, route, poll, scope };
  }

  describe('timing', () => {
    it('should poll at once and then every interval while active', async () => {
      const { poll, scope } = setup();
      expect(poll).toHaveBeenCalledTimes(1);
      await vi.advanceTimersByTimeAsync(60_000);
      expect(poll).toHaveBeenCalledTimes(2);
      await vi.advanceTimersByTimeAsync(120_000);
      expect(poll).toHaveBeenCalledTimes(4);
      scope.stop();
    });

    it('should poll again when the trigger changes', async () => {
      const { poll, route, scope } = setup();
      route.value = '/campaigns';
      await nextTick();
      await Promise.resolve();
      expect(poll).toHaveBeenCalledTimes(2);
      scope.stop();
    });
  });

  describe('stopping', () => {
    it('should not poll while inactive, and start once active', async () => {
      const { poll, active, scope } = setup(false);
      await vi.advanceTimersByTimeAsync(180_000);
      expect(poll).not.toHaveBeenCalled();
      active.value = true;
      await nextTick();
      expect(poll).toHaveBeenCalledTimes(1);
      scope.stop();
    });

    it('should stop polling when it becomes inactive (signed out) and when its scope ends', async () => {
      const { poll, active, scope } = setup();
      active.value = false;
      await nextTick();
      await vi.advanceTimersByTimeAsync(180_000);
      expect(poll).toHaveBeenCalledTimes(1);
      active.value = true;
      await nextTick();
      scope.stop();
      await vi.advanceTimersByTimeAsync(180_000);
      expect(poll).toHaveBeenCalledTimes(2);
    });

    it('should not start a poll while the previous one is still running', async () => {
      let finish: () => void = () => undefined;
      const active = ref(true);
      const poll = vi.fn(() => new Promise<void>((resolve) => (finish = resolve)));
      const scope = effectScope();
      scope.run(() => usePolling({ active: () => active.value, poll, intervalMs: 1_000 }));
      await vi.advanceTimersByTimeAsync(3_000);
      expect(poll).toHaveBeenCalledTimes(1);
      finish();
      await vi.advanceTimersByTimeAsync(1_000);
      expect(poll).toHaveBeenCalledTimes(2);
      scope.stop();
    });
  });
});
