import { hash } from 'node:crypto';

/**
 * The provenance log's Merkle tree, hashed exactly as RFC 6962 section 2.1 (the tree RFC 9162
 * section 2.1 keeps): leaves are SHA-256(0x00 || content), interior nodes SHA-256(0x01 || left ||
 * right), and a tree of n leaves splits at the largest power of two below n. Proofs are built as
 * RFC 6962 sections 2.1.1 (PATH) and 2.1.2 (PROOF/SUBPROOF) and checked with the algorithms of RFC
 * 9162 sections 2.1.3.2 and 2.1.4.2.
 *
 * Hashes are Buffers inside; the hex helpers convert at the edges (JSON, the api's responses).
 */

export type HashLike = Buffer | string;

const HASH_BYTES = 32;
const LEAF_PREFIX = Buffer.from([0x00]);
/** One reusable buffer for 0x01 || left || right: a node hash is the hot path of every proof. */
const nodeScratch = Buffer.alloc(1 + 2 * HASH_BYTES);

function sha256(data: Buffer): Buffer {
  return hash('sha256', data, 'buffer');
}

/** MTH({}) = SHA-256 of the empty string (RFC 6962 section 2.1). */
export const EMPTY_TREE_ROOT: Buffer = sha256(Buffer.alloc(0));

/** MTH({d}) = SHA-256(0x00 || d); strings are hashed as their UTF-8 bytes. */
export function leafHash(content: Buffer | string): Buffer {
  const bytes = typeof content === 'string' ? Buffer.from(content, 'utf8') : content;
  return sha256(Buffer.concat([LEAF_PREFIX, bytes]));
}

/** SHA-256(0x01 || left || right). */
export function nodeHash(left: Buffer, right: Buffer): Buffer {
  if (left.length !== HASH_BYTES || right.length !== HASH_BYTES) return sha256(Buffer.concat([Buffer.from([0x01]), left, right]));
  nodeScratch[0] = 0x01;
  left.copy(nodeScratch, 1);
  right.copy(nodeScratch, 1 + HASH_BYTES);
  return sha256(nodeScratch);
}

export function toHex(hashBytes: Buffer): string {
  return hashBytes.toString('hex');
}

/** A 32-byte hash from its lowercase or uppercase hex; throws on anything else. */
export function fromHex(hex: string): Buffer {
  if (!/^[0-9a-fA-F]{64}$/.test(hex)) throw new Error('a hash is 64 hex digits');
  return Buffer.from(hex, 'hex');
}

/** A hash given as Buffer or hex, or null when it is not a 32-byte hash (verifiers then say no). */
function asHash(value: HashLike): Buffer | null {
  if (typeof value === 'string') return /^[0-9a-fA-F]{64}$/.test(value) ? Buffer.from(value, 'hex') : null;
  return Buffer.isBuffer(value) && value.length === HASH_BYTES ? value : null;
}

/** k, the largest power of two smaller than n (n > 1), where RFC 6962 splits a tree. */
export function splitPoint(n: number): number {
  return 2 ** (31 - Math.clz32(n - 1));
}

/** MTH(D[start:end]) for start < end, in one pass with a stack of O(log n) complete subtrees. */
function rangeRoot(leafHashes: readonly Buffer[], start: number, end: number): Buffer {
  const stack: Buffer[] = [];
  for (let i = start, count = 1; i < end; i++, count++) {
    let node = leafHashes[i];
    // Each trailing zero bit of the count closes a complete subtree: merge it with its left sibling.
    for (let c = count; c % 2 === 0; c /= 2) node = nodeHash(stack.pop()!, node);
    stack.push(node);
  }
  // What is left are complete subtrees of decreasing size; RFC 6962 nests them to the right.
  let root = stack.pop()!;
  while (stack.length > 0) root = nodeHash(stack.pop()!, root);
  return root;
}

/** MTH(D[n]) of the first `treeSize` leaf hashes (all of them by default). */
export function merkleRoot(leafHashes: readonly Buffer[], treeSize: number = leafHashes.length): Buffer {
  checkSize(treeSize, leafHashes.length);
  return treeSize === 0 ? Buffer.from(EMPTY_TREE_ROOT) : rangeRoot(leafHashes, 0, treeSize);
}

/** PATH(m, D[n]) of RFC 6962 section 2.1.1, given a way to get MTH of any subtree it names. */
function auditPathOf(index: number, treeSize: number, subtreeRoot: (start: number, end: number) => Buffer): Buffer[] {
  const path: Buffer[] = [];
  let start = 0;
  let end = treeSize;
  while (end - start > 1) {
    const k = splitPoint(end - start);
    if (index < start + k) {
      path.push(subtreeRoot(start + k, end));
      end = start + k;
    } else {
      path.push(subtreeRoot(start, start + k));
      start += k;
    }
  }
  // Found from the root down; RFC 6962 lists it from the leaf up.
  return path.reverse();
}

