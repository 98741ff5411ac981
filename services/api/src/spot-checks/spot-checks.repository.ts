import type { Transaction } from 'sequelize';
import type { SpotCheck, SpotCheckRow } from '@localis/shared';
import { ArchiveRow, Campaign, SpotCheckRecord } from '../db/models';
import type { StoredPoint } from '../analyses/analyses.repository';

const include = [{ model: ArchiveRow, as: 'archive', attributes: ['fileName'] }];
const iso = (d: Date | null) => (d ? d.toISOString() : null);

export function toSpotCheckDto(r: SpotCheckRecord): SpotCheck {
  return {
    id: r.id,
    campaignId: r.campaignId,
    archiveId: r.archiveId,
    archiveFileName: r.archive?.fileName ?? '',
    state: r.state,
    progress: r.progress,
    rows: r.rows,
    flagged: r.flagged,
    reason: r.reason,
    createdAt: r.createdAt.toISOString(),
    startedAt: iso(r.startedAt),
    finishedAt: iso(r.finishedAt),
  };
}

export const spotChecksRepository = {
  /** One spot-check per archive: a second verification of the same archive (a retried job) adds none. */
  async createOnce(values: { archiveId: string; campaignId: string }, tx: Transaction): Promise<SpotCheckRecord | null> {
    const existing = await SpotCheckRecord.findOne({ where: { archiveId: values.archiveId }, transaction: tx });
    if (existing) return null;
    return SpotCheckRecord.create({ ...values, progress: null, reason: null, startedAt: null, finishedAt: null }, { transaction: tx });
  },
  find: (id: string, tx?: Transaction) => SpotCheckRecord.findByPk(id, { include, transaction: tx }),
  findLocked: (id: string, tx: Transaction) => SpotCheckRecord.findByPk(id, { transaction: tx, lock: tx.LOCK.UPDATE }),
  listOfCampaign: (campaignId: string) => SpotCheckRecord.findAll({ where: { campaignId }, include, order: [['createdAt', 'DESC']], limit: 200 }),

  /** What the runner needs: the archive's Lambda points and the campaign's model. */
  async subjectOf(spotCheck: SpotCheckRecord): Promise<{ fileName: string; points: StoredPoint[]; campaign: { model: string; dimension: number; symmetryClass: string } }> {
    const [archive, campaign] = await Promise.all([ArchiveRow.findByPk(spotCheck.archiveId, { attributes: ['fileName', 'points'] }), Campaign.findByPk(spotCheck.campaignId, { attributes: ['spec', 'dimension', 'symmetryClass'] })]);
    if (!archive || !campaign) throw new Error(`spot-check ${spotCheck.id}: its archive or campaign is gone`);
    return {
      fileName: archive.fileName,
      points: (archive.points ?? []) as StoredPoint[],
      campaign: { model: campaign.spec.model, dimension: campaign.dimension, symmetryClass: campaign.symmetryClass },
    };
  },

  async setProgress(id: string, progress: { done: number; total: number }): Promise<void> {
    await SpotCheckRecord.update({ progress }, { where: { id, state: 'running' } });
  },

  /** A run that died for want of the database or the thread hands the spot-check back for the job's retry. */
  async requeue(id: string): Promise<void> {
    await SpotCheckRecord.update({ state: 'queued', progress: null }, { where: { id, state: 'running' } });
  },

  rowsOf: (r: SpotCheckRecord): SpotCheckRow[] => r.rows,
};
