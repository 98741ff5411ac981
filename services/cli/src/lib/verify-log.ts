import { ProvenanceRecord, type ConsistencyProof, type InclusionProof, type ProvenanceEntry, type SignedTreeHead } from '@localis/shared';
import { leafHash, verifyConsistency, verifyInclusion, verifyTreeHead } from '@localis/shared/node';

/**
 * The checks `localis verify` makes of what the portal says about its provenance log, with nothing
 * taken on trust: the entry's bytes hash to its leaf, the leaf is in the signed tree (RFC 6962
 * section 2.1.1 audit path, checked as RFC 9162 section 2.1.3.2), the tree head is signed by the
 * pinned key, and a later head extends an earlier one (RFC 9162 section 2.1.4.2). Pure functions:
 * the network and the files are elsewhere (verify.ts, verify-trust.ts).
 */

export interface LogCheck {
  /** A short stable name, for --json and tests. */
  name: string;
  ok: boolean;
  /** What was checked, or what is wrong, in a sentence. */
  detail: string;
}

const short = (hex: string) => `${hex.slice(0, 12)}…`;
const utc = (iso: string) => {
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? iso : `${d.toISOString().replace('T', ' ').replace(/\.\d+Z$/, '')} UTC`;
};

/** The archive entity a record of kind archive-verified describes, with the SHA-256 it names. */
function archiveNamed(content: string): { id: string; sha256: unknown; kind: string } | null {
  let json: unknown;
  try {
    json = JSON.parse(content);
  } catch {
    return null;
  }
  const record = ProvenanceRecord.safeParse(json);
  if (!record.success) return null;
  const entity = record.data.entities.find((e) => e.id.startsWith('localis:archive/'));
  if (!entity) return null;
  return { id: entity.id, sha256: entity.attributes.sha256, kind: record.data.kind };
}

/** A signed head, checked with the pinned key. */
export function checkHeadSignature(publicKeyPem: string, keyId: string, head: SignedTreeHead): LogCheck {
  const ok = verifyTreeHead(publicKeyPem, head);
  return {
    name: 'head-signature',
    ok,
    detail: ok
      ? `the head of ${head.treeSize.toLocaleString('en')} entries (root ${short(head.rootHash)}, ${utc(head.timestamp)}) is signed by key ${keyId}`
      : head.keyId !== keyId
        ? `the head of ${head.treeSize.toLocaleString('en')} entries names key ${head.keyId}, not the pinned key ${keyId}`
        : `the signature of the head of ${head.treeSize.toLocaleString('en')} entries does not verify with key ${keyId}`,
  };
}

/** Everything that ties a file's SHA-256 to the signed log: the entry, its leaf, the audit path, the head. */
export function checkArchiveEntry(sha256: string, entry: ProvenanceEntry, proof: InclusionProof | null, publicKeyPem: string, keyId: string): LogCheck[] {
  const checks: LogCheck[] = [];
  const named = archiveNamed(entry.content);
  const namesFile = named !== null && named.kind === 'archive-verified' && named.sha256 === sha256;
  checks.push({
    name: 'entry-names-file',
    ok: namesFile,
    detail: namesFile
      ? `log entry ${entry.leafIndex ?? '(not sequenced)'} (archive-verified, ${utc(entry.createdAt)}) names this file's SHA-256 for ${named!.id}`
      : named === null
        ? "the log entry's content is not an archive record"
        : named.kind !== 'archive-verified'
          ? `the log entry is of kind ${named.kind}, not archive-verified`
          : `the log entry names SHA-256 ${String(named.sha256)}, not this file's ${sha256}`,
  });

  const computed = leafHash(entry.content).toString('hex');
  checks.push({
    name: 'leaf-hash',
    ok: computed === entry.leafHash,
    detail:
      computed === entry.leafHash
        ? `the entry's content hashes to its leaf hash ${short(entry.leafHash)} (SHA-256 of 0x00 and the content, RFC 6962)`
        : `the entry's content hashes to ${short(computed)}, but the log gives its leaf hash as ${short(entry.leafHash)}`,
  });

  if (!proof) {
    checks.push({ name: 'inclusion', ok: false, detail: 'the portal gave no inclusion proof (the entry is not sequenced yet); try again in a moment' });
    return checks;
  }
  const matches = proof.leafHash === computed && proof.leafIndex === entry.leafIndex && proof.treeSize === proof.head.treeSize;
  const included = matches && verifyInclusion({ leafHash: computed, leafIndex: proof.leafIndex, treeSize: proof.treeSize, auditPath: proof.auditPath, rootHash: proof.head.rootHash });
  checks.push({
    name: 'inclusion',
    ok: included,
    detail: included
      ? `inclusion proof: leaf ${proof.leafIndex} is in the tree of ${proof.treeSize.toLocaleString('en')} entries with root ${short(proof.head.rootHash)} (${proof.auditPath.length} hashes)`
      : !matches
        ? `the inclusion proof is for another leaf or tree (leaf ${proof.leafIndex} of ${proof.treeSize}, head of ${proof.head.treeSize})`
        : `the inclusion proof of leaf ${proof.leafIndex} does not lead to the root ${short(proof.head.rootHash)} of the signed head`,
  });
  checks.push(checkHeadSignature(publicKeyPem, keyId, proof.head));
  return checks;
}

