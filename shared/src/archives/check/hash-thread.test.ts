import { createHash, randomBytes } from 'node:crypto';
import { afterEach, describe, expect, it } from 'vitest';
import { HashThread } from './hash-thread';

const MiB = 1024 * 1024;
const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

/** Feeds bytes[from, to) in uneven pieces, waiting for room when asked to. */
async function feed(thread: HashThread, bytes: Buffer, from: number, to: number): Promise<void> {
  for (let at = from, piece = 65_521; at < to; at += piece, piece = (piece * 7 + 12_345) % (3 * MiB)) {
    const room = thread.update(bytes.subarray(at, Math.min(to, at + piece)));
    if (room) await room;
  }
}

describe('HashThread: ranges of the stream it is fed, hashed from the same shared memory', () => {
  const threads: HashThread[] = [];
  const made = (options?: { ranges?: boolean }) => {
    const thread = new HashThread(options);
    threads.push(thread);
    return thread;
  };
  afterEach(() => {
    for (const thread of threads.splice(0)) thread.close();
  });

  // More than the ring holds (16 slots of 1 MiB), so slots are reused while ranges are hashed.
  const bytes = randomBytes(40 * MiB + 12_345);

  it('asked for before, while and after their bytes go in, ranges agree with crypto, and so does the stream', async () => {
    const thread = made({ ranges: true });
    const wanted: [number, number][] = [];
    const digests: Promise<string>[] = [];
    const ask = (start: number, end: number) => {
      const digest = thread.hashRange(start, end);
      expect(digest).not.toBeNull();
      wanted.push([start, end]);
      digests.push(digest!);
    };
    ask(0, 5 * MiB + 3); // before any byte
    ask(5 * MiB + 3, 5 * MiB + 3); // empty
    ask(6 * MiB, 6 * MiB + 1); // one byte
    await feed(thread, bytes, 0, 8 * MiB);
    ask(7 * MiB - 10, 20 * MiB + 7); // its first bytes went in already, the rest not yet
    await feed(thread, bytes, 8 * MiB, 29 * MiB);
    ask(30 * MiB, bytes.length); // to the end of the stream
    await feed(thread, bytes, 29 * MiB, bytes.length);
    const whole = thread.endStream();
    expect(await Promise.all(digests)).toEqual(wanted.map(([start, end]) => sha256(bytes.subarray(start, end))));
    expect(await whole).toBe(sha256(bytes));
    await thread.rangesSettled();
  });

  it('a first range asked for after its bytes were hashed as part of the stream is still hashed from them', async () => {
    const thread = made({ ranges: true });
    await feed(thread, bytes, 0, 3 * MiB + 100);
    expect(await thread.endStream()).toBe(sha256(bytes.subarray(0, 3 * MiB + 100)));
    // Every slot is consumed by the file's thread; none may go before the range thread has what it needs.
    const digest = thread.hashRange(MiB + 5, 3 * MiB + 50);
    expect(await digest).toBe(sha256(bytes.subarray(MiB + 5, 3 * MiB + 50)));
  });

  it('refuses (null) a range that begins below the floor, or before the end of the range asked for last', async () => {
    const thread = made({ ranges: true });
    // Nothing asked for while 40 MiB go by: the ring, full, lets the oldest bytes go.
    await feed(thread, bytes, 0, bytes.length);
    expect(thread.hashRange(0, 100)).toBeNull();
    const last = thread.hashRange(bytes.length - MiB, bytes.length);
    expect(last).not.toBeNull();
    expect(thread.hashRange(bytes.length - 2 * MiB, bytes.length - MiB)).toBeNull();
    void thread.endStream();
    expect(await last).toBe(sha256(bytes.subarray(bytes.length - MiB)));
  });

  it('a range that ends after the stream rejects once the stream has ended', async () => {
    const thread = made({ ranges: true });
    const digest = thread.hashRange(MiB, 3 * MiB);
    await feed(thread, bytes, 0, 2 * MiB);
    const whole = thread.endStream();
    await expect(digest).rejects.toThrow('the range ends after the stream');
    expect(await whole).toBe(sha256(bytes.subarray(0, 2 * MiB)));
  });

  it('closing with ranges pending rejects them: nothing is left waiting', async () => {
    const thread = made({ ranges: true });
    const digest = thread.hashRange(0, 30 * MiB);
    await feed(thread, bytes, 0, 3 * MiB);
    thread.close();
    await expect(digest).rejects.toThrow(/stopped/);
    await thread.rangesSettled();
  });

  it('a thread made without ranges has none to give', () => {
    expect(() => made().hashRange(0, 1)).toThrow('without ranges');
  });
});
