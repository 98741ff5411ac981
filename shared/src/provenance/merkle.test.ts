import { createHash } from 'node:crypto';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  consistencyProof,
  EMPTY_TREE_ROOT,
  fromHex,
  inclusionProof,
  leafHash,
  MerkleTree,
  merkleRoot,
  nodeHash,
  toHex,
  verifyConsistency,
  verifyInclusion,
} from './merkle';

/** Hashes spelled out with plain SHA-256 calls, independent of merkle.ts. */
const sha = (...parts: Buffer[]) => createHash('sha256').update(Buffer.concat(parts)).digest();
const L = (data: string) => sha(Buffer.from([0x00]), Buffer.from(data));
const N = (left: Buffer, right: Buffer) => sha(Buffer.from([0x01]), left, right);

const data = (n: number) => Array.from({ length: n }, (_, i) => `d${i}`);
const leavesOf = (n: number) => data(n).map(leafHash);

/** RFC 6962 section 2.1's recursive definitions, word for word, to check the iterative code against. */
const k = (n: number) => 2 ** Math.ceil(Math.log2(n) - 1);
const MTH = (d: Buffer[]): Buffer => (d.length === 0 ? sha() : d.length === 1 ? d[0] : N(MTH(d.slice(0, k(d.length))), MTH(d.slice(k(d.length)))));
const PATH = (m: number, d: Buffer[]): Buffer[] => {
  if (d.length <= 1) return [];
  const s = k(d.length);
  return m < s ? [...PATH(m, d.slice(0, s)), MTH(d.slice(s))] : [...PATH(m - s, d.slice(s)), MTH(d.slice(0, s))];
};
const SUBPROOF = (m: number, d: Buffer[], b: boolean): Buffer[] => {
  if (m === d.length) return b ? [] : [MTH(d)];
  const s = k(d.length);
  return m <= s ? [...SUBPROOF(m, d.slice(0, s), b), MTH(d.slice(s))] : [...SUBPROOF(m - s, d.slice(s), false), MTH(d.slice(0, s))];
};

const flipByte = (b: Buffer, at = 0) => {
  const copy = Buffer.from(b);
  copy[at % copy.length] ^= 0x01;
  return copy;
};

describe('leaf and node hashes (RFC 6962 section 2.1)', () => {
  it('prefixes leaves with 0x00 and nodes with 0x01', () => {
    expect(leafHash('d0').equals(L('d0'))).toBe(true);
    expect(leafHash(Buffer.from('d0')).equals(L('d0'))).toBe(true);
    expect(nodeHash(L('a'), L('b')).equals(N(L('a'), L('b')))).toBe(true);
  });

  it('gives the empty tree the hash of the empty string', () => {
    expect(toHex(merkleRoot([]))).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855'); // FIPS 180-4 SHA-256("")
    expect(merkleRoot([]).equals(EMPTY_TREE_ROOT)).toBe(true);
  });

  it('round-trips hex and refuses what is not a hash', () => {
    const h = L('x');
    expect(fromHex(toHex(h)).equals(h)).toBe(true);
    expect(fromHex(toHex(h).toUpperCase()).equals(h)).toBe(true);
    expect(() => fromHex('abc')).toThrow();
    expect(() => fromHex('z'.repeat(64))).toThrow();
  });
});

describe('merkleRoot on hand-built trees of 1 to 8 leaves (RFC 6962 section 2.1, MTH)', () => {
  const [a, b, c, d, e, f, g, h] = data(8).map(L);
  const expected: Record<number, Buffer> = {
    1: a,
    2: N(a, b),
    3: N(N(a, b), c),
    4: N(N(a, b), N(c, d)),
    5: N(N(N(a, b), N(c, d)), e),
    6: N(N(N(a, b), N(c, d)), N(e, f)),
    7: N(N(N(a, b), N(c, d)), N(N(e, f), g)),
    8: N(N(N(a, b), N(c, d)), N(N(e, f), N(g, h))),
  };
  for (let n = 1; n <= 8; n++) {
    it(`n = ${n}`, () => {
      expect(toHex(merkleRoot(leavesOf(n)))).toBe(toHex(expected[n]));
      expect(toHex(merkleRoot(leavesOf(8), n))).toBe(toHex(expected[n]));
      expect(toHex(MerkleTree.fromLeafHashes(leavesOf(8)).root(n))).toBe(toHex(expected[n]));
    });
  }
});

