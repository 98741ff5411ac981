import { randomBytes } from 'node:crypto';
import { Readable } from 'node:stream';
import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { goodArchive, type GoodArchive } from './archive-fixtures';
import { THREAD_HASH_FROM_BYTES } from './archive-inspector';
import type { ArchiveSource, ResultArchiveFormat } from './archive-source';
import { checkArchive } from './check-archive';
import { INLINE_HASH_BELOW_BYTES } from './file-hasher';
import { HashThread } from './hash-thread';

/** A stored file read as an object store's HTTP body comes: 64 KiB chunks; `onServed` sees the running count. */
function storeSource(archive: Buffer, format: ResultArchiveFormat, onServed?: (served: number) => void): ArchiveSource {
  return {
    format,
    sizeBytes: archive.length,
    open: async (range) => {
      const start = range?.start ?? 0;
      const end = range?.end ?? archive.length;
      return Readable.from(
        (function* () {
          for (let at = start; at < end; at += 64 * 1024) {
            const chunk = archive.subarray(at, Math.min(end, at + 64 * 1024));
            onServed?.(at + chunk.length - start);
            yield chunk;
          }
        })(),
      );
    },
  };
}

describe('checkArchive: a large plain tar from the store, in 64 KiB chunks', () => {
  let good: GoodArchive;
  beforeAll(async () => {
    // Larger than the inline limit, so the whole-file hash runs on its thread; two entries large enough for ranges.
    good = await goodArchive({
      format: 'tar',
      extraFiles: [
        { name: 'raw/big.bin', content: randomBytes(INLINE_HASH_BELOW_BYTES + 1024) },
        { name: 'logs/run-1.log', content: 'ok\n' },
        { name: 'raw/mid.bin', content: randomBytes(THREAD_HASH_FROM_BYTES + 7) },
      ],
    });
  });
  afterEach(() => vi.restoreAllMocks());

  it('large entries are hashed from the copy the whole-file hasher keeps, and agree with the manifest', async () => {
    const ranges = vi.spyOn(HashThread.prototype, 'hashRange');
    const result = await checkArchive(storeSource(good.archive, 'tar'), { expected: { sha256: good.sha256, sizeBytes: good.archive.length } });
    expect(result.problems).toEqual([]);
    expect(result.sha256).toBe(good.sha256);
    expect(result.manifest).toEqual(good.manifest);
    expect(ranges.mock.results.map((r) => r.value === null)).toEqual([false, false]);
  });

  it('a range refused (its bytes already gone) is hashed on the entry thread instead', async () => {
    const ranges = vi.spyOn(HashThread.prototype, 'hashRange').mockReturnValue(null);
    const result = await checkArchive(storeSource(good.archive, 'tar'), { expected: { sha256: good.sha256 } });
    expect(result.problems).toEqual([]);
    expect(ranges).toHaveBeenCalledTimes(2);
    const changed = Buffer.from(good.archive);
    changed[Math.floor(changed.length * 0.5)] ^= 1;
    expect((await checkArchive(storeSource(changed, 'tar'))).problems).toEqual([expect.objectContaining({ code: 'file-checksum-mismatch', path: 'raw/big.bin' })]);
  });

  it.each([
    ['raw/big.bin', 0.5],
    ['raw/mid.bin', 0.95],
  ])('one changed byte in %s is found', async (path, where) => {
    const changed = Buffer.from(good.archive);
    changed[Math.floor(changed.length * where)] ^= 1;
    const result = await checkArchive(storeSource(changed, 'tar'));
    expect(result.problems).toEqual([expect.objectContaining({ code: 'file-checksum-mismatch', path })]);
  });

  it('an error of the store half way, with a range still open, is thrown (to retry)', async () => {
    const inner = storeSource(good.archive, 'tar');
    const source: ArchiveSource = {
      ...inner,
      open: async () =>
        Readable.from(
          (async function* () {
            let served = 0;
            for await (const chunk of await inner.open()) {
              yield chunk;
              served += (chunk as Buffer).length;
              if (served > good.archive.length / 2) throw new Error('connection reset by the store');
            }
          })(),
        ),
    };
    await expect(checkArchive(source)).rejects.toThrow('connection reset by the store');
  });

  it('a cancel half way rejects with the signal reason', async () => {
    const controller = new AbortController();
    const source = storeSource(good.archive, 'tar', (served) => {
      if (served > good.archive.length / 2 && !controller.signal.aborted) controller.abort(new Error('shutting down'));
    });
    await expect(checkArchive(source, { signal: controller.signal })).rejects.toThrow('shutting down');
  });

  it('a store that ends early: the truncated entry makes the archive unreadable, and nothing is left waiting', async () => {
    const cut = good.archive.subarray(0, Math.floor(good.archive.length * 0.6));
    const source = { ...storeSource(cut, 'tar'), sizeBytes: good.archive.length };
    const result = await checkArchive(source);
    expect(result.sha256).toBeNull();
    expect(result.problems.map((p) => p.code)).toContain('unreadable');
  });
});
