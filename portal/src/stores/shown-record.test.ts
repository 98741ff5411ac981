import { describe, expect, it } from 'vitest';
import { useShownRecord } from './shown-record';

interface Row {
  id: string;
  version: number;
}

function deferred<T>() {
  let resolve!: (v: T) => void;
  const promise = new Promise<T>((r) => (resolve = r));
  return { promise, resolve };
}

describe('useShownRecord', () => {
  describe('reading again', () => {
    it('should keep the record shown while the same key is read again, and drop it at once for another key', async () => {
      let answer = deferred<Row>();
      const record = useShownRecord<Row, string>(() => answer.promise, (row) => row.id);
      const first = record.load('a');
      answer.resolve({ id: 'a', version: 1 });
      expect(await first).toEqual({ id: 'a', version: 1 });

      answer = deferred<Row>();
      const again = record.load('a');
      expect(record.current.value).toEqual({ id: 'a', version: 1 });
      expect(record.loading.value).toBe(true);
      answer.resolve({ id: 'a', version: 2 });
      await again;
      expect(record.current.value).toEqual({ id: 'a', version: 2 });

      answer = deferred<Row>();
      const other = record.load('b');
      expect(record.current.value).toBeNull();
      answer.resolve({ id: 'b', version: 1 });
      await other;
      expect(record.current.value).toEqual({ id: 'b', version: 1 });
      expect(record.loading.value).toBe(false);
    });
  });

  describe('overlapping loads', () => {
    it('should let only the latest answer land and give null to the overtaken load', async () => {
      const answers = [deferred<Row>(), deferred<Row>()];
      let call = 0;
      const record = useShownRecord<Row, string>(() => answers[call++].promise, (row) => row.id);
      const first = record.load('a');
      const second = record.load('b');
      answers[1].resolve({ id: 'b', version: 1 });
      await second;
      answers[0].resolve({ id: 'a', version: 1 });
      expect(await first).toBeNull();
      expect(record.current.value).toEqual({ id: 'b', version: 1 });
    });
  });

  describe('errors', () => {
    it('should pass a failure on and stop loading when the server refuses', async () => {
      const record = useShownRecord<Row, string>(() => Promise.reject(new Error('refused')), (row) => row.id);
      await expect(record.load('a')).rejects.toThrow('refused');
      expect(record.loading.value).toBe(false);
    });
  });
});
