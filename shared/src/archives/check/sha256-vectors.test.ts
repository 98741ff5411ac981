import { createHash } from 'node:crypto';
import { createSHA256 } from 'hash-wasm';
import { describe, expect, it } from 'vitest';
import { createFileHasher, INLINE_HASH_BELOW_BYTES } from './file-hasher';
import { HashThread } from './hash-thread';

/**
 * The SHA-256 examples of FIPS 180-4 (NIST, "Secure Hash Standard", 2015; the worked examples are
 * NIST's "Cryptographic Standards and Guidelines: Examples with Intermediate Values", SHA256.pdf,
 * formerly appendix B of FIPS 180-2): "abc" (one block), the 448-bit message (two blocks) and one
 * million "a". The empty message is the Len = 0 vector of NIST CAVP's SHA256ShortMsg.rsp.
 * The uploader hashes in the browser with hash-wasm and the checker with node's crypto: both must
 * give these digests, or a good upload would be refused.
 */
const VECTORS: { name: string; message: () => Buffer; sha256: string }[] = [
  { name: '"abc" (FIPS 180-4 example, one block)', message: () => Buffer.from('abc'), sha256: 'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad' },
  { name: 'the empty message (CAVP SHA256ShortMsg, Len = 0)', message: () => Buffer.alloc(0), sha256: 'e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855' },
  {
    name: 'the 448-bit message (FIPS 180-4 example, two blocks)',
    message: () => Buffer.from('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq'),
    sha256: '248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1',
  },
  { name: 'one million "a" (FIPS 180-4 example)', message: () => Buffer.alloc(1_000_000, 'a'), sha256: 'cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0' },
];

describe('SHA-256 against the FIPS 180-4 examples', () => {
  it.each(VECTORS)("node's crypto: $name", ({ message, sha256 }) => {
    expect(createHash('sha256').update(message()).digest('hex')).toBe(sha256);
  });

  it.each(VECTORS)("hash-wasm's createSHA256 (the portal's uploader): $name", async ({ message, sha256 }) => {
    const hasher = await createSHA256();
    hasher.init();
    const bytes = message();
    // In pieces, as the uploader feeds it file slices.
    for (let at = 0; at < bytes.length; at += 65_537) hasher.update(bytes.subarray(at, at + 65_537));
    expect(hasher.digest('hex')).toBe(sha256);
  });

  it('the hash thread, one vector after another as streams of one thread, fed in odd pieces', async () => {
    const thread = new HashThread();
    try {
      const digests = VECTORS.map(({ message }) => {
        const bytes = message();
        for (let at = 0, piece = 1; at < bytes.length; at += piece, piece = (piece * 7 + 3) % 300_001) void thread.update(bytes.subarray(at, at + piece));
        return thread.endStream();
      });
      expect(await Promise.all(digests)).toEqual(VECTORS.map((v) => v.sha256));
    } finally {
      thread.close();
    }
  });

  it('the whole-file hasher on its thread waits for room and agrees with crypto over more bytes than its ring holds', async () => {
    const bytes = Buffer.alloc(INLINE_HASH_BELOW_BYTES + 5 * 1024 * 1024);
    for (let i = 0; i < bytes.length; i += 4096) bytes.writeUInt32LE((i * 2654435761) >>> 0, i);
    const hasher = createFileHasher({ sizeBytes: bytes.length });
    for (let at = 0; at < bytes.length; at += 3 * 1024 * 1024 + 17) {
      const room = hasher.update(bytes.subarray(at, at + 3 * 1024 * 1024 + 17));
      if (room) await room;
    }
    expect(await hasher.digest()).toBe(createHash('sha256').update(bytes).digest('hex'));
  });
});
