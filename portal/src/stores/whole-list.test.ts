import { describe, expect, it } from 'vitest';
import { useWholeList } from './whole-list';

function deferred<T>() {
  let resolve!: (v: T) => void;
  const promise = new Promise<T>((r) => (resolve = r));
  return { promise, resolve };
}

describe('useWholeList', () => {
  describe('overlapping loads', () => {
    it('should keep only the answer to the latest query and abort the older request when filters change fast', async () => {
      const answers = [deferred<{ items: string[] }>(), deferred<{ items: string[] }>()];
      const signals: AbortSignal[] = [];
      let call = 0;
      const list = useWholeList<string, string>((_q, signal) => {
        signals.push(signal);
        return answers[call++].promise;
      });
      const first = list.load('open');
      const second = list.load('paid');
      expect(signals[0].aborted).toBe(true);
      answers[1].resolve({ items: ['paid one'] });
      await second;
      answers[0].resolve({ items: ['open one'] });
      await first;
      expect(list.items.value).toEqual(['paid one']);
      expect(list.loading.value).toBe(false);
    });
  });

  describe('errors', () => {
    it('should end quietly when the request is aborted and keep what was shown', async () => {
      let call = 0;
      const list = useWholeList<string, string>(() => (call++ === 0 ? Promise.resolve({ items: ['kept'] }) : Promise.reject(new DOMException('gone', 'AbortError'))));
      await list.load('any');
      await expect(list.load('other')).resolves.toBeUndefined();
      expect(list.items.value).toEqual(['kept']);
    });

    it('should pass a failure on and stop loading when the server refuses', async () => {
      const list = useWholeList<string, string>(() => Promise.reject(new Error('refused')));
      await expect(list.load('any')).rejects.toThrow('refused');
      expect(list.loading.value).toBe(false);
    });
  });
});
