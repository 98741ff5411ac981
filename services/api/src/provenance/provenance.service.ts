import { join } from 'node:path';
import type { Transaction } from 'sequelize';
import { canonicalJson, errors, toProvJson, type ConsistencyProof, type InclusionProof, type ProvenanceEntry, type ProvenanceEntryWithProof, type ProvenanceRecord, type Settings, type SignedTreeHead, type SigningKey } from '@localis/shared';
import { leafHash, loadOrCreateSigningKey, MerkleTree, signingKeyDescription, signTreeHead, type TreeHeadSigningKey } from '@localis/shared/node';
import type { Database } from '../db';
import type { RequestContext } from '../http/principal';
import type { CampaignsService } from '../campaigns/campaigns.service';
import { headToDto, provenanceRepository, type NewProvenanceEntry } from './provenance.repository';

/** A record ready to append: its canonical bytes are the leaf. */
export function entryOf(record: ProvenanceRecord, subjectId: string): NewProvenanceEntry {
  const content = canonicalJson(record);
  return { kind: record.kind, campaignId: record.campaignId, subjectId, content, leafHash: leafHash(content) };
}

/** Append records to the log inside the caller's transaction (so a change and its entry commit together). */
export async function appendProvenance(items: { record: ProvenanceRecord; subjectId: string }[], tx: Transaction): Promise<void> {
  await provenanceRepository.appendMany(items.map((i) => entryOf(i.record, i.subjectId)), tx);
}

/**
 * The provenance log. Entries are written with the changes they describe and sequenced moments
 * later (a leaf index each, in the order they were written), and each sequencing signs a new tree
 * head: so a busy import never waits on a log-wide lock. Anyone signed in may read the log and its
 * proofs; a campaign's own records follow the campaign's visibility.
 */
export function createProvenanceService(db: Database, settings: Pick<Settings, 'DATA_DIR' | 'PROVENANCE_KEY_FILE'>, campaigns: CampaignsService) {
  let key: TreeHeadSigningKey | null = null;
  const signingKey = () => (key ??= loadOrCreateSigningKey(settings.PROVENANCE_KEY_FILE || join(settings.DATA_DIR, 'provenance-signing-key.pem')));

  /**
   * The tree as far as this process has read it. Sequenced leaves never change, so the tree only
   * grows: each request reads just the leaves sequenced since, and proofs cost milliseconds
   * instead of rehashing the whole log.
   */
  const tree = new MerkleTree();
  async function treeOfSize(size: number, tx?: Transaction): Promise<MerkleTree> {
    if (tree.size < size) {
      for (const leaf of await provenanceRepository.leafHashesBetween(tree.size, size, tx)) tree.append(leaf);
    }
    return tree;
  }

  async function headOf(size: number, tx: Transaction): Promise<SignedTreeHead> {
    const k = signingKey();
    const root = (await treeOfSize(size, tx)).root(size).toString('hex');
    return signTreeHead(k.privateKey, { treeSize: size, rootHash: root, timestamp: new Date().toISOString() }, k.keyId);
  }

  /**
   * Sequence what was written since the last head, then sign a head over it; the latest head.
   * Two transactions: the in-memory tree only ever takes leaves whose indexes are committed.
   */
  async function sequence(): Promise<SignedTreeHead> {
    const size = await db.transaction(async (tx) => {
      await provenanceRepository.lockSequencer(tx);
      return provenanceRepository.sequencePending(tx);
    });
    return db.transaction(async (tx) => {
      await provenanceRepository.lockSequencer(tx);
      const latest = await provenanceRepository.latestHead(tx);
      if (latest && Number(latest.treeSize) >= size) return headToDto(latest);
      const head = await headOf(size, tx);
      await provenanceRepository.saveHead(head, tx);
      return head;
    });
  }

  async function latestHead(): Promise<SignedTreeHead> {
    const latest = await provenanceRepository.latestHead();
    if (!latest || (await provenanceRepository.hasUnsequenced())) return sequence();
    return headToDto(latest);
  }

  async function proofFor(entry: ProvenanceEntry, treeSize?: number): Promise<InclusionProof | null> {
    if (entry.leafIndex === null) return null;
    const head = treeSize === undefined ? await latestHead() : await publishedHead(treeSize);
    if (entry.leafIndex >= head.treeSize) return null;
    const t = await treeOfSize(head.treeSize);
    return { leafIndex: entry.leafIndex, treeSize: head.treeSize, leafHash: entry.leafHash, auditPath: t.inclusionProof(entry.leafIndex, head.treeSize).map((h) => h.toString('hex')), head };
  }

  async function publishedHead(size: number): Promise<SignedTreeHead> {
    const h = await provenanceRepository.headOfSize(size);
    if (!h) throw errors.notFound(`A signed tree head of size ${size}`);
    return headToDto(h);
  }

  return {
    sequence,
    latestHead,

    key: (): SigningKey => signingKeyDescription(signingKey().publicKey),

    async entry(index: number, treeSize?: number): Promise<ProvenanceEntryWithProof> {
      await latestHead();
      const entry = await provenanceRepository.byLeafIndex(index);
      if (!entry) throw errors.notFound(`Log entry ${index}`);
      return { entry, proof: await proofFor(entry, treeSize) };
    },

    /** The verified-archive entry for a file's SHA-256 (what `localis verify` asks). */
    async byArchiveSha256(ctx: RequestContext, sha256: string, archiveIdOf: (sha: string) => Promise<string | null>): Promise<ProvenanceEntryWithProof> {
      const archiveId = await archiveIdOf(sha256);
      const entry = archiveId ? await provenanceRepository.bySubject('archive-verified', archiveId) : null;
      if (!entry) throw errors.notFound('A verified archive with this SHA-256 in the provenance log');
      await campaigns.findVisible(ctx, entry.campaignId);
      await latestHead();
      const fresh = (await provenanceRepository.bySubject('archive-verified', archiveId!))!;
      return { entry: fresh, proof: await proofFor(fresh) };
    },

    async consistency(from: number, to?: number): Promise<ConsistencyProof> {
      const second = to === undefined ? await latestHead() : await publishedHead(to);
      if (from > second.treeSize) throw errors.invalid(`The older head (size ${from}) is larger than the newer one (size ${second.treeSize}).`, [{ path: ['from'], message: `at most ${second.treeSize}` }]);
      const first = await publishedHead(from);
      const t = await treeOfSize(second.treeSize);
      const path = from === second.treeSize ? [] : t.consistencyProof(from, second.treeSize).map((h) => h.toString('hex'));
      return { firstSize: from, secondSize: second.treeSize, path, first, second };
    },

    async ofCampaign(ctx: RequestContext, campaignId: string, format: 'entries' | 'prov-json'): Promise<{ items: ProvenanceEntry[] } | object> {
      await campaigns.findVisible(ctx, campaignId);
      const items = await provenanceRepository.ofCampaign(campaignId);
      return format === 'prov-json' ? toProvJson(items.map((e) => e.record)) : { items };
    },
  };
}
export type ProvenanceService = ReturnType<typeof createProvenanceService>;
