import type { Transaction } from 'sequelize';
import {
  errors,
  formatCoreHours,
  fromMilli,
  judgeDebit,
  overdraftAllowance,
  thresholdsReached,
  toMilli,
  type AdjustmentInput,
  type Balances,
  type Ledger,
  type LedgerEntry,
  type RefundInput,
  type RoundUsage,
  type TransferInput,
} from '@localis/shared';
import type { Database } from '../db';
import type { RequestContext } from '../http/principal';
import { actsAsAdmin } from '../http/acts-as-admin';
import { auditService } from '../audit/audit.service';
import type { CampaignRecord } from '../campaigns/campaigns.repository';
import type { CampaignsService } from '../campaigns/campaigns.service';
import { notify } from '../notifications/notify';
import { roundsRepository } from '../rounds/rounds.repository';
import { runsRepository } from '../runs/runs.repository';
import { ledgerRepository } from './ledger.repository';

const isGranted = (c: CampaignRecord) => c.state === 'granted' || c.state === 'partly-granted';
const actorOf = (ctx: RequestContext) => (ctx.principal && ctx.principal.via !== 'system' ? ctx.principal.personId : null);
const ch = (milli: number) => `${formatCoreHours(milli)} core-hours`;

function requireGranted(c: CampaignRecord, what: string): void {
  if (!isGranted(c)) throw errors.conflict(`"${c.title}" is ${c.state.replace('-', ' ')}, not granted; ${what} only a granted campaign.`);
}

/**
 * The core-hour ledger: append-only entries, balances derived from them. Every write locks the
 * campaign row first (and the round's pool where the pool is touched), so concurrent writes to
 * one grant queue up and can never overdraw it; different campaigns do not wait for each other.
 */
