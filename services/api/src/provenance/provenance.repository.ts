import { Op, QueryTypes, type Transaction } from 'sequelize';
import { ProvenanceRecord, type ProvenanceEntry, type SignedTreeHead } from '@localis/shared';
import { ProvenanceEntryRow, ProvenanceTreeHeadRow } from '../db/models';

export interface NewProvenanceEntry {
  kind: ProvenanceEntry['kind'];
  campaignId: string;
  subjectId: string;
  content: string;
  leafHash: Buffer;
}

const toDto = (r: ProvenanceEntryRow): ProvenanceEntry => ({
  id: String(r.id),
  leafIndex: r.leafIndex === null ? null : Number(r.leafIndex),
  kind: r.kind as ProvenanceEntry['kind'],
  campaignId: r.campaignId,
  subjectId: r.subjectId,
  record: ProvenanceRecord.parse(JSON.parse(r.content)),
  content: r.content,
  leafHash: r.leafHash.toString('hex'),
  createdAt: r.createdAt.toISOString(),
});

export const headToDto = (h: ProvenanceTreeHeadRow): SignedTreeHead => ({
  treeSize: Number(h.treeSize),
  rootHash: h.rootHash.toString('hex'),
  timestamp: h.signedAt.toISOString(),
  keyId: h.keyId,
  signature: h.signature,
});

/** Locks the sequencer: one at a time across api and worker processes. */
const SEQUENCER_LOCK = 740_211;

export const provenanceRepository = {
  /** Idempotent: an entry for the same kind and subject is written once. */
  async appendMany(entries: NewProvenanceEntry[], tx: Transaction): Promise<void> {
    if (!entries.length) return;
    await ProvenanceEntryRow.bulkCreate(
      entries.map((e) => ({ ...e, leafIndex: null, sequencedAt: null })),
      { transaction: tx, ignoreDuplicates: true },
    );
  },

  async lockSequencer(tx: Transaction): Promise<void> {
    await ProvenanceEntryRow.sequelize!.query('SELECT pg_advisory_xact_lock(:key)', { replacements: { key: SEQUENCER_LOCK }, transaction: tx });
  },

  async hasUnsequenced(tx?: Transaction): Promise<boolean> {
    return (await ProvenanceEntryRow.findOne({ attributes: ['id'], where: { leafIndex: { [Op.is]: null } }, transaction: tx })) !== null;
  },

  /** Gives unsequenced entries the next leaf indexes in the order they were written; the new tree size. */
  async sequencePending(tx: Transaction, limit = 50_000): Promise<number> {
    const [row] = await ProvenanceEntryRow.sequelize!.query<{ size: string }>(
      `WITH next AS (SELECT coalesce(max(leaf_index) + 1, 0) AS base FROM provenance_entries),
            pending AS (SELECT id, row_number() OVER (ORDER BY id) - 1 AS n FROM provenance_entries WHERE leaf_index IS NULL ORDER BY id LIMIT :limit),
            done AS (
              UPDATE provenance_entries e SET leaf_index = next.base + pending.n, sequenced_at = now()
              FROM pending, next WHERE e.id = pending.id RETURNING e.leaf_index)
       SELECT greatest((SELECT coalesce(max(leaf_index) + 1, 0) FROM done), (SELECT base FROM next)) AS size`,
      { type: QueryTypes.SELECT, replacements: { limit }, transaction: tx },
    );
    return Number(row.size);
  },

  /** Leaf hashes from..to-1 in order. */
  async leafHashesBetween(from: number, to: number, tx?: Transaction): Promise<Buffer[]> {
    if (to <= from) return [];
    const rows = await ProvenanceEntryRow.findAll({ attributes: ['leafHash'], where: { leafIndex: { [Op.gte]: from, [Op.lt]: to } }, order: [['leafIndex', 'ASC']], raw: true, transaction: tx });
    if (rows.length !== to - from) throw new Error(`provenance log: expected ${to - from} leaves from ${from}, found ${rows.length}`);
    return rows.map((r) => r.leafHash);
  },

  latestHead: (tx?: Transaction) => ProvenanceTreeHeadRow.findOne({ order: [['treeSize', 'DESC']], transaction: tx }),
  headOfSize: (size: number, tx?: Transaction) => ProvenanceTreeHeadRow.findByPk(size, { transaction: tx }),
  async saveHead(h: SignedTreeHead, tx: Transaction): Promise<void> {
    await ProvenanceTreeHeadRow.create({ treeSize: h.treeSize, rootHash: Buffer.from(h.rootHash, 'hex'), signedAt: new Date(h.timestamp), keyId: h.keyId, signature: h.signature }, { transaction: tx });
  },

  async byLeafIndex(index: number): Promise<ProvenanceEntry | null> {
    const r = await ProvenanceEntryRow.findOne({ where: { leafIndex: index } });
    return r && toDto(r);
  },
  async bySubject(kind: ProvenanceEntry['kind'], subjectId: string): Promise<ProvenanceEntry | null> {
    const r = await ProvenanceEntryRow.findOne({ where: { kind, subjectId } });
    return r && toDto(r);
  },
  async ofCampaign(campaignId: string): Promise<ProvenanceEntry[]> {
    return (await ProvenanceEntryRow.findAll({ where: { campaignId }, order: [['id', 'ASC']] })).map(toDto);
  },
};
