import type { Transaction } from 'sequelize';
import {
  errors,
  type Assignment,
  type Campaign,
  type CampaignReviews,
  type CommitteeQueueQuery,
  type DecisionInput,
  type ReviewInput,
} from '@localis/shared';
import type { Database } from '../db';
import type { RequestContext } from '../http/principal';
import { actsAsAdmin } from '../http/acts-as-admin';
import { auditService } from '../audit/audit.service';
import type { CampaignRecord } from '../campaigns/campaigns.repository';
import type { CampaignsService, Decision } from '../campaigns/campaigns.service';
import { groupsRepository } from '../groups/groups.repository';
import type { LedgerService } from '../ledger/ledger.service';
import { notify } from '../notifications/notify';
import { peopleRepository } from '../people/people.repository';
import { reviewsRepository } from './reviews.repository';
import { appendProvenance } from '../provenance/provenance.service';
import { decisionRecord } from '../provenance/provenance-records';

const BEFORE_DECISION = ['submitted', 'in-review'];
const mean = (xs: number[]) => (xs.length ? Math.round((xs.reduce((a, b) => a + b, 0) / xs.length) * 100) / 100 : null);

/**
 * Committee review and the office's decision. Conflicts of interest: nobody reviews a proposal
 * of their own institution or group, and any member may declare a conflict, which bars them.
 */
