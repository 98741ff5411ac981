import { generateKeyPairSync } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { canonicalJson, type ConsistencyProof, type InclusionProof, type ProvenanceEntry, type ProvenanceRecord, type SignedTreeHead } from '@localis/shared';
import { consistencyProof, EMPTY_TREE_ROOT, inclusionProof, keyIdOf, leafHash, merkleRoot, publicKeyPemOf, signTreeHead } from '@localis/shared/node';
import { checkArchiveEntry, checkConsistency, checkHeadSignature } from './verify-log';

// Small logs built by hand with the shared Merkle functions (RFC 6962 section 2.1) and signed with
// a throw-away Ed25519 key, so every check can be made to pass and then to fail for each reason.

const { privateKey } = generateKeyPairSync('ed25519');
const PEM = publicKeyPemOf(privateKey);
const KEY_ID = keyIdOf(privateKey);
const CAMPAIGN = '3f1c9a52-7d4e-4b8a-9c61-2e5f0a7b8d90';
const SHA = 'a'.repeat(64);

function record(i: number, sha256?: string): ProvenanceRecord {
  return {
    v: 1,
    kind: sha256 ? 'archive-verified' : 'run-recorded',
    campaignId: CAMPAIGN,
    at: `2026-12-01T10:00:${String(i).padStart(2, '0')}Z`,
    entities: [{ id: sha256 ? `localis:archive/00000000-0000-4000-8000-${String(i).padStart(12, '0')}` : `localis:run-output/${i}`, label: `entry ${i}`, attributes: sha256 ? { sha256, sizeBytes: 42 } : {} }],
    activities: [],
    agents: [],
    used: [],
    wasGeneratedBy: [],
    wasAssociatedWith: [],
    wasDerivedFrom: [],
  };
}

/** A log of `size` entries, entry `archiveAt` being the archive with SHA. */
function log(size: number, archiveAt: number) {
  const contents = Array.from({ length: size }, (_, i) => canonicalJson(record(i, i === archiveAt ? SHA : undefined)));
  const leaves = contents.map((c) => leafHash(c));
  const head = (n: number): SignedTreeHead => signTreeHead(privateKey, { treeSize: n, rootHash: merkleRoot(leaves, n).toString('hex'), timestamp: `2026-12-01T11:00:${String(n).padStart(2, '0')}Z` });
  return { contents, leaves, head };
}

function entryAndProof(size: number, index: number): { entry: ProvenanceEntry; proof: InclusionProof } {
  const l = log(size, index);
  const head = l.head(size);
  const entry: ProvenanceEntry = {
    id: `entry-${index}`,
    leafIndex: index,
    kind: 'archive-verified',
    campaignId: CAMPAIGN,
    subjectId: 'x',
    record: JSON.parse(l.contents[index]) as ProvenanceRecord,
    content: l.contents[index],
    leafHash: l.leaves[index].toString('hex'),
    createdAt: '2026-12-01T10:00:00Z',
  };
  const proof: InclusionProof = { leafIndex: index, treeSize: size, leafHash: entry.leafHash, auditPath: inclusionProof(index, l.leaves).map((h) => h.toString('hex')), head };
  return { entry, proof };
}

const failed = (checks: { name: string; ok: boolean }[]) => checks.filter((c) => !c.ok).map((c) => c.name);

