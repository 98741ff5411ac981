import { createHash } from 'node:crypto';
import { Worker } from 'node:worker_threads';
import { HashThread } from './hash-thread';

/** SHA-256 of the whole stored file, computed beside the unpacking (see hash-thread.ts for why on a thread). */
export interface FileHasher {
  /** False when the hasher reads the file by itself: nothing need be read for it. */
  readonly needsBytes: boolean;
  /** Hash these bytes next; the promise, when there is one, resolves once there is room for more. */
  update(chunk: Uint8Array): Promise<void> | void;
  /** The hex digest; no update after it. */
  digest(): Promise<string>;
  /** Drop the work (the check stopped early or was cancelled); safe to call after digest. */
  close(): void;
  /**
   * Set when ranges of the bytes fed may be hashed from the copy the hasher keeps (see HashThread):
   * the digest of [start, end), or null when those bytes may be gone and must be hashed another way.
   * Ranges are asked for in order, before their bytes are fed or while they still are.
   */
  readonly ranges?: { hash(start: number, end: number): Promise<string> | null };
}

/** Below this, hashing inline costs less than starting a thread. */
export const INLINE_HASH_BELOW_BYTES = 16 * 1024 * 1024;

/**
 * Inline for a small file; for a large one on a thread, fed the bytes the check reads; for a large
 * file on this machine, on a thread that reads the file by itself into one reused buffer (as
 * `openssl dgst` does), so that the main thread copies nothing for it. With `ranges` (a plain tar
 * read from a stream, whose entries lie in it as they are), a large file's hasher also offers the
 * entries' hashes from the one copy it keeps.
 */
export function createFileHasher(file: { sizeBytes: number; localPath?: string }, options: { ranges?: boolean } = {}): FileHasher {
  if (file.sizeBytes < INLINE_HASH_BELOW_BYTES) {
    const hash = createHash('sha256');
    return {
      needsBytes: true,
      update: (chunk) => void hash.update(chunk),
      digest: async () => hash.digest('hex'),
      close: () => undefined,
    };
  }
  if (file.localPath) return localFileHasher(file.localPath, file.sizeBytes);
  const thread = new HashThread({ ranges: options.ranges === true });
  return {
    needsBytes: true,
    update: (chunk) => thread.update(chunk),
    digest: async () => {
      try {
        const hex = await thread.endStream();
        await thread.rangesSettled(); // the range thread stops with this one
        return hex;
      } finally {
        thread.close();
      }
    },
    close: () => thread.close(),
    ranges: options.ranges ? { hash: (start, end) => thread.hashRange(start, end) } : undefined,
  };
}

const LOCAL_WORKER_SOURCE = `
const { parentPort, workerData } = require('node:worker_threads');
const { openSync, readSync, closeSync } = require('node:fs');
const hash = require('node:crypto').createHash('sha256');
const buffer = Buffer.allocUnsafe(1024 * 1024);
const fd = openSync(workerData.path, 'r');
let left = workerData.sizeBytes;
try {
  for (let read; left > 0 && (read = readSync(fd, buffer, 0, Math.min(buffer.length, left), null)) > 0; left -= read) hash.update(buffer.subarray(0, read));
} finally {
  closeSync(fd);
}
parentPort.postMessage({ hex: hash.digest('hex'), short: left > 0 });
`;

/** The first `sizeBytes` bytes of a local file (the size the check was started with), read on a thread. */
function localFileHasher(path: string, sizeBytes: number): FileHasher {
  const worker = new Worker(LOCAL_WORKER_SOURCE, { eval: true, workerData: { path, sizeBytes } });
  const result = new Promise<string>((resolve, reject) => {
    worker.once('message', ({ hex, short }: { hex: string; short: boolean }) => (short ? reject(new Error(`${path} became shorter while it was checked`)) : resolve(hex)));
    worker.once('error', reject);
    worker.once('exit', (code) => reject(new Error(`the hashing thread stopped (exit code ${code})`)));
  });
  result.catch(() => undefined); // read by digest(); not an unhandled rejection when the check stops early
  return {
    needsBytes: false,
    update: () => undefined,
    digest: async () => {
      try {
        return await result;
      } finally {
        void worker.terminate();
      }
    },
    close: () => void worker.terminate(),
  };
}
