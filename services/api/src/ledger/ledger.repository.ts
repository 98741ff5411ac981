import { QueryTypes, type Transaction } from 'sequelize';
import { balancesOf, fromMilli, type Balances, type LedgerEntry as EntryDto, type LedgerKind, type PoolUsage } from '@localis/shared';
import { LedgerEntry, UsageAlert } from '../db/models';

export interface NewEntry {
  campaignId: string;
  kind: LedgerKind;
  milli: number;
  runId?: string | null;
  counterpartCampaignId?: string | null;
  reason?: string | null;
  overdraft?: boolean;
  actorPersonId: string | null;
}

const q = <T extends object>(sql: string, replacements: Record<string, unknown>, tx?: Transaction) =>
  LedgerEntry.sequelize!.query<T>(sql, { replacements, type: QueryTypes.SELECT, transaction: tx });

/** Sums per kind of one campaign's entries, read in SQL so a balance costs one indexed scan. */
async function sumsByKind(campaignIds: string[], tx?: Transaction): Promise<Map<string, Balances>> {
  const rows = campaignIds.length
    ? await q<{ campaign_id: string; kind: LedgerKind; milli: string }>(
        'SELECT campaign_id, kind, sum(milli)::text AS milli FROM ledger_entries WHERE campaign_id IN (:ids) GROUP BY campaign_id, kind',
        { ids: campaignIds },
        tx,
      )
    : [];
  const out = new Map<string, Balances>();
  for (const id of campaignIds) out.set(id, balancesOf(rows.filter((r) => r.campaign_id === id).map((r) => ({ kind: r.kind, milli: Number(r.milli) }))));
  return out;
}

