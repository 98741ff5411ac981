import { Op, literal, type Transaction, type WhereOptions } from 'sequelize';
import { parseSort, roundStatus, type Page, type Round as RoundDto, type RoundListQuery, type RoundPool as PoolDto } from '@localis/shared';
import { Campaign, Round, RoundPool } from '../db/models';

function toDto(r: Round, campaignCount: number, now = new Date()): RoundDto {
  const pools: PoolDto[] = (r.pools ?? []).map((p) => ({ machine: p.machine, coreHours: Number(p.coreHours) })).sort((a, b) => a.machine.localeCompare(b.machine));
  const opensAt = r.opensAt.toISOString();
  const closesAt = r.closesAt.toISOString();
  return {
    id: r.id,
    name: r.name,
    opensAt,
    closesAt,
    allocationEndsAt: r.allocationEndsAt.toISOString(),
    overdraftPercent: r.overdraftPercent,
    status: roundStatus({ opensAt, closesAt }, now),
    pools,
    totalCoreHours: pools.reduce((s, p) => s + p.coreHours, 0),
    campaignCount,
    createdAt: r.createdAt.toISOString(),
  };
}

/** Campaigns submitted to each round: drafts are their groups' business, not every reader's. */
async function campaignCounts(ids: string[], tx?: Transaction): Promise<Map<string, number>> {
  if (!ids.length) return new Map();
  const rows = (await Campaign.count({ where: { roundId: ids, submittedAt: { [Op.ne]: null } }, group: ['roundId'], transaction: tx })) as unknown as { roundId: string; count: number }[];
  return new Map(rows.map((r) => [r.roundId, Number(r.count)]));
}

const include = [{ model: RoundPool, as: 'pools' }];

export const roundsRepository = {
  async list(q: RoundListQuery): Promise<Page<RoundDto>> {
    const and: WhereOptions<any>[] = [];
    if (q.q) and.push({ name: { [Op.iLike]: `%${q.q.replace(/[\\%_]/g, '\\$&')}%` } });
    if (q.status === 'upcoming') and.push({ opensAt: { [Op.gt]: literal('now()') } });
    if (q.status === 'open') and.push({ opensAt: { [Op.lte]: literal('now()') }, closesAt: { [Op.gte]: literal('now()') } });
    if (q.status === 'closed') and.push({ closesAt: { [Op.lt]: literal('now()') } });
    const { field, direction } = parseSort(q.sort);
    // Pools are fetched apart so the count and the page are of rounds, not of round × pool rows.
    const { rows, count } = await Round.findAndCountAll({ where: and.length ? { [Op.and]: and } : {}, order: [[field, direction], ['id', 'ASC']], limit: q.limit, offset: q.offset });
    const pools = await RoundPool.findAll({ where: { roundId: rows.map((r) => r.id) } });
    for (const r of rows) r.pools = pools.filter((p) => p.roundId === r.id);
    const counts = await campaignCounts(rows.map((r) => r.id));
    return { items: rows.map((r) => toDto(r, counts.get(r.id) ?? 0)), total: count, limit: q.limit, offset: q.offset };
  },

  /** What the ledger needs of a round on every charge, in one small query. */
  async policy(id: string, tx?: Transaction): Promise<{ name: string; allocationEndsAt: string; overdraftPercent: number } | null> {
    const r = await Round.findByPk(id, { attributes: ['name', 'allocationEndsAt', 'overdraftPercent'], transaction: tx });
    return r ? { name: r.name, allocationEndsAt: r.allocationEndsAt.toISOString(), overdraftPercent: r.overdraftPercent } : null;
  },

  async find(id: string, tx?: Transaction, lock: 'update' | 'share' | false = false): Promise<RoundDto | null> {
    const r = await Round.findByPk(id, { transaction: tx, lock: lock && tx ? (lock === 'share' ? tx.LOCK.SHARE : tx.LOCK.UPDATE) : undefined });
    if (!r) return null;
    r.pools = await RoundPool.findAll({ where: { roundId: id }, transaction: tx });
    return toDto(r, (await campaignCounts([id], tx)).get(id) ?? 0);
  },

  async create(input: { id?: string; name: string; opensAt: string; closesAt: string; allocationEndsAt: string; overdraftPercent: number }, tx: Transaction): Promise<string> {
    return (
      await Round.create(
        { id: input.id, name: input.name, opensAt: new Date(input.opensAt), closesAt: new Date(input.closesAt), allocationEndsAt: new Date(input.allocationEndsAt), overdraftPercent: input.overdraftPercent },
        { transaction: tx },
      )
    ).id;
  },

  async update(id: string, patch: { name?: string; opensAt?: string; closesAt?: string; allocationEndsAt?: string; overdraftPercent?: number }, tx: Transaction): Promise<void> {
    const values: Record<string, unknown> = {};
    if (patch.name !== undefined) values.name = patch.name;
    if (patch.opensAt !== undefined) values.opensAt = new Date(patch.opensAt);
    if (patch.closesAt !== undefined) {
      values.closesAt = new Date(patch.closesAt);
      // A new closing date deserves its own "closes in 14 days" notice.
      values.closingNoticeSentAt = null;
    }
    if (patch.allocationEndsAt !== undefined) values.allocationEndsAt = new Date(patch.allocationEndsAt);
    if (patch.overdraftPercent !== undefined) values.overdraftPercent = patch.overdraftPercent;
    if (Object.keys(values).length) await Round.update(values, { where: { id }, transaction: tx });
  },

  /** Machines of the round that campaigns draw on: their pools cannot be removed. */
  async machinesInUse(roundId: string, tx: Transaction): Promise<string[]> {
    const rows = await Campaign.findAll({ attributes: ['machine'], where: { roundId }, group: ['machine'], transaction: tx });
    return rows.map((r) => r.machine);
  },

  async replacePools(roundId: string, pools: PoolDto[], tx: Transaction): Promise<void> {
    const keep = pools.map((p) => p.machine);
    await RoundPool.destroy({ where: { roundId, ...(keep.length ? { machine: { [Op.notIn]: keep } } : {}) }, transaction: tx });
    for (const p of pools) await RoundPool.upsert({ roundId, machine: p.machine, coreHours: p.coreHours }, { transaction: tx });
  },
};
