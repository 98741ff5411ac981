import { createHash } from 'node:crypto';
import { open } from 'node:fs/promises';

/** Bytes read at a time: large enough that the per-read overhead is small, small enough to not matter for memory. */
export const HASH_CHUNK_BYTES = 1024 * 1024;

/**
 * The SHA-256 of the whole file, read once in order beside the parts being sent: parts the store
 * holds already are read here too (the checksum covers the whole file), but never sent again.
 * One buffer, read into again and again: a read stream would allocate a fresh chunk per read, and
 * a fast disk makes garbage faster than the collector returns it (resident memory would grow
 * with the file, for a while).
 */
export async function sha256OfFile(path: string, opts: { signal?: AbortSignal; onBytes?: (hashedBytes: number) => void } = {}): Promise<string> {
  const hash = createHash('sha256');
  const file = await open(path, 'r');
  const buffer = Buffer.allocUnsafe(HASH_CHUNK_BYTES);
  let hashed = 0;
  try {
    for (;;) {
      opts.signal?.throwIfAborted();
      const { bytesRead } = await file.read(buffer, 0, buffer.length, hashed);
      if (bytesRead === 0) break;
      hash.update(buffer.subarray(0, bytesRead));
      hashed += bytesRead;
      opts.onBytes?.(hashed);
    }
  } finally {
    await file.close();
  }
  return hash.digest('hex');
}