export function createReviewsService(db: Database, campaigns: CampaignsService, ledger: LedgerService) {
  const isCommittee = (ctx: RequestContext) => actsAsAdmin(ctx.principal!) || ctx.principal!.roles.includes('committee');

  async function institutionOfGroup(c: CampaignRecord, tx?: Transaction): Promise<string | null> {
    return (await groupsRepository.find(c.groupId, tx))?.institutionId ?? null;
  }

  /** Why this person may not review this proposal, or null. */
  async function conflictOf(c: CampaignRecord, person: { id: string; institutionId: string | null }, tx?: Transaction): Promise<string | null> {
    if (person.institutionId && person.institutionId === (await institutionOfGroup(c, tx))) return `is at ${c.institutionName}, the proposers' institution`;
    if (await campaigns.isGroupMember(c, person.id, tx)) return `is a member of ${c.groupName}, the proposing group`;
    return null;
  }

  function requireBeforeDecision(c: CampaignRecord, what: string) {
    if (!BEFORE_DECISION.includes(c.state)) throw errors.conflict(`"${c.title}" is ${c.state.replace('-', ' ')}; ${what} only before the decision.`);
  }

  async function loadAssignment(c: CampaignRecord, assignmentId: string, tx?: Transaction): Promise<Assignment> {
    const a = await reviewsRepository.find(assignmentId, tx);
    if (!a || a.campaignId !== c.id) throw errors.notFound('The assignment');
    return a;
  }

  return {
    queue: (ctx: RequestContext, q: CommitteeQueueQuery) =>
      reviewsRepository.queue(ctx.principal!.personId, q, actsAsAdmin(ctx.principal!)).then((items) => ({ items })),

    async forCampaign(ctx: RequestContext, campaignId: string): Promise<CampaignReviews> {
      const p = ctx.principal!;
      const c = await campaigns.findVisible(ctx, campaignId);
      const proposer = await campaigns.isGroupMember(c, p.personId);
      const decided = ['granted', 'partly-granted', 'declined'].includes(c.state);
      const assignments = await reviewsRepository.forCampaign(c.id);
      const decisionMessage = decided ? ([...(await campaigns.detail(ctx, c)).history].reverse().find((h) => h.toState === c.state)?.note ?? null) : null;
      const mine = assignments.find((a) => a.reviewerPersonId === p.personId) ?? null;
      const base = { campaignId: c.id, decisionMessage, myAssignmentId: mine?.id ?? null };
      // Proposers (even those on the committee) see only what is meant for them, and only after the
      // decision; so do members barred by a conflict of interest, declared or by institution. The
      // office sees everything: it runs the review.
      const barred = mine?.state === 'conflict' || (!!p.institutionId && p.institutionId === (await institutionOfGroup(c)));
      if (!isCommittee(ctx) || ((proposer || barred) && !actsAsAdmin(p))) {
        const feedback = decided ? assignments.filter((a) => a.review).map((a) => ({ scores: a.review!.scores, toProposers: a.review!.toProposers })) : [];
        return { ...base, audience: 'proposers', assignments: [], summary: null, feedback, decisionMessage, eligibleReviewers: [], can: { assign: false, review: false, declareConflict: false, decide: false } };
      }
      const reviews = assignments.flatMap((a) => (a.review ? [a.review] : []));
      const admin = actsAsAdmin(p);
      let eligibleReviewers: CampaignReviews['eligibleReviewers'] = [];
      if (admin && BEFORE_DECISION.includes(c.state)) {
        const groupInstitution = await institutionOfGroup(c);
        const taken = new Set(assignments.map((a) => a.reviewerPersonId));
        const members = await reviewsRepository.committeeMembers();
        for (const m of members) {
          if (taken.has(m.personId) || (m.institutionId && m.institutionId === groupInstitution)) continue;
          if (await campaigns.isGroupMember(c, m.personId)) continue;
          eligibleReviewers.push({ personId: m.personId, name: m.name, institutionName: m.institutionName });
        }
      }
      return {
        ...base,
        audience: 'committee',
        assignments,
        summary: {
          reviews: reviews.length,
          meanScores: {
            merit: mean(reviews.map((r) => r.scores.merit)),
            feasibility: mean(reviews.map((r) => r.scores.feasibility)),
            costJustification: mean(reviews.map((r) => r.scores.costJustification)),
          },
          meanRecommendedCoreHours: mean(reviews.map((r) => r.recommendedCoreHours)),
        },
        feedback: [],
        eligibleReviewers,
        can: {
          assign: admin && BEFORE_DECISION.includes(c.state),
          review: !!mine && mine.state !== 'conflict' && c.state === 'in-review',
          declareConflict: p.roles.includes('committee') && BEFORE_DECISION.includes(c.state) && mine?.state !== 'conflict' && mine?.state !== 'reviewed',
          decide: admin && BEFORE_DECISION.includes(c.state),
        },
      };
    },

    assign(ctx: RequestContext, campaignId: string, reviewerPersonId: string): Promise<Assignment> {
      return db.transaction(async (tx) => {
        if (!actsAsAdmin(ctx.principal!)) throw errors.forbidden('Only the consortium office assigns reviewers.');
        const c = await campaigns.findVisible(ctx, campaignId, tx, true);
        requireBeforeDecision(c, 'reviewers can be assigned');
        const reviewer = await peopleRepository.findDto(reviewerPersonId, tx);
        if (!reviewer || !reviewer.active || !reviewer.roles.includes('committee')) {
          throw errors.invalid('Reviewers are active members of the allocation committee.', [{ path: ['reviewerPersonId'], message: 'choose an active committee member' }]);
        }
        const conflict = await conflictOf(c, reviewer, tx);
        if (conflict) throw errors.conflict(`Conflict of interest: ${reviewer.name} ${conflict}. Choose a reviewer from another institution.`);
        const existing = await reviewsRepository.findFor(c.id, reviewer.id, tx);
        if (existing?.state === 'conflict') throw errors.conflict(`${reviewer.name} declared a conflict of interest with this proposal: "${existing.conflictReason}".`);
        if (existing) throw errors.conflict(`${reviewer.name} is assigned to this proposal already.`);
        const id = await reviewsRepository.create({ campaignId: c.id, reviewerPersonId: reviewer.id, assignedByPersonId: ctx.principal!.personId }, tx);
        if (c.state === 'submitted') await campaigns.startReviewIn(ctx, c, 'review started with the first assignment', tx);
        await notify({ kind: 'review-assigned', assignmentId: id }, tx);
        await auditService.record(ctx, 'review.assigned', { type: 'campaign', id: c.id }, { assignmentId: id, reviewerPersonId: reviewer.id }, tx);
        return (await reviewsRepository.find(id, tx))!;
      });
    },

    unassign(ctx: RequestContext, campaignId: string, assignmentId: string): Promise<void> {
      return db.transaction(async (tx) => {
        if (!actsAsAdmin(ctx.principal!)) throw errors.forbidden('Only the consortium office removes reviewers.');
        const c = await campaigns.findVisible(ctx, campaignId, tx, true);
        const a = await loadAssignment(c, assignmentId, tx);
        if (a.state === 'reviewed') throw errors.conflict(`${a.reviewerName} has reviewed this proposal; a submitted review stays on record.`);
        if (a.state === 'conflict') throw errors.conflict(`${a.reviewerName} declared a conflict of interest; the declaration stays on record.`);
        requireBeforeDecision(c, 'reviewers can be removed');
        await reviewsRepository.remove(a.id, tx);
        await auditService.record(ctx, 'review.unassigned', { type: 'campaign', id: c.id }, { assignmentId: a.id, reviewerPersonId: a.reviewerPersonId }, tx);
      });
    },

    declareConflict(ctx: RequestContext, campaignId: string, reason: string): Promise<Assignment> {
      return db.transaction(async (tx) => {
        const p = ctx.principal!;
        if (!p.roles.includes('committee')) throw errors.forbidden('Conflicts of interest are declared by committee members about themselves.');
        const c = await campaigns.findVisible(ctx, campaignId, tx, true);
        requireBeforeDecision(c, 'conflicts can be declared');
        const existing = await reviewsRepository.findFor(c.id, p.personId, tx);
        if (existing?.state === 'reviewed') throw errors.conflict('You have reviewed this proposal already; ask the office to set your review aside.');
        if (existing?.state === 'conflict') throw errors.conflict('You declared a conflict with this proposal already.');
        const id = existing ? existing.id : await reviewsRepository.create({ campaignId: c.id, reviewerPersonId: p.personId, assignedByPersonId: null, state: 'conflict', conflictReason: reason }, tx);
        if (existing) await reviewsRepository.setState(id, 'conflict', reason, tx);
        await auditService.record(ctx, 'review.conflict-declared', { type: 'campaign', id: c.id }, { assignmentId: id, reason }, tx);
        return (await reviewsRepository.find(id, tx))!;
      });
    },

    submitReview(ctx: RequestContext, campaignId: string, assignmentId: string, input: ReviewInput): Promise<Assignment> {
      return db.transaction(async (tx) => {
        const c = await campaigns.findVisible(ctx, campaignId, tx, true);
        const a = await loadAssignment(c, assignmentId, tx);
        if (a.reviewerPersonId !== ctx.principal!.personId) throw errors.forbidden(`This review is assigned to ${a.reviewerName}; only they can write it.`);
        if (a.state === 'conflict') throw errors.conflict('You declared a conflict of interest with this proposal, so you cannot review it.');
        if (c.state !== 'in-review') throw errors.conflict(`"${c.title}" is ${c.state.replace('-', ' ')}; reviews are written while a proposal is in review.`);
        await reviewsRepository.saveReview(a.id, input, tx);
        await auditService.record(ctx, a.review ? 'review.updated' : 'review.submitted', { type: 'campaign', id: c.id }, { assignmentId: a.id, scores: input.scores, recommendedCoreHours: input.recommendedCoreHours }, tx);
        return (await reviewsRepository.find(a.id, tx))!;
      });
    },

    pool: (ctx: RequestContext, campaignId: string) => ledger.poolOfCampaign(ctx, campaignId),

    /** Grant all, part or none: the state, the grant entry within the pool and the mail, in one transaction. */
    decide(ctx: RequestContext, campaignId: string, input: DecisionInput): Promise<Campaign> {
      return db.transaction(async (tx) => {
        const c = await campaigns.findVisible(ctx, campaignId, tx, true);
        let decision: Decision;
        if (input.outcome === 'grant-all') decision = { outcome: 'granted', grantedCoreHours: c.requestedCoreHours, message: input.message };
        else if (input.outcome === 'decline') decision = { outcome: 'declined', grantedCoreHours: 0, message: input.message };
        else {
          if (input.coreHours! >= c.requestedCoreHours) {
            throw errors.invalid(`A partial grant is less than the ${c.requestedCoreHours} core-hours requested; to give them all, grant all.`, [{ path: ['coreHours'], message: `less than ${c.requestedCoreHours}` }]);
          }
          decision = { outcome: 'partly-granted', grantedCoreHours: input.coreHours!, message: input.message };
        }
        await campaigns.applyDecision(ctx, c, decision, tx);
        if (decision.grantedCoreHours > 0) await ledger.grantIn(ctx, c, decision.grantedCoreHours, tx);
        await notify({ kind: 'decision', campaignId: c.id }, tx);
        const record = decisionRecord({ campaignId: c.id, campaignTitle: c.title, roundName: c.roundName, outcome: decision.outcome, grantedCoreHours: decision.grantedCoreHours, decidedBy: ctx.principal, at: new Date().toISOString() });
        await appendProvenance([{ record, subjectId: c.id }], tx);
        return campaigns.detail(ctx, (await campaigns.findVisible(ctx, c.id, tx))!, tx);
      });
    },
  };
}
export type ReviewsService = ReturnType<typeof createReviewsService>;