/** PROOF(m, D[n]) = SUBPROOF(m, D[n], true) of RFC 6962 section 2.1.2. */
function consistencyPathOf(firstSize: number, secondSize: number, subtreeRoot: (start: number, end: number) => Buffer): Buffer[] {
  if (firstSize === 0 || firstSize === secondSize) return [];
  const proof: Buffer[] = [];
  let start = 0;
  let end = secondSize;
  let m = firstSize;
  let wholeOldTree = true;
  while (m !== end - start) {
    const k = splitPoint(end - start);
    if (m <= k) {
      proof.push(subtreeRoot(start + k, end));
      end = start + k;
    } else {
      proof.push(subtreeRoot(start, start + k));
      start += k;
      m -= k;
      wholeOldTree = false;
    }
  }
  // SUBPROOF(m, D[m], false) = {MTH(D[m])}; with b = true the verifier already has the old root.
  if (!wholeOldTree) proof.push(subtreeRoot(start, end));
  return proof.reverse();
}

/** The audit path of leaf `index` in the tree of the first `treeSize` leaf hashes; hashes O(n) once. */
export function inclusionProof(index: number, leafHashes: readonly Buffer[], treeSize: number = leafHashes.length): Buffer[] {
  checkSize(treeSize, leafHashes.length);
  if (!Number.isInteger(index) || index < 0 || index >= treeSize) throw new RangeError(`leaf ${index} is not in a tree of ${treeSize}`);
  return auditPathOf(index, treeSize, (start, end) => rangeRoot(leafHashes, start, end));
}

/** The proof that the tree of the first `firstSize` leaves is a prefix of the tree of `secondSize`. */
export function consistencyProof(firstSize: number, leafHashes: readonly Buffer[], secondSize: number = leafHashes.length): Buffer[] {
  checkSize(secondSize, leafHashes.length);
  if (!Number.isInteger(firstSize) || firstSize < 0 || firstSize > secondSize) throw new RangeError(`no tree of ${firstSize} inside one of ${secondSize}`);
  return consistencyPathOf(firstSize, secondSize, (start, end) => rangeRoot(leafHashes, start, end));
}

function checkSize(treeSize: number, available: number): void {
  if (!Number.isInteger(treeSize) || treeSize < 0 || treeSize > available) throw new RangeError(`a tree of ${treeSize} needs that many leaves (${available} given)`);
}

export interface InclusionCheck {
  leafHash: HashLike;
  leafIndex: number;
  treeSize: number;
  auditPath: readonly HashLike[];
  rootHash: HashLike;
}

/** RFC 9162 section 2.1.3.2: does the audit path lead from the leaf to the root? */
export function verifyInclusion({ leafHash: leaf, leafIndex, treeSize, auditPath, rootHash }: InclusionCheck): boolean {
  if (!Number.isSafeInteger(leafIndex) || !Number.isSafeInteger(treeSize) || leafIndex < 0 || leafIndex >= treeSize) return false;
  const root = asHash(rootHash);
  let r = asHash(leaf);
  if (!root || !r) return false;
  // fn and sn can pass 2^32: plain arithmetic, not 32-bit bit operations.
  let fn = leafIndex;
  let sn = treeSize - 1;
  for (const item of auditPath) {
    const p = asHash(item);
    if (!p || sn === 0) return false;
    if (fn % 2 === 1 || fn === sn) {
      r = nodeHash(p, r);
      while (fn % 2 === 0 && fn !== 0) {
        fn /= 2;
        sn = Math.floor(sn / 2);
      }
    } else {
      r = nodeHash(r, p);
    }
    fn = Math.floor(fn / 2);
    sn = Math.floor(sn / 2);
  }
  return sn === 0 && r.equals(root);
}

export interface ConsistencyCheck {
  firstSize: number;
  secondSize: number;
  firstRoot: HashLike;
  secondRoot: HashLike;
  path: readonly HashLike[];
}

/**
 * RFC 9162 section 2.1.4.2: is the tree of `firstSize` a prefix of the tree of `secondSize`?
 * The RFC defines proofs for 0 < first < second; equal sizes need an empty path and equal roots,
 * and the empty tree is a prefix of every tree (with an empty path).
 */
export function verifyConsistency({ firstSize, secondSize, firstRoot, secondRoot, path }: ConsistencyCheck): boolean {
  if (!Number.isSafeInteger(firstSize) || !Number.isSafeInteger(secondSize) || firstSize < 0 || firstSize > secondSize) return false;
  const first = asHash(firstRoot);
  const second = asHash(secondRoot);
  if (!first || !second) return false;
  if (firstSize === secondSize) return path.length === 0 && first.equals(second);
  if (firstSize === 0) return path.length === 0 && first.equals(EMPTY_TREE_ROOT);
  const items = path.map(asHash);
  if (items.length === 0 || items.some((p) => p === null)) return false;
  const proof = items as Buffer[];
  // Step 2: when the old tree is a complete subtree its root is the proof's implicit first item.
  if (isPowerOfTwo(firstSize)) proof.unshift(first);
  let fn = firstSize - 1;
  let sn = secondSize - 1;
  while (fn % 2 === 1) {
    fn = (fn - 1) / 2;
    sn = Math.floor(sn / 2);
  }
  let fr = proof[0];
  let sr = proof[0];
  for (const c of proof.slice(1)) {
    if (sn === 0) return false;
    if (fn % 2 === 1 || fn === sn) {
      fr = nodeHash(c, fr);
      sr = nodeHash(c, sr);
      while (fn % 2 === 0 && fn !== 0) {
        fn /= 2;
        sn = Math.floor(sn / 2);
      }
    } else {
      sr = nodeHash(sr, c);
    }
    fn = Math.floor(fn / 2);
    sn = Math.floor(sn / 2);
  }
  return fr.equals(first) && sr.equals(second) && sn === 0;
}