export function createLedgerService(db: Database, campaigns: CampaignsService) {
  async function roundOf(c: CampaignRecord, tx?: Transaction) {
    const round = await roundsRepository.policy(c.roundId, tx);
    if (!round) throw errors.notFound('The round');
    return round;
  }

  function requireOpenAllocation(round: { name: string; allocationEndsAt: string }, what: string, now = new Date()) {
    if (now >= new Date(round.allocationEndsAt)) {
      throw errors.conflict(`The allocation period of "${round.name}" ended on ${round.allocationEndsAt.slice(0, 10)}; ${what} no longer.`);
    }
  }

  /** Alert each usage threshold the campaign has reached, once per grant. */
  async function alertThresholds(campaignId: string, tx: Transaction, known?: Balances): Promise<void> {
    const balances = known ?? (await ledgerRepository.balances(campaignId, tx));
    const reached = thresholdsReached(balances);
    if (!reached.length) return;
    const alerted = new Set(await ledgerRepository.alertedThresholds(campaignId, tx));
    for (const threshold of reached.filter((t) => !alerted.has(t))) {
      if (await ledgerRepository.markAlerted(campaignId, threshold, tx)) await notify({ kind: 'usage-threshold', campaignId, threshold }, tx);
    }
  }

  /** Check a positive amount against the pool's unallocated core-hours (locks the pool row). */
  async function requirePoolRoom(c: CampaignRecord, milli: number, tx: Transaction): Promise<void> {
    const pool = await ledgerRepository.poolUsage(c.roundId, c.machine, tx, true);
    if (!pool) throw errors.conflict(`The round has no pool on ${c.machine}.`);
    const unallocated = toMilli(pool.unallocated);
    if (milli > unallocated) {
      throw errors.conflict(`The ${c.machine} pool of the round has ${ch(unallocated)} left to grant; ${ch(milli)} do not fit. Grant at most ${ch(unallocated)}.`);
    }
  }

  return {
    async get(ctx: RequestContext, campaignId: string): Promise<Ledger> {
      const c = await campaigns.findVisible(ctx, campaignId);
      const [balances, entries, round, alerted] = await Promise.all([
        ledgerRepository.balances(campaignId),
        ledgerRepository.entries(campaignId),
        roundOf(c),
        ledgerRepository.alertedThresholds(campaignId),
      ]);
      return {
        campaignId,
        granted: fromMilli(balances.granted),
        used: fromMilli(balances.used),
        expired: fromMilli(balances.expired),
        remaining: fromMilli(balances.remaining),
        overdraftPercent: round.overdraftPercent,
        overdraftAllowance: fromMilli(overdraftAllowance(balances.granted, round.overdraftPercent)),
        alerted,
        entries,
      };
    },

    /** The grant of a decision, inside the decision's transaction (campaign locked by the caller). */
    async grantIn(ctx: RequestContext, c: CampaignRecord, coreHours: number, tx: Transaction): Promise<void> {
      const milli = toMilli(coreHours);
      await requirePoolRoom(c, milli, tx);
      await ledgerRepository.append({ campaignId: c.id, kind: 'grant', milli, actorPersonId: actorOf(ctx) }, tx);
    },

    /**
     * Debit a run, inside the run's transaction with the campaign already locked. Refused past
     * the remaining grant unless the round allows an overdraft, which is then flagged.
     */
    async debitIn(ctx: RequestContext, c: CampaignRecord, run: { id: string; externalJobId: string; milli: number }, tx: Transaction): Promise<{ overdraft: boolean }> {
      requireGranted(c, 'runs are charged to');
      const round = await roundOf(c, tx);
      requireOpenAllocation(round, 'runs can be charged to it');
      const balances = await ledgerRepository.balances(c.id, tx);
      const verdict = judgeDebit(balances, run.milli, round.overdraftPercent);
      if (!verdict.allowed) {
        const policy = round.overdraftPercent ? `the round allows an overdraft of ${round.overdraftPercent} % of the grant, and ` : '';
        throw errors.conflict(
          `Run ${run.externalJobId} needs ${ch(run.milli)} but "${c.title}" has ${ch(balances.remaining)} left; ${policy}this run would go ${ch(verdict.shortBy)} beyond. Ask the office for an adjustment or a transfer from another campaign of the group.`,
        );
      }
      await ledgerRepository.append({ campaignId: c.id, kind: 'debit', milli: -run.milli, runId: run.id, overdraft: verdict.overdraft, actorPersonId: actorOf(ctx) }, tx);
      await alertThresholds(c.id, tx, { ...balances, used: balances.used + run.milli, remaining: verdict.remainingAfter });
      return { overdraft: verdict.overdraft };
    },

    /**
     * Debit many runs at once (an import), inside its transaction with the campaign locked: the
     * policy is judged on the total, the entries are written in one statement, alerts once.
     */
    async debitManyIn(ctx: RequestContext, c: CampaignRecord, runs: { id: string; milli: number }[], tx: Transaction): Promise<void> {
      requireGranted(c, 'runs are charged to');
      const round = await roundOf(c, tx);
      requireOpenAllocation(round, 'runs can be charged to it');
      const balances = await ledgerRepository.balances(c.id, tx);
      const total = runs.reduce((s, r) => s + r.milli, 0);
      const verdict = judgeDebit(balances, total, round.overdraftPercent);
      if (!verdict.allowed) {
        throw errors.conflict(`These runs need ${ch(total)} but "${c.title}" has ${ch(balances.remaining)} left; they would go ${ch(verdict.shortBy)} beyond what the round allows. Nothing was written.`);
      }
      let remaining = balances.remaining;
      const actor = actorOf(ctx);
      await ledgerRepository.appendMany(
        runs.map((r) => {
          remaining -= r.milli;
          return { campaignId: c.id, kind: 'debit' as const, milli: -r.milli, runId: r.id, overdraft: remaining < 0, actorPersonId: actor };
        }),
        tx,
      );
      await alertThresholds(c.id, tx);
    },

    adjust(ctx: RequestContext, campaignId: string, input: AdjustmentInput): Promise<LedgerEntry> {
      return db.transaction(async (tx) => {
        if (!actsAsAdmin(ctx.principal!)) throw errors.forbidden('Only the consortium office adjusts grants.');
        const c = await campaigns.findVisible(ctx, campaignId, tx, true);
        requireGranted(c, 'adjustments apply to');
        requireOpenAllocation(await roundOf(c, tx), 'its grant can be adjusted');
        const milli = toMilli(input.coreHours);
        if (milli > 0) await requirePoolRoom(c, milli, tx);
        else {
          const balances = await ledgerRepository.balances(c.id, tx);
          if (balances.remaining + milli < 0) {
            throw errors.conflict(`"${c.title}" has ${ch(balances.remaining)} left; an adjustment of ${ch(milli)} would take it below zero.`);
          }
        }
        const id = await ledgerRepository.append({ campaignId: c.id, kind: 'adjustment', milli, reason: input.reason, actorPersonId: actorOf(ctx) }, tx);
        await auditService.record(ctx, 'ledger.adjustment', { type: 'campaign', id: c.id }, { coreHours: fromMilli(milli), reason: input.reason }, tx);
        if (milli < 0) await alertThresholds(c.id, tx);
        return (await ledgerRepository.find(id, tx))!;
      });
    },

    transfer(ctx: RequestContext, campaignId: string, input: TransferInput): Promise<{ from: LedgerEntry; to: LedgerEntry }> {
      return db.transaction(async (tx) => {
        if (input.toCampaignId.toLowerCase() === campaignId.toLowerCase()) throw errors.invalid('A transfer needs two different campaigns.', [{ path: ['toCampaignId'], message: 'choose another campaign of the group' }]);
        // Lock both rows in id order, so two opposite transfers cannot deadlock.
        const [first, second] = [campaignId, input.toCampaignId].sort();
        const locked = new Map<string, CampaignRecord>();
        for (const id of [first, second]) locked.set(id, await campaigns.findVisible(ctx, id, tx, true));
        const from = locked.get(campaignId)!;
        const to = locked.get(input.toCampaignId)!;
        const p = ctx.principal!;
        if (!actsAsAdmin(p) && !(from.groupPiPersonId === p.personId && p.roles.includes('pi'))) {
          throw errors.forbidden(`Only the PI of ${from.groupName} or the consortium office moves core-hours between its campaigns.`);
        }
        if (from.groupId !== to.groupId) throw errors.conflict('Core-hours move only between campaigns of one research group.');
        if (from.roundId !== to.roundId || from.machine !== to.machine) {
          throw errors.conflict(`Core-hours move only within one round's pool: "${to.title}" draws on ${to.roundName} / ${to.machine}, "${from.title}" on ${from.roundName} / ${from.machine}.`);
        }
        requireGranted(from, 'core-hours move from');
        requireGranted(to, 'core-hours move to');
        requireOpenAllocation(await roundOf(from, tx), 'core-hours can be moved');
        const milli = toMilli(input.coreHours);
        const balances = await ledgerRepository.balances(from.id, tx);
        if (milli > balances.remaining) throw errors.conflict(`"${from.title}" has ${ch(Math.max(0, balances.remaining))} left; it cannot give ${ch(milli)}.`);
        const actor = actorOf(ctx);
        const outId = await ledgerRepository.append({ campaignId: from.id, kind: 'transfer', milli: -milli, counterpartCampaignId: to.id, reason: input.reason, actorPersonId: actor }, tx);
        const inId = await ledgerRepository.append({ campaignId: to.id, kind: 'transfer', milli, counterpartCampaignId: from.id, reason: input.reason, actorPersonId: actor }, tx);
        await auditService.record(ctx, 'ledger.transfer', { type: 'campaign', id: from.id }, { to: to.id, coreHours: fromMilli(milli), reason: input.reason }, tx);
        await alertThresholds(from.id, tx);
        return { from: (await ledgerRepository.find(outId, tx))!, to: (await ledgerRepository.find(inId, tx))! };
      });
    },

    refund(ctx: RequestContext, campaignId: string, input: RefundInput): Promise<LedgerEntry> {
      return db.transaction(async (tx) => {
        if (!actsAsAdmin(ctx.principal!)) throw errors.forbidden('Only the consortium office refunds runs.');
        const c = await campaigns.findVisible(ctx, campaignId, tx, true);
        const run = await runsRepository.find(input.runId, tx);
        if (!run || run.campaignId !== c.id) throw errors.invalid('That run is not one of this campaign.', [{ path: ['runId'], message: 'choose a run of this campaign' }]);
        const refundable = await ledgerRepository.runNetDebit(run.id, tx);
        const milli = input.coreHours === undefined ? refundable : toMilli(input.coreHours);
        if (refundable <= 0) throw errors.conflict(`Run ${run.externalJobId} is refunded in full already.`);
        if (milli > refundable) throw errors.conflict(`Run ${run.externalJobId} has ${ch(refundable)} left to refund; ${ch(milli)} is more.`);
        const id = await ledgerRepository.append({ campaignId: c.id, kind: 'refund', milli, runId: run.id, reason: input.reason, actorPersonId: actorOf(ctx) }, tx);
        await auditService.record(ctx, 'ledger.refund', { type: 'campaign', id: c.id }, { runId: run.id, coreHours: fromMilli(milli), reason: input.reason }, tx);
        return (await ledgerRepository.find(id, tx))!;
      });
    },

    async poolOfCampaign(ctx: RequestContext, campaignId: string) {
      const c = await campaigns.findVisible(ctx, campaignId);
      const pool = await ledgerRepository.poolUsage(c.roundId, c.machine);
      if (!pool) throw errors.notFound('The pool');
      return pool;
    },

    async roundUsage(roundId: string): Promise<RoundUsage> {
      const round = await roundsRepository.find(roundId);
      if (!round) throw errors.notFound('The round');
      const pools = [];
      for (const p of round.pools) pools.push((await ledgerRepository.poolUsage(roundId, p.machine))!);
      return { roundId, pools };
    },

    /**
     * At the end of a round's allocation period what is left of each grant expires. One
     * transaction per campaign; the unique expiry index makes a second sweep a no-op.
     */
    async expireEndedAllocations(ctx: RequestContext, now = new Date()): Promise<number> {
      let expired = 0;
      for (const id of await ledgerRepository.campaignsToExpire(now)) {
        await db.transaction(async (tx) => {
          const c = await campaigns.findVisible(ctx, id, tx, true);
          const balances = await ledgerRepository.balances(c.id, tx);
          if (balances.remaining <= 0) return;
          await ledgerRepository.append({ campaignId: c.id, kind: 'expiry', milli: -balances.remaining, reason: 'allocation period ended', actorPersonId: null }, tx);
          await auditService.record(ctx, 'ledger.expiry', { type: 'campaign', id: c.id }, { coreHours: fromMilli(balances.remaining) }, tx);
          expired++;
        });
      }
      return expired;
    },
  };
}
export type LedgerService = ReturnType<typeof createLedgerService>;
