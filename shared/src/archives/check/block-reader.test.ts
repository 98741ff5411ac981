import { Readable } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { inBlocks, type BlockOptions } from './block-reader';

async function collect(chunks: Iterable<Uint8Array> | AsyncIterable<Uint8Array>, options: BlockOptions): Promise<Buffer[]> {
  const blocks: Buffer[] = [];
  for await (const block of inBlocks(toAsync(chunks), options)) blocks.push(block);
  return blocks;
}

async function* toAsync(chunks: Iterable<Uint8Array> | AsyncIterable<Uint8Array>): AsyncGenerator<Uint8Array> {
  for await (const chunk of chunks) yield chunk;
}

/** Bytes that differ from one offset to the next, so that a misplaced byte shows. */
function counting(length: number, from = 0): Buffer {
  const bytes = Buffer.alloc(length);
  for (let i = 0; i < length; i++) bytes[i] = (from + i) % 251;
  return bytes;
}

function cut(bytes: Buffer, sizes: number[]): Buffer[] {
  const pieces: Buffer[] = [];
  for (let at = 0, i = 0; at < bytes.length; i++) {
    const size = sizes[i % sizes.length];
    pieces.push(bytes.subarray(at, at + size));
    at += size;
  }
  return pieces;
}

describe('inBlocks', () => {
  it('joins small chunks into full blocks, whatever the chunk boundaries, and yields the rest last', async () => {
    const bytes = counting(1000);
    for (const sizes of [[1], [3, 7], [15], [15, 1, 2], [5, 11, 13]]) {
      const blocks = await collect(cut(bytes, sizes), { blockBytes: 16 });
      expect(blocks.slice(0, -1).map((b) => b.length)).toEqual(Array(62).fill(16));
      expect(blocks.at(-1)!.length).toBe(1000 - 62 * 16);
      expect(Buffer.concat(blocks).equals(bytes)).toBe(true);
    }
  });

  it('with chunks of any size, every block but the last holds one to two blocks of bytes, in order', async () => {
    const bytes = counting(5000);
    for (const sizes of [[16], [15, 17], [63, 1, 2], [200, 3], [31, 32, 33]]) {
      const blocks = await collect(cut(bytes, sizes), { blockBytes: 16 });
      for (const block of blocks.slice(0, -1)) expect(block.length >= 16 && block.length < 32).toBe(true);
      expect(blocks.at(-1)!.length).toBeLessThan(32);
      expect(Buffer.concat(blocks).equals(bytes)).toBe(true);
    }
  });

  it('an empty stream, or one of empty chunks, yields nothing', async () => {
    expect(await collect([], { blockBytes: 16 })).toEqual([]);
    expect(await collect([Buffer.alloc(0), new Uint8Array(0)], { blockBytes: 16 })).toEqual([]);
  });

  it('a chunk of a block or more with nothing pending goes on as views of it, in pieces under two blocks', async () => {
    const large = counting(100);
    const blocks = await collect([large.subarray(0, 16), large.subarray(16, 47), large.subarray(47)], { blockBytes: 16 });
    // 16 as it is; 31 (under two blocks) as it is; 53 as 16 + 16 + 21.
    expect(blocks.map((b) => b.length)).toEqual([16, 31, 16, 16, 21]);
    for (const block of blocks) expect(block.buffer).toBe(large.buffer); // no copy
    expect(Buffer.concat(blocks).equals(large)).toBe(true);
  });

  it('a chunk larger than the block after a partial one fills that block first, then goes on as views', async () => {
    const bytes = counting(110);
    const large = bytes.subarray(10);
    const blocks = await collect([bytes.subarray(0, 10), large], { blockBytes: 16 });
    // 10 + 6 copied into one block; the other 94 bytes as views: 16 + 16 + 16 + 16 + 30.
    expect(blocks.map((b) => b.length)).toEqual([16, 16, 16, 16, 16, 30]);
    expect(blocks[0].buffer).not.toBe(large.buffer);
    for (const block of blocks.slice(1, -1)) expect(block.buffer).toBe(large.buffer);
    expect(Buffer.concat(blocks).equals(bytes)).toBe(true);
  });

  it('grows from the first block size, doubling, to the block size', async () => {
    const bytes = counting(100);
    const blocks = await collect(cut(bytes, [3]), { blockBytes: 16, firstBlockBytes: 2 });
    expect(blocks.map((b) => b.length)).toEqual([2, 4, 8, 16, 16, 16, 16, 16, 6]);
    expect(Buffer.concat(blocks).equals(bytes)).toBe(true);
  });

  it('never writes a block again once yielded (the parser may hold views of it)', async () => {
    const bytes = counting(64 * 5 + 9);
    const blocks = await collect(cut(bytes, [5, 11]), { blockBytes: 64 });
    const copies = blocks.map((b) => Buffer.from(b));
    expect(new Set(blocks.map((b) => b.buffer)).size).toBe(blocks.length);
    blocks.forEach((block, i) => expect(block.equals(copies[i])).toBe(true));
  });

  it("throws the source's error, after the blocks completed before it", async () => {
    const failure = new Error('connection reset by the store');
    const source = (async function* () {
      yield counting(20);
      yield counting(5, 20);
      throw failure;
    })();
    const seen: number[] = [];
    await expect(
      (async () => {
        for await (const block of inBlocks(source, { blockBytes: 16 })) seen.push(block.length);
      })(),
    ).rejects.toBe(failure);
    expect(seen).toEqual([20]);
  });

  it('reads a node stream, and stopping early ends the stream', async () => {
    const stream = Readable.from(cut(counting(4096), [100]), { objectMode: false });
    let blocks = 0;
    for await (const block of inBlocks(stream, { blockBytes: 1024 })) {
      expect(block.length).toBe(1024);
      if (++blocks === 2) break;
    }
    expect(stream.destroyed).toBe(true);
  });

  it('refuses a block of no bytes', async () => {
    await expect(collect([counting(4)], { blockBytes: 0 })).rejects.toThrow(RangeError);
  });
});