function isPowerOfTwo(n: number): boolean {
  return n > 0 && 2 ** Math.floor(Math.log2(n)) === n;
}

/**
 * An append-only tree that keeps every complete subtree's root, packed 32 bytes apiece (about
 * 64 bytes a leaf). Appending costs O(1) hashes amortised, and roots and proofs for any size up
 * to the current one cost O(log² n) instead of rehashing O(n): for an api that serves many proofs
 * over a large log.
 */
export class MerkleTree {
  /** levels[l] holds the roots of the complete subtrees of 2^l leaves, left to right. */
  private readonly levels: Buffer[] = [];
  private leafCount = 0;

  static fromLeafHashes(leafHashes: Iterable<Buffer>): MerkleTree {
    const tree = new MerkleTree();
    for (const leaf of leafHashes) tree.append(leaf);
    return tree;
  }

  get size(): number {
    return this.leafCount;
  }

  append(leaf: Buffer): void {
    if (leaf.length !== HASH_BYTES) throw new Error('a leaf hash is 32 bytes');
    let index = this.leafCount;
    let node = leaf;
    this.store(0, index, node);
    for (let level = 0; index % 2 === 1; level++) {
      node = nodeHash(this.node(level, index - 1), node);
      index = (index - 1) / 2;
      this.store(level + 1, index, node);
    }
    this.leafCount++;
  }

  leafHash(index: number): Buffer {
    if (!Number.isInteger(index) || index < 0 || index >= this.leafCount) throw new RangeError(`leaf ${index} is not in a tree of ${this.leafCount}`);
    return Buffer.from(this.node(0, index));
  }

  root(treeSize: number = this.leafCount): Buffer {
    this.checkSize(treeSize);
    return Buffer.from(treeSize === 0 ? EMPTY_TREE_ROOT : this.subtreeRoot(0, treeSize));
  }

  inclusionProof(index: number, treeSize: number = this.leafCount): Buffer[] {
    this.checkSize(treeSize);
    if (!Number.isInteger(index) || index < 0 || index >= treeSize) throw new RangeError(`leaf ${index} is not in a tree of ${treeSize}`);
    return auditPathOf(index, treeSize, (start, end) => Buffer.from(this.subtreeRoot(start, end)));
  }

  consistencyProof(firstSize: number, secondSize: number = this.leafCount): Buffer[] {
    this.checkSize(secondSize);
    if (!Number.isInteger(firstSize) || firstSize < 0 || firstSize > secondSize) throw new RangeError(`no tree of ${firstSize} inside one of ${secondSize}`);
    return consistencyPathOf(firstSize, secondSize, (start, end) => Buffer.from(this.subtreeRoot(start, end)));
  }

  /**
   * MTH(D[start:end]). The proofs only ask for subtrees that start on a multiple of their split
   * point, so the left part is always a stored complete subtree and only the right edge recurses.
   */
  private subtreeRoot(start: number, end: number): Buffer {
    const width = end - start;
    if (width === 1) return this.node(0, start);
    const level = Math.log2(width);
    if (Number.isInteger(level) && start % width === 0) return this.node(level, start / width);
    const k = splitPoint(width);
    return nodeHash(this.subtreeRoot(start, start + k), this.subtreeRoot(start + k, end));
  }

  /** A view into the packed level: callers outside get copies, so nothing can change the tree. */
  private node(level: number, index: number): Buffer {
    return this.levels[level].subarray(index * HASH_BYTES, (index + 1) * HASH_BYTES);
  }

  private store(level: number, index: number, node: Buffer): void {
    let packed = this.levels[level];
    const needed = (index + 1) * HASH_BYTES;
    if (!packed || packed.length < needed) {
      const grown = Buffer.alloc(Math.max(needed, (packed?.length ?? 0) * 2, 64 * HASH_BYTES));
      packed?.copy(grown);
      this.levels[level] = packed = grown;
    }
    node.copy(packed, index * HASH_BYTES);
  }

  private checkSize(treeSize: number): void {
    if (!Number.isInteger(treeSize) || treeSize < 0 || treeSize > this.leafCount) throw new RangeError(`the tree has ${this.leafCount} leaves, not ${treeSize}`);
  }
}