/**
 * A saved head against a newer one: the newer log must contain the older one unchanged. The roots
 * compared are the saved one and the newly verified one, not the copies the proof carries.
 */
export function checkConsistency(saved: SignedTreeHead, latest: SignedTreeHead, proof: ConsistencyProof | null): LogCheck[] {
  const label = `the saved head of ${saved.treeSize.toLocaleString('en')} entries (${utc(saved.timestamp)})`;
  if (latest.treeSize < saved.treeSize) {
    return [{ name: 'consistency', ok: false, detail: `the log has ${latest.treeSize.toLocaleString('en')} entries now, fewer than ${label}: entries were removed` }];
  }
  if (saved.treeSize === 0) {
    const ok = verifyConsistency({ firstSize: 0, secondSize: latest.treeSize, firstRoot: saved.rootHash, secondRoot: latest.rootHash, path: [] });
    return [{ name: 'consistency', ok, detail: ok ? `${label} was the empty log; every log extends it` : `${label} claims an empty log with a root that is not the empty tree's` }];
  }
  if (!proof) return [{ name: 'consistency', ok: false, detail: `the portal gave no consistency proof from ${label}` }];
  const checks: LogCheck[] = [];
  if (proof.firstSize !== saved.treeSize || proof.secondSize !== latest.treeSize) {
    return [{ name: 'consistency', ok: false, detail: `the consistency proof is between sizes ${proof.firstSize} and ${proof.secondSize}, not ${saved.treeSize} and ${latest.treeSize}` }];
  }
  if (proof.first.rootHash !== saved.rootHash) {
    checks.push({
      name: 'saved-head-root',
      ok: false,
      detail: `the portal's head of ${saved.treeSize.toLocaleString('en')} entries has root ${short(proof.first.rootHash)}, the saved one ${short(saved.rootHash)}: the log was rewritten since it was saved`,
    });
  }
  const ok = verifyConsistency({ firstSize: saved.treeSize, secondSize: latest.treeSize, firstRoot: saved.rootHash, secondRoot: latest.rootHash, path: proof.path });
  const grown = latest.treeSize - saved.treeSize;
  checks.push({
    name: 'consistency',
    ok,
    detail: ok
      ? grown === 0
        ? `same log as ${label}: the same size and root`
        : `consistent with ${label}: the log only grew, by ${grown.toLocaleString('en')} ${grown === 1 ? 'entry' : 'entries'} (consistency proof of ${proof.path.length} hashes)`
      : `the consistency proof does not show that the log of ${latest.treeSize.toLocaleString('en')} entries extends ${label}: the log was changed, not only appended to`,
  });
  return checks;
}
