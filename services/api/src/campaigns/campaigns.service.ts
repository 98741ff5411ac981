import {
  canTransition,
  CAMPAIGN_STATE_LABELS,
  CAMPAIGN_TRANSITIONS,
  errors,
  estimateReport,
  type Campaign,
  type CampaignInput,
  type CampaignListQuery,
  type CampaignPatch,
  type CampaignSpec,
  type CampaignState,
  type CampaignTransition,
  type Round,
} from '@localis/shared';
import type { Transaction } from 'sequelize';
import type { Database } from '../db';
import type { Principal, RequestContext } from '../http/principal';
import { actsAsAdmin } from '../http/acts-as-admin';
import { auditService } from '../audit/audit.service';
import { groupsRepository } from '../groups/groups.repository';
import { roundsRepository } from '../rounds/rounds.repository';
import { campaignsRepository, derivedColumns, type CampaignRecord, type Visibility } from './campaigns.repository';
import { notify } from '../notifications/notify';

/** The outcome of a grant decision; the reviews service checks the pool and writes the grant. */
export interface Decision {
  outcome: 'granted' | 'partly-granted' | 'declined';
  grantedCoreHours: number;
  message: string | null;
}

const isOwner = (p: Principal, c: CampaignRecord) => c.ownerPersonId === p.personId;
const isGranted = (c: { state: CampaignState }) => c.state === 'granted' || c.state === 'partly-granted';
const isGroupPi = (p: Principal, c: { groupPiPersonId: string }) => c.groupPiPersonId === p.personId && p.roles.includes('pi');
const canWrite = (p: Principal) => p.via !== 'token' || p.scopes.includes('write');

function visibilityOf(p: Principal): Visibility {
  return { personId: p.personId, everything: p.roles.includes('admin'), submittedOnes: p.roles.includes('committee') };
}

