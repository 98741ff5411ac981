import { Op, type InferCreationAttributes, type Transaction } from 'sequelize';
import type { Archive, ArchiveManifest, ArchiveProblem, ArchiveState } from '@localis/shared';
import { ArchiveRow, Person, ProvenanceEntryRow } from '../db/models';

export type ArchiveRecord = ArchiveRow;

const include = [
  { model: Person, as: 'uploadedBy', attributes: ['name'] },
  { model: Person, as: 'withdrawnBy', attributes: ['name'] },
];

const nameOf = (r: ArchiveRow, as: 'uploadedBy' | 'withdrawnBy') => (r as unknown as Record<string, { name: string } | null | undefined>)[as]?.name ?? null;
const iso = (d: Date | null) => (d ? d.toISOString() : null);

export function toArchiveDto(r: ArchiveRow, provenanceEntryId: string | null): Archive {
  return {
    id: r.id,
    campaignId: r.campaignId,
    kind: r.kind,
    fileName: r.fileName,
    format: r.format,
    sizeBytes: Number(r.sizeBytes),
    partSizeBytes: Number(r.partSizeBytes),
    partCount: r.partCount,
    declaredSha256: r.declaredSha256,
    state: r.state,
    problems: r.problems,
    runIds: r.runIds,
    manifest: r.manifest,
    uploadedByName: nameOf(r, 'uploadedBy'),
    createdAt: r.createdAt.toISOString(),
    receivedAt: iso(r.receivedAt),
    checkedAt: iso(r.checkedAt),
    withdrawnAt: iso(r.withdrawnAt),
    withdrawnReason: r.withdrawnReason,
    withdrawnByName: nameOf(r, 'withdrawnBy'),
    provenanceEntryId,
  };
}

/** The log entry ids of archives (verified ones have one). */
async function entryIdsOf(ids: string[], tx?: Transaction): Promise<Map<string, string>> {
  if (!ids.length) return new Map();
  const rows = await ProvenanceEntryRow.findAll({ attributes: ['id', 'subjectId'], where: { kind: 'archive-verified', subjectId: ids }, raw: true, transaction: tx });
  return new Map(rows.map((r) => [r.subjectId, String(r.id)]));
}

export const archivesRepository = {
  async create(values: Omit<InferCreationAttributes<ArchiveRow>, 'state' | 'problems' | 'checkAttempts' | 'createdAt' | 'updatedAt'>, tx: Transaction): Promise<ArchiveRow> {
    return ArchiveRow.create(values, { transaction: tx });
  },

  // Locks the archive row only (FOR UPDATE OF): the joined people are on the nullable side of an outer join.
  find: (id: string, tx?: Transaction, lock = false) => ArchiveRow.findByPk(id, { include, transaction: tx, lock: lock && tx ? { level: tx.LOCK.UPDATE, of: ArchiveRow } : undefined }),
  /** For the verification job: the row alone, locked. */
  findLocked: (id: string, tx: Transaction) => ArchiveRow.findByPk(id, { transaction: tx, lock: tx.LOCK.UPDATE }),

  async toDtos(rows: ArchiveRow[], tx?: Transaction): Promise<Archive[]> {
    const entries = await entryIdsOf(rows.filter((r) => r.state === 'verified').map((r) => r.id), tx);
    return rows.map((r) => toArchiveDto(r, entries.get(r.id) ?? null));
  },

  listOfCampaign: (campaignId: string) => ArchiveRow.findAll({ where: { campaignId }, include, order: [['createdAt', 'DESC']] }),

  /** The newest verified result archive with this SHA-256, for `localis verify`. */
  async verifiedIdBySha256(sha256: string): Promise<string | null> {
    const r = await ArchiveRow.findOne({ attributes: ['id'], where: { declaredSha256: sha256, state: 'verified' }, order: [['checkedAt', 'DESC']] });
    return r?.id ?? null;
  },

  async markReceived(id: string, sha256: string, tx: Transaction): Promise<void> {
    await ArchiveRow.update({ state: 'received', declaredSha256: sha256, uploadId: null, receivedAt: new Date() }, { where: { id, state: 'uploading' }, transaction: tx });
  },

  /** The job takes the archive: received (or a checking left by a crashed attempt) becomes checking. */
  async markChecking(id: string, tx: Transaction): Promise<void> {
    await ArchiveRow.update({ state: 'checking', checkAttempts: ArchiveRow.sequelize!.literal('check_attempts + 1') as unknown as number }, { where: { id, state: { [Op.in]: ['received', 'checking'] } }, transaction: tx });
  },

  /** An unfinished upload ends rejected with its reason (cancelled, or abandoned). */
  async endUpload(id: string, problem: ArchiveProblem, tx?: Transaction): Promise<number> {
    const [n] = await ArchiveRow.update({ state: 'rejected', problems: [problem], uploadId: null, checkedAt: new Date() }, { where: { id, state: 'uploading' }, transaction: tx });
    return n;
  },

  /** Uploads started before `before` and never completed. */
  staleUploads: (before: Date) => ArchiveRow.findAll({ where: { state: 'uploading', createdAt: { [Op.lt]: before } }, limit: 500 }),

  async renewCheckLease(id: string): Promise<void> {
    await ArchiveRow.sequelize!.query("UPDATE archives SET updated_at = now() WHERE id = :id AND state = 'checking'", { replacements: { id } });
  },

  /** A check that failed for want of the store hands the archive back (the job retries). */
  async releaseCheck(id: string): Promise<void> {
    await ArchiveRow.update({ state: 'received' }, { where: { id, state: 'checking' } });
  },

  async markChecked(id: string, outcome: { state: Extract<ArchiveState, 'verified' | 'rejected'>; problems: ArchiveProblem[]; manifest: ArchiveManifest | null; points: unknown[] | null }, tx: Transaction): Promise<void> {
    await ArchiveRow.update({ ...outcome, checkedAt: new Date() }, { where: { id, state: 'checking' }, transaction: tx });
  },

  async withdraw(id: string, reason: string, personId: string | null, tx: Transaction): Promise<void> {
    await ArchiveRow.update({ withdrawnAt: new Date(), withdrawnReason: reason, withdrawnByPersonId: personId }, { where: { id, withdrawnAt: { [Op.is]: null } }, transaction: tx });
  },

  /** Run ids of a campaign among `ids`. */
  async runIdsOfCampaign(campaignId: string, ids: string[], tx?: Transaction): Promise<Set<string>> {
    if (!ids.length) return new Set();
    const rows = (await ArchiveRow.sequelize!.query('SELECT id FROM runs WHERE campaign_id = :campaignId AND id = ANY(:ids::uuid[])', {
      replacements: { campaignId, ids: `{${ids.join(',')}}` },
      transaction: tx,
      type: 'SELECT',
    })) as { id: string }[];
    return new Set(rows.map((r) => r.id));
  },
};