describe('the 7-leaf example tree of RFC 6962 section 2.1.3', () => {
  // Leaves a..f are d0..d5; j is the lone leaf d6.
  const [a, b, c, d, e, f, j] = data(7).map(L);
  const g = N(a, b);
  const h = N(c, d);
  const i = N(e, f);
  const kk = N(g, h);
  const l = N(i, j);
  const root = N(kk, l);
  const leaves = leavesOf(7);
  const hex = (path: Buffer[]) => path.map(toHex);

  it('has the root hash = k + l', () => {
    expect(toHex(merkleRoot(leaves))).toBe(toHex(root));
  });

  it.each([
    ['d0 (a)', 0, [b, h, l]],
    ['d3 (d)', 3, [c, g, l]],
    ['d4 (e)', 4, [f, j, kk]],
    ['d6 (j)', 6, [i, kk]],
  ])('gives the audit path listed for %s (RFC 6962 section 2.1.3)', (_name, index, path) => {
    expect(hex(inclusionProof(index, leaves))).toEqual(hex(path));
    expect(hex(MerkleTree.fromLeafHashes(leaves).inclusionProof(index))).toEqual(hex(path));
    expect(verifyInclusion({ leafHash: leaves[index], leafIndex: index, treeSize: 7, auditPath: path, rootHash: root })).toBe(true);
  });

  it.each([
    ['hash0', 3, [c, d, g, l], N(g, c)],
    ['hash1', 4, [l], kk],
    ['hash2', 6, [i, j, kk], N(kk, i)],
  ])('gives the consistency proof listed from %s (size %i) to hash (RFC 6962 section 2.1.3)', (_name, m, path, oldRoot) => {
    expect(toHex(merkleRoot(leaves, m))).toBe(toHex(oldRoot));
    expect(hex(consistencyProof(m, leaves))).toEqual(hex(path));
    expect(hex(MerkleTree.fromLeafHashes(leaves).consistencyProof(m))).toEqual(hex(path));
    expect(verifyConsistency({ firstSize: m, secondSize: 7, firstRoot: oldRoot, secondRoot: root, path })).toBe(true);
    expect(verifyConsistency({ firstSize: m, secondSize: 7, firstRoot: toHex(oldRoot), secondRoot: toHex(root), path: hex(path) })).toBe(true);
  });
});