export const ledgerRepository = {
  async balances(campaignId: string, tx?: Transaction): Promise<Balances> {
    return (await sumsByKind([campaignId], tx)).get(campaignId)!;
  },

  balancesOfMany: sumsByKind,

  async append(entry: NewEntry, tx: Transaction): Promise<string> {
    const row = await LedgerEntry.create(
      {
        campaignId: entry.campaignId,
        kind: entry.kind,
        milli: entry.milli,
        runId: entry.runId ?? null,
        counterpartCampaignId: entry.counterpartCampaignId ?? null,
        reason: entry.reason ?? null,
        overdraft: entry.overdraft ?? false,
        actorPersonId: entry.actorPersonId,
      },
      { transaction: tx },
    );
    return String(row.id);
  },

  /** Many entries in one statement (an import's debits). */
  async appendMany(entries: NewEntry[], tx: Transaction): Promise<void> {
    await LedgerEntry.bulkCreate(
      entries.map((e) => ({
        campaignId: e.campaignId, kind: e.kind, milli: e.milli, runId: e.runId ?? null, counterpartCampaignId: e.counterpartCampaignId ?? null,
        reason: e.reason ?? null, overdraft: e.overdraft ?? false, actorPersonId: e.actorPersonId,
      })),
      { transaction: tx },
    );
  },

  /**
   * Every entry of a campaign, oldest first, with the balance after each. One SQL statement with
   * a running sum: a busy campaign has thousands of entries, and building model instances with
   * three joins each cost seconds (npm run bench).
   */
  async entries(campaignId: string, tx?: Transaction, onlyEntryId?: string): Promise<EntryDto[]> {
    const rows = await q<{
      id: string; campaign_id: string; kind: LedgerKind; milli: string; balance: string; run_id: string | null; external_job_id: string | null;
      counterpart_campaign_id: string | null; counterpart_title: string | null; reason: string | null; overdraft: boolean; actor_name: string | null; created_at: Date;
    }>(
      `SELECT * FROM (SELECT e.id::text, e.campaign_id, e.kind, e.milli::text, (sum(e.milli) OVER (ORDER BY e.id))::text AS balance,
              e.run_id, r.external_job_id, e.counterpart_campaign_id, c.title AS counterpart_title, e.reason, e.overdraft,
              p.name AS actor_name, e.created_at
         FROM ledger_entries e
         LEFT JOIN runs r ON r.id = e.run_id
         LEFT JOIN campaigns c ON c.id = e.counterpart_campaign_id
         LEFT JOIN people p ON p.id = e.actor_person_id
        WHERE e.campaign_id = :campaignId) AS ledger
        ${onlyEntryId ? 'WHERE ledger.id = :onlyEntryId' : ''}
        ORDER BY ledger.id::bigint`,
      { campaignId, onlyEntryId: onlyEntryId ?? null },
      tx,
    );
    return rows.map((r) => ({
      id: r.id,
      campaignId: r.campaign_id,
      kind: r.kind,
      coreHours: fromMilli(Number(r.milli)),
      balanceAfter: fromMilli(Number(r.balance)),
      runId: r.run_id,
      externalJobId: r.external_job_id,
      counterpartCampaignId: r.counterpart_campaign_id,
      counterpartTitle: r.counterpart_title,
      reason: r.reason,
      overdraft: r.overdraft,
      actorName: r.actor_name,
      createdAt: new Date(r.created_at).toISOString(),
    }));
  },

  async find(id: string, tx?: Transaction): Promise<EntryDto | null> {
    const row = await LedgerEntry.findByPk(id, { transaction: tx });
    if (!row) return null;
    // The balance after it needs the entries before it; the sum runs in SQL, one row comes back.
    return (await this.entries(row.campaignId, tx, String(row.id)))[0] ?? null;
  },

  /** Milli-core-hours debited for a run less what was refunded of it. */
  async runNetDebit(runId: string, tx?: Transaction): Promise<number> {
    const [row] = await q<{ milli: string | null }>('SELECT sum(milli)::text AS milli FROM ledger_entries WHERE run_id = :runId', { runId }, tx);
    return -Number(row?.milli ?? 0);
  },

  async alertedThresholds(campaignId: string, tx?: Transaction): Promise<number[]> {
    return (await UsageAlert.findAll({ where: { campaignId }, order: [['threshold', 'ASC']], transaction: tx })).map((a) => a.threshold);
  },

  /** Record a threshold as alerted; false if it already was (so the alert goes out once). */
  async markAlerted(campaignId: string, threshold: number, tx: Transaction): Promise<boolean> {
    const [, created] = await UsageAlert.findOrCreate({ where: { campaignId, threshold }, defaults: { campaignId, threshold }, transaction: tx });
    return created;
  },

  /**
   * Lock a round's pool on a machine and read what its campaigns were granted (grants,
   * adjustments and transfers, which all count against the pool), by group.
   */
  async poolUsage(roundId: string, machine: string, tx?: Transaction, lock = false): Promise<PoolUsage | null> {
    const [pool] = await q<{ core_hours: string }>(
      `SELECT core_hours::text FROM round_pools WHERE round_id = :roundId AND machine = :machine${lock && tx ? ' FOR NO KEY UPDATE' : ''}`,
      { roundId, machine },
      tx,
    );
    if (!pool) return null;
    const groups = await q<{ group_id: string; group_name: string; granted: string; used: string; expired: string }>(
      `SELECT c.group_id, g.name AS group_name,
              coalesce(sum(e.milli) FILTER (WHERE e.kind IN ('grant', 'adjustment', 'transfer')), 0)::text AS granted,
              coalesce(-sum(e.milli) FILTER (WHERE e.kind IN ('debit', 'refund')), 0)::text AS used,
              coalesce(-sum(e.milli) FILTER (WHERE e.kind = 'expiry'), 0)::text AS expired
         FROM campaigns c
         JOIN research_groups g ON g.id = c.group_id
         JOIN ledger_entries e ON e.campaign_id = c.id
        WHERE c.round_id = :roundId AND c.machine = :machine
        GROUP BY c.group_id, g.name
        ORDER BY g.name`,
      { roundId, machine },
      tx,
    );
    const byGroup = groups.map((g) => {
      const granted = Number(g.granted);
      const used = Number(g.used);
      return { groupId: g.group_id, groupName: g.group_name, granted: fromMilli(granted), used: fromMilli(used), remaining: fromMilli(granted - used - Number(g.expired)), grantedMilli: granted };
    });
    const grantedMilli = byGroup.reduce((s, g) => s + g.grantedMilli, 0);
    const poolMilli = Number(pool.core_hours) * 1000;
    const used = byGroup.reduce((s, g) => s + g.used, 0);
    const remaining = byGroup.reduce((s, g) => s + g.remaining, 0);
    return {
      roundId,
      machine,
      pool: fromMilli(poolMilli),
      granted: fromMilli(grantedMilli),
      used: Math.round(used * 1000) / 1000,
      remaining: Math.round(remaining * 1000) / 1000,
      unallocated: fromMilli(poolMilli - grantedMilli),
      groups: byGroup.map(({ grantedMilli: _g, ...g }) => g),
    };
  },

  /**
   * Campaigns of rounds whose allocation period has ended that still hold core-hours (a refund
   * after an earlier expiry included): used-up ones are not visited again.
   */
  async campaignsToExpire(now: Date, tx?: Transaction): Promise<string[]> {
    const rows = await q<{ id: string }>(
      `SELECT c.id FROM campaigns c JOIN rounds r ON r.id = c.round_id JOIN ledger_entries e ON e.campaign_id = c.id
        WHERE r.allocation_ends_at <= :now AND c.state IN ('granted', 'partly-granted')
        GROUP BY c.id HAVING sum(e.milli) > 0`,
      { now },
      tx,
    );
    return rows.map((r) => r.id);
  },


  /** Lock every pool of a round (in machine order, the order grants lock them in too). */
  async lockPools(roundId: string, tx: Transaction): Promise<void> {
    await q('SELECT machine FROM round_pools WHERE round_id = :roundId ORDER BY machine FOR NO KEY UPDATE', { roundId }, tx);
  },

  /** Granted milli-core-hours per machine of a round, to refuse shrinking a pool below them. */
  async grantedPerMachine(roundId: string, tx?: Transaction): Promise<Map<string, number>> {
    const rows = await q<{ machine: string; granted: string }>(
      `SELECT c.machine, coalesce(sum(e.milli), 0)::text AS granted FROM campaigns c JOIN ledger_entries e ON e.campaign_id = c.id
        WHERE c.round_id = :roundId AND e.kind IN ('grant', 'adjustment', 'transfer') GROUP BY c.machine`,
      { roundId },
      tx,
    );
    return new Map(rows.map((r) => [r.machine, Number(r.granted)]));
  },
};