describe("an archive's log entry", () => {
  it('should pass every check for each leaf of trees of 1 to 9 entries', () => {
    for (let size = 1; size <= 9; size++) {
      for (let index = 0; index < size; index++) {
        const { entry, proof } = entryAndProof(size, index);
        const checks = checkArchiveEntry(SHA, entry, proof, PEM, KEY_ID);
        expect(checks.map((c) => c.name)).toEqual(['entry-names-file', 'leaf-hash', 'inclusion', 'head-signature']);
        expect(failed(checks), `leaf ${index} of ${size}`).toEqual([]);
      }
    }
  });

  it('should say what it checked', () => {
    const { entry, proof } = entryAndProof(7, 5);
    const details = checkArchiveEntry(SHA, entry, proof, PEM, KEY_ID).map((c) => c.detail);
    expect(details[0]).toMatch(/^log entry 5 \(archive-verified, 2026-12-01 10:00:00 UTC\) names this file's SHA-256/);
    expect(details[2]).toMatch(/^inclusion proof: leaf 5 is in the tree of 7 entries with root [0-9a-f]{12}… \(3 hashes\)$/);
    expect(details[3]).toBe(`the head of 7 entries (root ${proof.head.rootHash.slice(0, 12)}…, 2026-12-01 11:00:07 UTC) is signed by key ${KEY_ID}`);
  });

  it("should fail when the entry names another file's SHA-256", () => {
    const { entry, proof } = entryAndProof(5, 2);
    const checks = checkArchiveEntry('b'.repeat(64), entry, proof, PEM, KEY_ID);
    expect(failed(checks)).toEqual(['entry-names-file']);
    expect(checks[0].detail).toContain(`names SHA-256 ${SHA}, not this file's ${'b'.repeat(64)}`);
  });

  it('should fail when the content was altered after it was hashed into the log', () => {
    const { entry, proof } = entryAndProof(5, 2);
    const altered = { ...entry, content: entry.content.replace('"sizeBytes":42', '"sizeBytes":43') };
    expect(failed(checkArchiveEntry(SHA, altered, proof, PEM, KEY_ID))).toEqual(['leaf-hash', 'inclusion']);
  });

  it('should fail when the audit path does not lead to the signed root', () => {
    const { entry, proof } = entryAndProof(6, 3);
    const wrongPath = { ...proof, auditPath: [...proof.auditPath.slice(0, -1), 'c'.repeat(64)] };
    expect(failed(checkArchiveEntry(SHA, entry, wrongPath, PEM, KEY_ID))).toEqual(['inclusion']);
    const shortPath = { ...proof, auditPath: proof.auditPath.slice(1) };
    expect(failed(checkArchiveEntry(SHA, entry, shortPath, PEM, KEY_ID))).toEqual(['inclusion']);
    const otherLeaf = { ...proof, leafIndex: 2 };
    expect(failed(checkArchiveEntry(SHA, entry, otherLeaf, PEM, KEY_ID))).toEqual(['inclusion']);
  });

  it('should fail when the head is not signed by the pinned key, or its signature was altered', () => {
    const { entry, proof } = entryAndProof(4, 1);
    const other = generateKeyPairSync('ed25519').privateKey;
    const byOther = { ...proof, head: signTreeHead(other, proof.head) };
    expect(failed(checkArchiveEntry(SHA, entry, byOther, PEM, KEY_ID))).toEqual(['head-signature']);
    expect(checkArchiveEntry(SHA, entry, byOther, PEM, KEY_ID)[3].detail).toContain(`names key ${keyIdOf(other)}, not the pinned key ${KEY_ID}`);
    // Same key id, another root: the signature covers the root.
    const forged = { ...proof, head: { ...proof.head, rootHash: 'd'.repeat(64) } };
    expect(failed(checkArchiveEntry(SHA, entry, forged, PEM, KEY_ID))).toEqual(['inclusion', 'head-signature']);
  });

  it('should fail when there is no proof yet', () => {
    const { entry } = entryAndProof(3, 0);
    expect(failed(checkArchiveEntry(SHA, entry, null, PEM, KEY_ID))).toEqual(['inclusion']);
  });

  it('should check a head on its own', () => {
    const head = log(3, 0).head(3);
    expect(checkHeadSignature(PEM, KEY_ID, head).ok).toBe(true);
    expect(checkHeadSignature(PEM, KEY_ID, { ...head, treeSize: 4 }).ok).toBe(false);
  });
});

describe('consistency of a saved head with a later one', () => {
  const proofBetween = (first: number, second: number, l = log(second, -1)): ConsistencyProof => ({
    firstSize: first,
    secondSize: second,
    path: consistencyProof(first, l.leaves, second).map((h) => h.toString('hex')),
    first: l.head(first),
    second: l.head(second),
  });

  it('should pass for every pair of sizes up to 10 (powers of two included, and equal sizes)', () => {
    const l = log(10, -1);
    for (let second = 1; second <= 10; second++) {
      for (let first = 1; first <= second; first++) {
        const checks = checkConsistency(l.head(first), l.head(second), proofBetween(first, second, l));
        expect(failed(checks), `${first} -> ${second}`).toEqual([]);
      }
    }
  });

  it('should say how much the log grew', () => {
    const l = log(7, -1);
    expect(checkConsistency(l.head(3), l.head(7), proofBetween(3, 7, l))[0].detail).toMatch(/^consistent with the saved head of 3 entries \(2026-12-01 11:00:03 UTC\): the log only grew, by 4 entries \(consistency proof of \d+ hashes\)$/);
    expect(checkConsistency(l.head(7), l.head(7), proofBetween(7, 7, l))[0].detail).toMatch(/same size and root/);
  });

  it('should fail when an old entry was rewritten: the saved root is not in the new tree', () => {
    const honest = log(8, -1);
    const saved = honest.head(5);
    // The same log with entry 2 changed, then grown to 8.
    const leaves = [...honest.leaves];
    leaves[2] = leafHash('{"rewritten":true}');
    const rewritten = signTreeHead(privateKey, { treeSize: 8, rootHash: merkleRoot(leaves).toString('hex'), timestamp: '2026-12-02T00:00:00Z' });
    const proof: ConsistencyProof = {
      firstSize: 5,
      secondSize: 8,
      path: consistencyProof(5, leaves, 8).map((h) => h.toString('hex')),
      first: signTreeHead(privateKey, { treeSize: 5, rootHash: merkleRoot(leaves, 5).toString('hex'), timestamp: saved.timestamp }),
      second: rewritten,
    };
    const checks = checkConsistency(saved, rewritten, proof);
    expect(failed(checks)).toEqual(['saved-head-root', 'consistency']);
    expect(checks[0].detail).toContain('the log was rewritten since it was saved');
  });

  it('should fail when the log shrank, and for a proof between other sizes', () => {
    const l = log(6, -1);
    expect(failed(checkConsistency(l.head(6), l.head(4), null))).toEqual(['consistency']);
    expect(checkConsistency(l.head(6), l.head(4), null)[0].detail).toContain('entries were removed');
    expect(failed(checkConsistency(l.head(3), l.head(6), proofBetween(2, 6, l)))).toEqual(['consistency']);
  });

  it('should accept a saved empty log only with the root of the empty tree', () => {
    const l = log(3, -1);
    const empty = signTreeHead(privateKey, { treeSize: 0, rootHash: EMPTY_TREE_ROOT.toString('hex'), timestamp: '2026-12-01T00:00:00Z' });
    expect(failed(checkConsistency(empty, l.head(3), null))).toEqual([]);
    expect(failed(checkConsistency({ ...empty, rootHash: 'e'.repeat(64) }, l.head(3), null))).toEqual(['consistency']);
  });
});
