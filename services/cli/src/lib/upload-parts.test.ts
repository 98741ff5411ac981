import { describe, expect, it } from 'vitest';
import { planParts as apiPlan, MIN_PART_BYTES } from '@localis/shared';
import { backoffMs, partBytes, planParts, URL_BATCH, URL_REUSE_MS, urlBatch } from './upload-parts';

const MiB = 1024 ** 2;
/** 40 MiB and a bit, as the api cuts it: four parts of 8 MiB and a short fifth (the layout of the stack test's archive). */
const layout = { sizeBytes: 40 * MiB + 1234, ...apiPlan(40 * MiB + 1234) };

describe('part planning', () => {
  it('should cut a file as the api does: 8 MiB parts and a shorter last one', () => {
    expect(layout).toMatchObject({ partSizeBytes: MIN_PART_BYTES, partCount: 6 });
    expect(partBytes(layout, 1)).toBe(8 * MiB);
    expect(partBytes(layout, 5)).toBe(8 * MiB);
    expect(partBytes(layout, 6)).toBe(1234);
    const total = Array.from({ length: layout.partCount }, (_, i) => partBytes(layout, i + 1)).reduce((a, b) => a + b, 0);
    expect(total).toBe(layout.sizeBytes);
  });

  it('should send every part of a new upload', () => {
    expect(planParts(layout, [])).toEqual({ queue: [1, 2, 3, 4, 5, 6], storedCount: 0, storedBytes: 0 });
  });

  it('should send only the parts the store does not hold when resuming', () => {
    const stored = [
      { partNumber: 2, sizeBytes: 8 * MiB },
      { partNumber: 6, sizeBytes: 1234 },
      { partNumber: 4, sizeBytes: 8 * MiB },
    ];
    expect(planParts(layout, stored)).toEqual({ queue: [1, 3, 5], storedCount: 3, storedBytes: 16 * MiB + 1234 });
  });

  it('should send again a part stored with the wrong size (cut short), and ignore parts beyond the last', () => {
    const stored = [
      { partNumber: 1, sizeBytes: 8 * MiB - 1 },
      { partNumber: 2, sizeBytes: 8 * MiB },
      { partNumber: 7, sizeBytes: 8 * MiB },
      { partNumber: 0, sizeBytes: 8 * MiB },
    ];
    expect(planParts(layout, stored)).toEqual({ queue: [1, 3, 4, 5, 6], storedCount: 1, storedBytes: 8 * MiB });
  });

  it('should plan larger parts for files over 10 000 parts of 8 MiB, and one part for a small file', () => {
    const huge = { sizeBytes: 200 * 1024 ** 3, ...apiPlan(200 * 1024 ** 3) };
    expect(huge.partCount).toBeLessThanOrEqual(10_000);
    expect(planParts(huge, []).queue).toHaveLength(huge.partCount);
    const small = { sizeBytes: 10, ...apiPlan(10) };
    expect(planParts(small, [])).toEqual({ queue: [1], storedCount: 0, storedBytes: 0 });
    expect(partBytes(small, 1)).toBe(10);
  });
});

describe('part address batches', () => {
  it('should ask for the part needed and the next ones without a fresh address, up to 100', () => {
    const queue = Array.from({ length: 300 }, (_, i) => i + 2);
    const batch = urlBatch(1, queue, new Map(), 0);
    expect(batch).toHaveLength(URL_BATCH);
    expect(batch.slice(0, 3)).toEqual([1, 2, 3]);
  });

  it('should skip parts whose address is still fresh and ask again for old ones', () => {
    const now = 20 * 60 * 1000;
    const known = new Map([
      [3, { at: now - 1000 }],
      [4, { at: now - URL_REUSE_MS }],
    ]);
    expect(urlBatch(2, [3, 4, 5], known, now)).toEqual([2, 4, 5]);
  });
});

describe('retry waits', () => {
  it('should double from 1 s with at most 25 % jitter, capped at 30 s', () => {
    expect([1, 2, 3, 4, 5].map((n) => backoffMs(n, () => 0))).toEqual([1000, 2000, 4000, 8000, 16000]);
    expect(backoffMs(1, () => 1)).toBe(1250);
    expect(backoffMs(10, () => 0)).toBe(30_000);
  });
});