/** Campaigns: drafts their owners edit, the PI submits, the committee and the office take it from there. */
export function createCampaignsService(db: Database) {
  async function canSee(p: Principal, c: CampaignRecord, tx?: Transaction): Promise<boolean> {
    const v = visibilityOf(p);
    if (v.everything || (v.submittedOnes && c.submittedAt)) return true;
    return c.groupPiPersonId === p.personId || (await groupsRepository.isMember(c.groupId, p.personId, tx));
  }

  function permissions(p: Principal, c: CampaignRecord, memberOf: boolean) {
    const mayWrite = canWrite(p);
    const ownerOrPi = isOwner(p, c) || isGroupPi(p, c);
    const mayUpload = (p.via !== 'token' || p.scopes.includes('archives')) && (actsAsAdmin(p) || c.groupPiPersonId === p.personId || memberOf);
    return {
      edit: mayWrite && c.state === 'draft' && ownerOrPi,
      submit: mayWrite && canTransition(c.state, 'submit') && isGroupPi(p, c),
      withdraw: mayWrite && canTransition(c.state, 'withdraw') && ownerOrPi,
      startReview: canTransition(c.state, 'start-review') && actsAsAdmin(p),
      decide: canTransition(c.state, 'decide') && actsAsAdmin(p),
      recordRuns: isGranted(c) && (p.via !== 'token' || p.scopes.includes('runs')) && (actsAsAdmin(p) || c.groupPiPersonId === p.personId || memberOf),
      transfer: isGranted(c) && (actsAsAdmin(p) || isGroupPi(p, c)),
      uploadResults: isGranted(c) && mayUpload,
      attachFiles: mayUpload,
      withdrawArchives: actsAsAdmin(p) || isGroupPi(p, c),
    };
  }

  async function detail(p: Principal, c: CampaignRecord, tx?: Transaction): Promise<Campaign> {
    const { groupPiPersonId: _pi, grantedCoreHours: _g, ...rest } = c;
    const memberOf = await groupsRepository.isMember(c.groupId, p.personId, tx);
    return {
      ...rest,
      grantedCoreHours: c.grantedCoreHours,
      estimate: c.estimate as unknown as Campaign['estimate'],
      history: await campaignsRepository.history(c.id, tx),
      can: permissions(p, c, memberOf),
    };
  }

  /**
   * The round and machine a campaign draws on must exist, take proposals, and have that pool. The
   * round is share-locked so an office edit cannot remove the pool while the campaign is saved.
   */
  async function checkRoundAndMachine(roundId: string, machine: string, tx: Transaction): Promise<Round> {
    const round = await roundsRepository.find(roundId, tx, 'share');
    if (!round) throw errors.invalid('That allocation round does not exist.', [{ path: ['roundId'], message: 'choose an existing round' }]);
    if (round.status === 'closed') {
      throw errors.invalid(`The round "${round.name}" closed on ${round.closesAt.slice(0, 10)}; choose an open round.`, [{ path: ['roundId'], message: 'this round is closed' }]);
    }
    if (!round.pools.some((p) => p.machine === machine)) {
      throw errors.invalid(`The round "${round.name}" has no pool on ${machine}.`, [
        { path: ['machine'], message: `choose one of the round's machines: ${round.pools.map((p) => p.machine).join(', ')}` },
      ]);
    }
    return round;
  }

  async function loadForChange(ctx: RequestContext, id: string, tx: Transaction): Promise<CampaignRecord> {
    const c = await campaignsRepository.find(id, tx, true);
    if (!c || !(await canSee(ctx.principal!, c, tx))) throw errors.notFound('The campaign');
    return c;
  }

  async function move(ctx: RequestContext, c: CampaignRecord, to: CampaignState, note: string | null, extra: Parameters<typeof campaignsRepository.setState>[2], tx: Transaction) {
    await campaignsRepository.setState(c.id, to, extra, tx);
    const actor = ctx.principal && ctx.principal.via !== 'system' ? ctx.principal.personId : null;
    await campaignsRepository.appendEvent({ campaignId: c.id, fromState: c.state, toState: to, actorPersonId: actor, note }, tx);
    await auditService.record(ctx, `campaign.${to}`, { type: 'campaign', id: c.id }, { from: c.state, to, title: c.title, ...(note ? { note } : {}) }, tx);
  }

  const DONE: Record<CampaignTransition, string> = { submit: 'submitted', withdraw: 'withdrawn', 'start-review': 'put in review', decide: 'decided' };
  function refuseMove(c: CampaignRecord, transition: CampaignTransition): never {
    const from = CAMPAIGN_TRANSITIONS[transition].from.map((s) => CAMPAIGN_STATE_LABELS[s].toLowerCase()).join(' or ');
    throw errors.conflict(`This campaign is ${CAMPAIGN_STATE_LABELS[c.state].toLowerCase()}; it can be ${DONE[transition]} only while ${from}.`);
  }

  return {
    estimate: (spec: CampaignSpec) => estimateReport(spec),

    list: (ctx: RequestContext, q: CampaignListQuery) => campaignsRepository.list(q, visibilityOf(ctx.principal!)),

    async get(ctx: RequestContext, id: string): Promise<Campaign> {
      const c = await campaignsRepository.find(id);
      // Not found and not yours answer alike, so ids of other groups' drafts do not leak.
      if (!c || !(await canSee(ctx.principal!, c))) throw errors.notFound('The campaign');
      return detail(ctx.principal!, c);
    },

    create(ctx: RequestContext, input: CampaignInput, fixedId?: string): Promise<Campaign> {
      const p = ctx.principal!;
      return db.transaction(async (tx) => {
        const group = await groupsRepository.find(input.groupId, tx);
        if (!group) throw errors.invalid('That research group does not exist.', [{ path: ['groupId'], message: 'choose one of your groups' }]);
        if (group.piPersonId !== p.personId && !group.members.some((m) => m.personId === p.personId)) {
          throw errors.forbidden(`You are not a member of ${group.name}; campaigns are drafted by the group's members.`);
        }
        await checkRoundAndMachine(input.roundId, input.machine, tx);
        const id = await campaignsRepository.create(
          {
            id: fixedId,
            title: input.title,
            abstract: input.abstract,
            justification: input.justification,
            groupId: input.groupId,
            roundId: input.roundId,
            machine: input.machine,
            ownerPersonId: p.personId,
            ...derivedColumns(input.spec, estimateReport(input.spec)),
          },
          tx,
        );
        const actor = p.via !== 'system' ? p.personId : null;
        await campaignsRepository.appendEvent({ campaignId: id, fromState: null, toState: 'draft', actorPersonId: actor, note: null }, tx);
        await auditService.record(ctx, 'campaign.created', { type: 'campaign', id }, { title: input.title, groupId: input.groupId, roundId: input.roundId }, tx);
        return detail(p, (await campaignsRepository.find(id, tx))!, tx);
      });
    },

    update(ctx: RequestContext, id: string, patch: CampaignPatch): Promise<Campaign> {
      const p = ctx.principal!;
      return db.transaction(async (tx) => {
        const c = await loadForChange(ctx, id, tx);
        if (!(isOwner(p, c) || isGroupPi(p, c))) throw errors.forbidden("Only the campaign's owner or the group's PI can edit it.");
        if (c.state !== 'draft') {
          throw errors.conflict(`This campaign is ${CAMPAIGN_STATE_LABELS[c.state].toLowerCase()} and read-only; only drafts can be edited.`);
        }
        // A draft may keep a round that has since closed; only a move to another round or machine is checked.
        if ((patch.roundId ?? c.roundId) !== c.roundId || (patch.machine ?? c.machine) !== c.machine) {
          await checkRoundAndMachine(patch.roundId ?? c.roundId, patch.machine ?? c.machine, tx);
        }
        const { spec, ...fields } = patch;
        await campaignsRepository.update(id, { ...fields, ...(spec ? derivedColumns(spec, estimateReport(spec)) : {}) }, tx);
        await auditService.record(ctx, 'campaign.updated', { type: 'campaign', id }, { fields: Object.keys(patch) }, tx);
        return detail(p, (await campaignsRepository.find(id, tx))!, tx);
      });
    },

    submit(ctx: RequestContext, id: string, note: string | null = null): Promise<Campaign> {
      const p = ctx.principal!;
      return db.transaction(async (tx) => {
        const c = await loadForChange(ctx, id, tx);
        if (!isGroupPi(p, c)) throw errors.forbidden(`Only the PI of ${c.groupName} can submit its proposals.`);
        if (!canTransition(c.state, 'submit')) refuseMove(c, 'submit');
        const round = await roundsRepository.find(c.roundId, tx);
        if (round?.status !== 'open') {
          throw errors.conflict(`The round "${c.roundName}" is ${round?.status ?? 'gone'}; proposals can be submitted only while it is open. Move the draft to an open round.`);
        }
        await move(ctx, c, 'submitted', note, { submittedAt: new Date() }, tx);
        await notify({ kind: 'proposal-submitted', campaignId: c.id }, tx);
        return detail(p, (await campaignsRepository.find(id, tx))!, tx);
      });
    },

    withdraw(ctx: RequestContext, id: string, note: string | null = null): Promise<Campaign> {
      const p = ctx.principal!;
      return db.transaction(async (tx) => {
        const c = await loadForChange(ctx, id, tx);
        if (!(isOwner(p, c) || isGroupPi(p, c))) throw errors.forbidden("Only the campaign's owner or the group's PI can withdraw it.");
        if (!canTransition(c.state, 'withdraw')) refuseMove(c, 'withdraw');
        await move(ctx, c, 'withdrawn', note, {}, tx);
        return detail(p, (await campaignsRepository.find(id, tx))!, tx);
      });
    },

    startReview(ctx: RequestContext, id: string, note: string | null = null): Promise<Campaign> {
      const p = ctx.principal!;
      return db.transaction(async (tx) => {
        const c = await loadForChange(ctx, id, tx);
        if (!actsAsAdmin(p)) throw errors.forbidden('Only the consortium office puts proposals in review.');
        if (!canTransition(c.state, 'start-review')) refuseMove(c, 'start-review');
        await move(ctx, c, 'in-review', note, {}, tx);
        return detail(p, (await campaignsRepository.find(id, tx))!, tx);
      });
    },

    /**
     * A campaign the caller may see, for other features' rules (reviews, ledger, runs); 404
     * otherwise. `lock` takes the row for update, which serialises every change to its grant.
     */
    async findVisible(ctx: RequestContext, id: string, tx?: Transaction, lock = false): Promise<CampaignRecord> {
      const c = await campaignsRepository.find(id, tx, lock);
      if (!c || !(await canSee(ctx.principal!, c, tx))) throw errors.notFound('The campaign');
      return c;
    },

    /** Whether the caller may see the campaign (for lists that join campaigns). */
    canSee: (ctx: RequestContext, c: CampaignRecord, tx?: Transaction) => canSee(ctx.principal!, c, tx),

    isGroupMember: (c: CampaignRecord, personId: string, tx?: Transaction) =>
      c.groupPiPersonId === personId ? Promise.resolve(true) : groupsRepository.isMember(c.groupId, personId, tx),

    /** Move a locked campaign into review (the first assignment does it), inside the caller's transaction. */
    async startReviewIn(ctx: RequestContext, c: CampaignRecord, note: string | null, tx: Transaction): Promise<void> {
      if (!canTransition(c.state, 'start-review')) refuseMove(c, 'start-review');
      await move(ctx, c, 'in-review', note, {}, tx);
    },

    /**
     * Record the office's decision on a locked campaign inside the caller's transaction; the
     * reviews service checks the pool and writes the grant to the ledger in the same one.
     */
    async applyDecision(ctx: RequestContext, c: CampaignRecord, decision: Decision, tx: Transaction): Promise<void> {
      if (!actsAsAdmin(ctx.principal!)) throw errors.forbidden('Only the consortium office decides on grants.');
      if (!canTransition(c.state, 'decide')) refuseMove(c, 'decide');
      await move(ctx, c, decision.outcome, decision.message, { decidedAt: new Date(), grantedCoreHours: decision.outcome === 'declined' ? 0 : decision.grantedCoreHours }, tx);
    },

    detail: (ctx: RequestContext, c: CampaignRecord, tx?: Transaction) => detail(ctx.principal!, c, tx),
  };
}
export type CampaignsService = ReturnType<typeof createCampaignsService>;
