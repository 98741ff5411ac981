import { describe, expect, it } from 'vitest';
import { usePagedList } from './paged-list';

function deferred<T>() {
  let resolve!: (v: T) => void;
  const promise = new Promise<T>((r) => (resolve = r));
  return { promise, resolve };
}

describe('usePagedList', () => {
  describe('overlapping loads', () => {
    it('should keep only the latest answer and abort the older request when pages come fast', async () => {
      const answers = [deferred<{ items: string[]; total: number; limit: number; offset: number }>(), deferred<{ items: string[]; total: number; limit: number; offset: number }>()];
      const signals: AbortSignal[] = [];
      let call = 0;
      const list = usePagedList<string, number>((_q, signal) => {
        signals.push(signal);
        return answers[call++].promise;
      });
      const first = list.load(1);
      const second = list.load(2);
      expect(signals[0].aborted).toBe(true);
      answers[1].resolve({ items: ['page 2'], total: 40, limit: 20, offset: 20 });
      await second;
      answers[0].resolve({ items: ['page 1'], total: 40, limit: 20, offset: 0 });
      await first;
      expect(list.items.value).toEqual(['page 2']);
      expect(list.total.value).toBe(40);
      expect(list.loading.value).toBe(false);
    });
  });

  describe('errors', () => {
    it('should pass a failure on and stop loading when the server refuses', async () => {
      const list = usePagedList<string, number>(() => Promise.reject(new Error('refused')));
      await expect(list.load(1)).rejects.toThrow('refused');
      expect(list.loading.value).toBe(false);
    });
  });
});
