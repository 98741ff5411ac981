import { createHash } from 'node:crypto';
import { HashThread } from './hash-thread';

/** SHA-256 of the whole stored file, computed beside the unpacking (see hash-thread.ts for why on a thread). */
export interface FileHasher {
  /** Hash these bytes next; the promise, when there is one, resolves once there is room for more. */
  update(chunk: Uint8Array): Promise<void> | void;
  /** The hex digest; no update after it. */
  digest(): Promise<string>;
  /** Drop the work (the check stopped early or was cancelled); safe to call after digest. */
  close(): void;
}

/** Below this, hashing inline costs less than starting a thread. */
export const INLINE_HASH_BELOW_BYTES = 16 * 1024 * 1024;

export function createFileHasher(expectedBytes: number): FileHasher {
  if (expectedBytes < INLINE_HASH_BELOW_BYTES) {
    const hash = createHash('sha256');
    return {
      update: (chunk) => void hash.update(chunk),
      digest: async () => hash.digest('hex'),
      close: () => undefined,
    };
  }
  const thread = new HashThread();
  return {
    update: (chunk) => thread.update(chunk),
    digest: async () => {
      try {
        return await thread.endStream();
      } finally {
        thread.close();
      }
    },
    close: () => thread.close(),
  };
}
