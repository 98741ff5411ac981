import { Op, type Transaction } from 'sequelize';
import type { Analysis, AnalysisRequest, ScalingAnalysis } from '@localis/shared';
import { AnalysisRow, ArchiveRow, Person } from '../db/models';

const include = [{ model: Person, as: 'requestedBy', attributes: ['name'] }];
const iso = (d: Date | null) => (d ? d.toISOString() : null);

export function toAnalysisDto(r: AnalysisRow): Analysis {
  return {
    id: r.id,
    campaignId: r.campaignId,
    state: r.state,
    request: r.request as AnalysisRequest,
    progress: r.progress,
    archiveIds: r.archiveIds,
    points: r.points,
    result: r.result as unknown as ScalingAnalysis | null,
    error: r.error,
    requestedByName: (r as unknown as { requestedBy?: { name: string } | null }).requestedBy?.name ?? null,
    createdAt: r.createdAt.toISOString(),
    startedAt: iso(r.startedAt),
    finishedAt: iso(r.finishedAt),
  };
}

export interface StoredPoint {
  kind: 'lambda' | 'g';
  L: number;
  W: number;
  E: number;
  value: number;
  err: number;
}

export const analysesRepository = {
  create: (values: { campaignId: string; request: AnalysisRequest; requestedByPersonId: string | null }, tx: Transaction) =>
    AnalysisRow.create({ ...values, progress: null, archiveIds: [], result: null, error: null, startedAt: null, finishedAt: null }, { transaction: tx }),
  find: (id: string, tx?: Transaction) => AnalysisRow.findByPk(id, { include, transaction: tx }),
  findLocked: (id: string, tx: Transaction) => AnalysisRow.findByPk(id, { transaction: tx, lock: tx.LOCK.UPDATE }),
  listOfCampaign: (campaignId: string) => AnalysisRow.findAll({ where: { campaignId }, include, order: [['createdAt', 'DESC']], limit: 100 }),
  /** A queued automatic analysis already waiting: another verified archive joins it instead of queuing a second. */
  queuedAutomatic: (campaignId: string, tx: Transaction) => AnalysisRow.findOne({ where: { campaignId, state: 'queued', requestedByPersonId: { [Op.is]: null } }, transaction: tx }),

  /** The table points of a campaign's verified, not withdrawn result archives. */
  async pointsOfCampaign(campaignId: string): Promise<{ archives: { id: string; fileName: string }[]; points: StoredPoint[] }> {
    const rows = await ArchiveRow.findAll({
      attributes: ['id', 'fileName', 'points'],
      where: { campaignId, kind: 'results', state: 'verified', withdrawnAt: { [Op.is]: null }, points: { [Op.ne]: null } },
      order: [['checkedAt', 'ASC']],
    });
    return { archives: rows.map((r) => ({ id: r.id, fileName: r.fileName })), points: rows.flatMap((r) => (r.points ?? []) as StoredPoint[]) };
  },

  async resolveRequest(id: string, request: AnalysisRequest): Promise<void> {
    await AnalysisRow.update({ request }, { where: { id, state: 'running' } });
  },

  /** A run that failed for want of the database hands the analysis back for the job's retry. */
  async requeue(id: string): Promise<void> {
    await AnalysisRow.update({ state: 'queued', progress: null }, { where: { id, state: 'running' } });
  },

  async setProgress(id: string, progress: { done: number; total: number }): Promise<void> {
    await AnalysisRow.update({ progress }, { where: { id, state: 'running' } });
  },
};