describe('every tree up to 20 leaves', () => {
  const all = leavesOf(20);
  const tree = MerkleTree.fromLeafHashes(all);

  it('matches the recursive definitions of RFC 6962 section 2.1 and verifies by RFC 9162 section 2.1.3.2 / 2.1.4.2', () => {
    for (let n = 1; n <= 20; n++) {
      const d = all.slice(0, n);
      const root = merkleRoot(all, n);
      expect(toHex(root)).toBe(toHex(MTH(d)));
      expect(toHex(tree.root(n))).toBe(toHex(root));
      for (let index = 0; index < n; index++) {
        const path = inclusionProof(index, all, n);
        expect(path.map(toHex)).toEqual(PATH(index, d).map(toHex));
        expect(tree.inclusionProof(index, n).map(toHex)).toEqual(path.map(toHex));
        expect(verifyInclusion({ leafHash: all[index], leafIndex: index, treeSize: n, auditPath: path, rootHash: root })).toBe(true);
      }
      for (let m = 1; m <= n; m++) {
        const path = consistencyProof(m, all, n);
        expect(path.map(toHex)).toEqual(SUBPROOF(m, d, true).map(toHex));
        expect(tree.consistencyProof(m, n).map(toHex)).toEqual(path.map(toHex));
        expect(verifyConsistency({ firstSize: m, secondSize: n, firstRoot: merkleRoot(all, m), secondRoot: root, path })).toBe(true);
      }
    }
  });

  it('rejects tampered inclusion proofs, roots, leaves, indexes and sizes', () => {
    for (let n = 1; n <= 20; n++) {
      const root = merkleRoot(all, n);
      for (let index = 0; index < n; index++) {
        const path = inclusionProof(index, all, n);
        const ok = { leafHash: all[index], leafIndex: index, treeSize: n, auditPath: path, rootHash: root };
        expect(verifyInclusion({ ...ok, rootHash: flipByte(root, index) })).toBe(false);
        expect(verifyInclusion({ ...ok, leafHash: flipByte(all[index], n) })).toBe(false);
        expect(verifyInclusion({ ...ok, leafHash: leafHash('not logged') })).toBe(false);
        for (let p = 0; p < path.length; p++) {
          expect(verifyInclusion({ ...ok, auditPath: path.map((x, q) => (q === p ? flipByte(x, p) : x)) })).toBe(false);
        }
        expect(verifyInclusion({ ...ok, auditPath: [...path, root] })).toBe(false);
        if (path.length > 0) expect(verifyInclusion({ ...ok, auditPath: path.slice(1) })).toBe(false);
        if (n > 1) expect(verifyInclusion({ ...ok, leafIndex: (index + 1) % n })).toBe(false);
        expect(verifyInclusion({ ...ok, leafIndex: n })).toBe(false);
        expect(verifyInclusion({ ...ok, leafIndex: -1 })).toBe(false);
        expect(verifyInclusion({ ...ok, treeSize: index })).toBe(false);
        // The path alone does not always pin the tree size (0 in 5 and in 6 climb alike): the signed head does.
      }
    }
  });

  it('rejects tampered consistency proofs and roots', () => {
    for (let n = 2; n <= 20; n++) {
      const second = merkleRoot(all, n);
      for (let m = 1; m < n; m++) {
        const first = merkleRoot(all, m);
        const path = consistencyProof(m, all, n);
        const ok = { firstSize: m, secondSize: n, firstRoot: first, secondRoot: second, path };
        expect(verifyConsistency({ ...ok, firstRoot: flipByte(first, m) })).toBe(false);
        expect(verifyConsistency({ ...ok, secondRoot: flipByte(second, n) })).toBe(false);
        for (let p = 0; p < path.length; p++) {
          expect(verifyConsistency({ ...ok, path: path.map((x, q) => (q === p ? flipByte(x, p) : x)) })).toBe(false);
        }
        expect(verifyConsistency({ ...ok, path: [] })).toBe(false);
        expect(verifyConsistency({ ...ok, path: [...path, second] })).toBe(false);
        expect(verifyConsistency({ ...ok, path: path.slice(1) })).toBe(false);
        if (m + 1 < n) expect(verifyConsistency({ ...ok, firstSize: m + 1 })).toBe(false);
        expect(verifyConsistency({ ...ok, firstSize: n, secondSize: m })).toBe(false);
      }
    }
  });

  it('accepts the trivial cases only with an empty path (sizes equal, or the empty tree first)', () => {
    const root = merkleRoot(all, 5);
    expect(consistencyProof(5, all, 5)).toEqual([]);
    expect(consistencyProof(0, all, 5)).toEqual([]);
    expect(verifyConsistency({ firstSize: 5, secondSize: 5, firstRoot: root, secondRoot: root, path: [] })).toBe(true);
    expect(verifyConsistency({ firstSize: 5, secondSize: 5, firstRoot: root, secondRoot: merkleRoot(all, 6), path: [] })).toBe(false);
    expect(verifyConsistency({ firstSize: 5, secondSize: 5, firstRoot: root, secondRoot: root, path: [root] })).toBe(false);
    expect(verifyConsistency({ firstSize: 0, secondSize: 5, firstRoot: EMPTY_TREE_ROOT, secondRoot: root, path: [] })).toBe(true);
    expect(verifyConsistency({ firstSize: 0, secondSize: 5, firstRoot: root, secondRoot: root, path: [] })).toBe(false);
  });

  it('says no, rather than throwing, to hashes that are not 32 bytes', () => {
    const path = inclusionProof(2, all, 5);
    const ok = { leafHash: all[2], leafIndex: 2, treeSize: 5, auditPath: path, rootHash: merkleRoot(all, 5) };
    expect(verifyInclusion({ ...ok, rootHash: 'not hex' })).toBe(false);
    expect(verifyInclusion({ ...ok, auditPath: [...path.slice(1), Buffer.alloc(31)] })).toBe(false);
    expect(verifyInclusion({ ...ok, rootHash: toHex(merkleRoot(all, 5)), auditPath: path.map(toHex), leafHash: toHex(all[2]) })).toBe(true);
  });

  it('refuses to build proofs for leaves or sizes that are not there', () => {
    expect(() => inclusionProof(5, all, 5)).toThrow(RangeError);
    expect(() => inclusionProof(0, all, 21)).toThrow(RangeError);
    expect(() => consistencyProof(6, all, 5)).toThrow(RangeError);
    expect(() => tree.inclusionProof(20)).toThrow(RangeError);
    expect(() => tree.root(21)).toThrow(RangeError);
  });

  it('hands out copies, so changing a returned hash cannot change the tree', () => {
    const before = toHex(tree.root());
    tree.root().fill(0);
    tree.leafHash(3).fill(0);
    tree.inclusionProof(3).forEach((x) => x.fill(0));
    expect(toHex(tree.root())).toBe(before);
    expect(toHex(merkleRoot([]))).toBe(toHex(EMPTY_TREE_ROOT));
  });
});

