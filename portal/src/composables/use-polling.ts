import { getCurrentScope, onScopeDispose, watch } from 'vue';

/**
 * Calls `poll` now and every `intervalMs` while `active()` holds, and again whenever `trigger()`
 * changes (a route change, say). Stops with the component (or effect scope) that set it up.
 * A poll still running is not started twice; its failure is the caller's to handle.
 */
export function usePolling(options: { active: () => boolean; trigger?: () => unknown; poll: () => Promise<void>; intervalMs: number }): { pollNow: () => Promise<void> } {
  let timer: ReturnType<typeof setInterval> | undefined;
  let running = false;

  async function pollNow(): Promise<void> {
    if (running || !options.active()) return;
    running = true;
    try {
      await options.poll();
    } finally {
      running = false;
    }
  }

  function stop(): void {
    clearInterval(timer);
    timer = undefined;
  }

  watch(
    options.active,
    (active) => {
      stop();
      if (!active) return;
      void pollNow();
      timer = setInterval(() => void pollNow(), options.intervalMs);
    },
    { immediate: true },
  );
  if (options.trigger) watch(options.trigger, () => void pollNow());
  if (getCurrentScope()) onScopeDispose(stop);

  return { pollNow };
}
