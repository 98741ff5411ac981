import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { effectScope, nextTick, ref } from 'vue';
import { usePolledList } from './use-polled-list';

interface Item {
  id: string;
  createdAt: string;
  state: 'waiting' | 'done';
}

const older: Item = { id: 'a', createdAt: '2027-03-01T09:00:00.000Z', state: 'done' };
const newer: Item = { id: 'b', createdAt: '2027-03-02T09:00:00.000Z', state: 'waiting' };

/** A request the test answers when it likes, as the api would. */
function deferred<T>() {
  let resolve: (value: T) => void = () => undefined;
  let reject: (error: unknown) => void = () => undefined;
  const promise = new Promise<T>((yes, no) => ((resolve = yes), (reject = no)));
  return { promise, resolve, reject };
}

describe('usePolledList', () => {
  beforeEach(() => vi.useFakeTimers());
  afterEach(() => vi.useRealTimers());

  function setup(answer: (owner: string) => Promise<{ items: Item[] }>) {
    const owner = ref('campaign-1');
    const fetchList = vi.fn((id: string, _signal: AbortSignal) => answer(id));
    const onFirstLoadFailure = vi.fn();
    const scope = effectScope();
    const list = scope.run(() => usePolledList({ owner, fetchList, isMoving: (i: Item) => i.state === 'waiting', intervalMs: 1000, onFirstLoadFailure }))!;
    return { owner, fetchList, onFirstLoadFailure, scope, list };
  }

  describe('loading', () => {
    it('should load at once and show the newest first', async () => {
      const { list, scope } = setup(async () => ({ items: [older, { ...newer, state: 'done' }] }));
      expect(list.loaded.value).toBe(false);
      await vi.advanceTimersByTimeAsync(0);
      expect(list.loaded.value).toBe(true);
      expect(list.items.value.map((i) => i.id)).toEqual(['b', 'a']);
      expect(list.moving.value).toEqual([]);
      scope.stop();
    });

    it('should start again for another owner, and drop the answer still on its way for the last one', async () => {
      const first = deferred<{ items: Item[] }>();
      const { list, owner, scope } = setup((id) => (id === 'campaign-1' ? first.promise : Promise.resolve({ items: [older] })));
      owner.value = 'campaign-2';
      await nextTick();
      await vi.advanceTimersByTimeAsync(0);
      first.resolve({ items: [{ ...newer, state: 'done' }] });
      await vi.advanceTimersByTimeAsync(0);
      expect(list.items.value.map((i) => i.id)).toEqual(['a']);
      scope.stop();
    });
  });

  describe('polling', () => {
    it('should ask again every interval while an item moves, and stop once none does', async () => {
      let items = [newer, older];
      const { list, fetchList, scope } = setup(async () => ({ items }));
      await vi.advanceTimersByTimeAsync(0);
      expect(list.moving.value.map((i) => i.id)).toEqual(['b']);
      const asked = fetchList.mock.calls.length;
      await vi.advanceTimersByTimeAsync(1000);
      expect(fetchList).toHaveBeenCalledTimes(asked + 1);
      items = [{ ...newer, state: 'done' }, older];
      await vi.advanceTimersByTimeAsync(1000);
      expect(fetchList).toHaveBeenCalledTimes(asked + 2);
      expect(list.moving.value).toEqual([]);
      await vi.advanceTimersByTimeAsync(10_000);
      expect(fetchList).toHaveBeenCalledTimes(asked + 2);
      scope.stop();
    });

    it('should stop asking when its component goes', async () => {
      const { fetchList, scope } = setup(async () => ({ items: [newer] }));
      await vi.advanceTimersByTimeAsync(0);
      const asked = fetchList.mock.calls.length;
      scope.stop();
      await vi.advanceTimersByTimeAsync(10_000);
      expect(fetchList).toHaveBeenCalledTimes(asked);
    });
  });

  describe('failures', () => {
    it('should say a failed first load, hand it over once, and recover when tried again', async () => {
      const refused = new Error('refused');
      let fail = true;
      const { list, onFirstLoadFailure, scope } = setup(async () => {
        if (fail) throw refused;
        return { items: [older] };
      });
      await vi.advanceTimersByTimeAsync(0);
      expect(list.failed.value).toBe(true);
      expect(onFirstLoadFailure).toHaveBeenCalledExactlyOnceWith(refused);
      fail = false;
      await list.load();
      expect(list.failed.value).toBe(false);
      expect(list.items.value).toEqual([older]);
      scope.stop();
    });

    it('should keep what is shown when a poll fails, silently, and try again at the next tick', async () => {
      let fail = false;
      const { list, fetchList, onFirstLoadFailure, scope } = setup(async () => {
        if (fail) throw new Error('offline');
        return { items: [newer] };
      });
      await vi.advanceTimersByTimeAsync(0);
      const asked = fetchList.mock.calls.length;
      fail = true;
      await vi.advanceTimersByTimeAsync(1000);
      expect(list.failed.value).toBe(false);
      expect(list.items.value).toEqual([newer]);
      expect(onFirstLoadFailure).not.toHaveBeenCalled();
      await vi.advanceTimersByTimeAsync(1000);
      expect(fetchList).toHaveBeenCalledTimes(asked + 2);
      scope.stop();
    });

    it('should let an aborted request pass without a word', async () => {
      const { list, onFirstLoadFailure, scope } = setup(async () => {
        throw new DOMException('The operation was aborted.', 'AbortError');
      });
      await vi.advanceTimersByTimeAsync(0);
      expect(list.failed.value).toBe(false);
      expect(onFirstLoadFailure).not.toHaveBeenCalled();
      scope.stop();
    });
  });
});