describe('properties (fast-check)', () => {
  const sizes = fc.integer({ min: 1, max: 300 }).chain((n) => fc.record({ n: fc.constant(n), a: fc.integer({ min: 0, max: n - 1 }), b: fc.integer({ min: 1, max: n }) }));

  it('every proof of every random tree verifies, and one flipped bit anywhere is caught', () => {
    fc.assert(
      fc.property(sizes, fc.nat(), ({ n, a, b }, tamperAt) => {
        const leaves = Array.from({ length: n }, (_, i) => leafHash(`entry ${i} of ${n}`));
        const tree = MerkleTree.fromLeafHashes(leaves);
        const root = merkleRoot(leaves);
        expect(tree.root().equals(root)).toBe(true);

        const auditPath = inclusionProof(a, leaves);
        expect(tree.inclusionProof(a).map(toHex)).toEqual(auditPath.map(toHex));
        expect(verifyInclusion({ leafHash: leaves[a], leafIndex: a, treeSize: n, auditPath, rootHash: root })).toBe(true);
        if (auditPath.length > 0) {
          const at = tamperAt % auditPath.length;
          const bad = auditPath.map((x, q) => (q === at ? flipByte(x, tamperAt) : x));
          expect(verifyInclusion({ leafHash: leaves[a], leafIndex: a, treeSize: n, auditPath: bad, rootHash: root })).toBe(false);
        }

        const path = consistencyProof(b, leaves);
        expect(tree.consistencyProof(b).map(toHex)).toEqual(path.map(toHex));
        const firstRoot = merkleRoot(leaves, b);
        expect(verifyConsistency({ firstSize: b, secondSize: n, firstRoot, secondRoot: root, path })).toBe(true);
        if (path.length > 0) {
          const at = tamperAt % path.length;
          const bad = path.map((x, q) => (q === at ? flipByte(x, tamperAt) : x));
          expect(verifyConsistency({ firstSize: b, secondSize: n, firstRoot, secondRoot: root, path: bad })).toBe(false);
        }
        // A log that rewrote an old leaf cannot prove it still extends the old head.
        if (b < n) {
          const rewritten = leaves.slice();
          rewritten[tamperAt % b] = leafHash('rewritten');
          const forged = consistencyProof(b, rewritten);
          expect(verifyConsistency({ firstSize: b, secondSize: n, firstRoot, secondRoot: merkleRoot(rewritten), path: forged })).toBe(false);
        }
      }),
      { numRuns: 200 },
    );
  });
});
