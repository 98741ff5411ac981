import { READ_CHUNK_BYTES } from './archive-source';

export interface BlockOptions {
  /** The size blocks grow to (default READ_CHUNK_BYTES). */
  blockBytes?: number;
  /**
   * The first block's size (default `blockBytes`); each next one is twice the last up to
   * `blockBytes`. Small first blocks let an archive refused at its start (a compression bomb, a
   * bad first header) be refused having read little of it.
   */
  firstBlockBytes?: number;
}

/**
 * A byte stream in larger blocks: an HTTP body comes in chunks of about 64 KiB, and every chunk
 * costs the tar parser, gunzip, the stream events and the hashing rings a fixed amount of work,
 * which at 16,000 chunks a GiB outweighs one copy into blocks of a MiB.
 *
 * Small chunks are copied into a fresh block, yielded when full (the last one when the stream ends).
 * A chunk at least the block's size that finds no partial block waiting goes on as it is, as views
 * (no copy), cut into pieces under two `blockBytes` so that none is larger than the hashing ring
 * takes at once; one that finds a partial block fills it first. A block is never written again once
 * yielded: the tar parser and the entry streams may still hold views of it. Errors of the source are
 * thrown as they are.
 */
export async function* inBlocks(chunks: AsyncIterable<Uint8Array>, options: BlockOptions = {}): AsyncGenerator<Buffer, void, undefined> {
  const blockBytes = options.blockBytes ?? READ_CHUNK_BYTES;
  let size = Math.min(options.firstBlockBytes ?? blockBytes, blockBytes);
  if (!(size >= 1)) throw new RangeError('a block holds at least one byte');
  let block: Buffer | null = null;
  let filled = 0;
  for await (const chunk of chunks) {
    const bytes = Buffer.isBuffer(chunk) ? chunk : Buffer.from(chunk.buffer, chunk.byteOffset, chunk.byteLength);
    let at = 0;
    while (at < bytes.length) {
      const left = bytes.length - at;
      if (filled === 0 && left >= blockBytes) {
        const take = left < 2 * blockBytes ? left : blockBytes;
        yield take === bytes.length ? bytes : bytes.subarray(at, at + take);
        at += take;
        size = blockBytes;
        continue;
      }
      // allocUnsafeSlow: memory of its own, outside the small-buffer pool, not zeroed (it is filled before use).
      block ??= Buffer.allocUnsafeSlow(size);
      const take = Math.min(block.length - filled, left);
      bytes.copy(block, filled, at, at + take);
      filled += take;
      at += take;
      if (filled === block.length) {
        const full = block;
        block = null;
        filled = 0;
        size = Math.min(2 * size, blockBytes);
        yield full;
      }
    }
  }
  if (block && filled > 0) yield block.subarray(0, filled);
}
