import { randomUUID } from 'node:crypto';
import { Op, type Transaction, type WhereOptions } from 'sequelize';
import { fromMilli, parseSort, type Page, type Run as RunDto, type RunInput, type RunListQuery } from '@localis/shared';
import { LedgerEntry, Person, Run } from '../db/models';

export interface NewRun extends Omit<RunInput, 'coreHours'> {
  campaignId: string;
  milli: number;
  source: RunDto['source'];
  recordedByPersonId: string | null;
}

function toDto(r: Run, refundedMilli: number): RunDto {
  return {
    id: r.id,
    campaignId: r.campaignId,
    externalJobId: r.externalJobId,
    machine: r.machine,
    startedAt: r.startedAt.toISOString(),
    endedAt: r.endedAt.toISOString(),
    cores: r.cores,
    coreHours: fromMilli(Number(r.coreHoursMilli)),
    refundedCoreHours: fromMilli(refundedMilli),
    codeName: r.codeName,
    codeVersion: r.codeVersion,
    parameters: r.parameters,
    source: r.source,
    recordedByName: (r as unknown as { recordedBy?: { name: string } | null }).recordedBy?.name ?? null,
    createdAt: r.createdAt.toISOString(),
  };
}

async function refundsOf(runIds: string[], tx?: Transaction): Promise<Map<string, number>> {
  if (!runIds.length) return new Map();
  const rows = (await LedgerEntry.findAll({
    attributes: ['runId', [LedgerEntry.sequelize!.fn('sum', LedgerEntry.sequelize!.col('milli')), 'refunded']],
    where: { runId: runIds, kind: 'refund' },
    group: ['runId'],
    raw: true,
    transaction: tx,
  })) as unknown as { runId: string; refunded: string }[];
  return new Map(rows.map((r) => [r.runId, Number(r.refunded)]));
}

const SORT_COLUMNS: Record<string, string> = { coreHours: 'coreHoursMilli' };

export const runsRepository = {
  async create(run: NewRun, tx: Transaction): Promise<string> {
    const row = await Run.create(
      {
        campaignId: run.campaignId,
        externalJobId: run.externalJobId,
        machine: run.machine,
        startedAt: new Date(run.startedAt),
        endedAt: new Date(run.endedAt),
        cores: run.cores,
        coreHoursMilli: run.milli,
        codeName: run.codeName,
        codeVersion: run.codeVersion,
        parameters: run.parameters,
        source: run.source,
        recordedByPersonId: run.recordedByPersonId,
      },
      { transaction: tx },
    );
    return row.id;
  },

  /** Many runs in one statement (an import); ids are made here so the debits can name them. */
  async createMany(runs: NewRun[], tx: Transaction): Promise<string[]> {
    const rows = runs.map((run) => ({
      id: randomUUID(), campaignId: run.campaignId, externalJobId: run.externalJobId, machine: run.machine, startedAt: new Date(run.startedAt), endedAt: new Date(run.endedAt),
      cores: run.cores, coreHoursMilli: run.milli, codeName: run.codeName, codeVersion: run.codeVersion, parameters: run.parameters, source: run.source, recordedByPersonId: run.recordedByPersonId,
    }));
    await Run.bulkCreate(rows, { transaction: tx });
    return rows.map((r) => r.id);
  },

  async find(id: string, tx?: Transaction): Promise<RunDto | null> {
    const r = await Run.findByPk(id, { include: [{ model: Person, as: 'recordedBy', attributes: ['name'] }], transaction: tx });
    return r ? toDto(r, (await refundsOf([r.id], tx)).get(r.id) ?? 0) : null;
  },

  /** The campaign that already has this machine's job, if any. */
  async findJob(machine: string, externalJobId: string, tx?: Transaction): Promise<{ id: string; campaignId: string } | null> {
    const r = await Run.findOne({ where: { machine, externalJobId }, attributes: ['id', 'campaignId'], transaction: tx });
    return r ? { id: r.id, campaignId: r.campaignId } : null;
  },

  /** Which of these job ids are already recorded on the machine. */
  async recordedJobIds(machine: string, jobIds: string[], tx?: Transaction): Promise<Set<string>> {
    if (!jobIds.length) return new Set();
    const rows = await Run.findAll({ where: { machine, externalJobId: jobIds }, attributes: ['externalJobId'], transaction: tx });
    return new Set(rows.map((r) => r.externalJobId));
  },

  async list(campaignId: string, q: RunListQuery): Promise<Page<RunDto>> {
    const and: WhereOptions<any>[] = [{ campaignId }];
    if (q.q) {
      const pattern = `%${q.q.replace(/[\\%_]/g, '\\$&')}%`;
      and.push({ [Op.or]: [{ externalJobId: { [Op.iLike]: pattern } }, { codeName: { [Op.iLike]: pattern } }, { codeVersion: { [Op.iLike]: pattern } }] });
    }
    if (q.codeName) and.push({ codeName: q.codeName });
    if (q.from) and.push({ startedAt: { [Op.gte]: new Date(q.from) } });
    if (q.to) and.push({ startedAt: { [Op.lt]: new Date(q.to) } });
    const { field, direction } = parseSort(q.sort);
    const where = { [Op.and]: and };
    const [rows, total] = await Promise.all([
      Run.findAll({ where, include: [{ model: Person, as: 'recordedBy', attributes: ['name'] }], order: [[SORT_COLUMNS[field] ?? field, direction], ['id', 'ASC']], limit: q.limit, offset: q.offset }),
      Run.count({ where }),
    ]);
    const refunds = await refundsOf(rows.map((r) => r.id));
    return { items: rows.map((r) => toDto(r, refunds.get(r.id) ?? 0)), total, limit: q.limit, offset: q.offset };
  },
};
