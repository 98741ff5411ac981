import { z } from 'zod';
import { CampaignState } from '../campaigns/campaign.schema';

/** What reviewers score, 1 (poor) to 5 (excellent). */
export const REVIEW_CRITERIA = ['merit', 'feasibility', 'costJustification'] as const;
export type ReviewCriterion = (typeof REVIEW_CRITERIA)[number];

export const REVIEW_CRITERION_LABELS: Record<ReviewCriterion, { label: string; question: string }> = {
  merit: { label: 'Scientific merit', question: 'Does the campaign answer an open question about localization or its transition?' },
  feasibility: { label: 'Feasibility', question: 'Can the sizes, precision and codes deliver the result within the round?' },
  costJustification: { label: 'Cost justification', question: 'Are the core-hours justified by the estimate, the pilots and the science?' },
};

const Score = z
  .number({ message: 'give a score from 1 to 5' })
  .int('scores are whole numbers from 1 to 5')
  .min(1, 'scores run from 1 (poor) to 5 (excellent)')
  .max(5, 'scores run from 1 (poor) to 5 (excellent)');

export const ReviewScores = z.object({ merit: Score, feasibility: Score, costJustification: Score }).strict();
export type ReviewScores = z.infer<typeof ReviewScores>;

export const ReviewInput = z
  .object({
    scores: ReviewScores,
    /** Shown to the proposers after the decision, without the reviewer's name. */
    toProposers: z.string().trim().min(10, 'write at least a sentence for the proposers').max(20_000, 'at most 20 000 characters'),
    /** Read by the committee and the office only. */
    confidential: z.string().trim().max(20_000, 'at most 20 000 characters').default(''),
    recommendedCoreHours: z.number({ message: 'recommend a number of core-hours (0 to decline)' }).int('recommend whole core-hours').min(0, 'core-hours are not negative').max(1e12, 'that is more than Localis accepts (10^12)'),
  })
  .strict()
  .meta({ id: 'ReviewInput' });
export type ReviewInput = z.infer<typeof ReviewInput>;

export const ASSIGNMENT_STATES = ['assigned', 'reviewed', 'conflict'] as const;
export const AssignmentState = z.enum(ASSIGNMENT_STATES);
export type AssignmentState = z.infer<typeof AssignmentState>;

export const AssignmentInput = z.object({ reviewerPersonId: z.uuid('choose a committee member') }).strict().meta({ id: 'AssignmentInput' });
export type AssignmentInput = z.infer<typeof AssignmentInput>;

export const ConflictInput = z
  .object({ reason: z.string().trim().min(5, 'say briefly why (at least 5 characters), e.g. "co-author of the PI in 2026"').max(2000) })
  .strict()
  .meta({ id: 'ConflictInput' });
export type ConflictInput = z.infer<typeof ConflictInput>;

export const Review = ReviewInput.extend({ submittedAt: z.iso.datetime(), updatedAt: z.iso.datetime() }).meta({ id: 'Review' });
export type Review = z.infer<typeof Review>;

/** An assignment as the committee and the office see it. */
export const Assignment = z
  .object({
    id: z.uuid(),
    campaignId: z.uuid(),
    reviewerPersonId: z.uuid(),
    reviewerName: z.string(),
    reviewerInstitutionName: z.string().nullable(),
    state: AssignmentState,
    conflictReason: z.string().nullable(),
    assignedAt: z.iso.datetime(),
    review: Review.nullable(),
  })
  .meta({ id: 'Assignment' });
export type Assignment = z.infer<typeof Assignment>;

/** What proposers see once decided: scores and the comments meant for them, no names. */
export const ProposerFeedback = z.object({ scores: ReviewScores, toProposers: z.string() }).meta({ id: 'ProposerFeedback' });
export type ProposerFeedback = z.infer<typeof ProposerFeedback>;

export const ReviewSummary = z.object({
  reviews: z.number().int(),
  meanScores: z.object({ merit: z.number().nullable(), feasibility: z.number().nullable(), costJustification: z.number().nullable() }),
  meanRecommendedCoreHours: z.number().nullable(),
});

/**
 * GET /campaigns/:id/reviews. The committee and the office get `assignments` (with confidential
 * comments) and a summary; proposers get `feedback` after the decision and nothing before.
 */
export const CampaignReviews = z
  .object({
    campaignId: z.uuid(),
    audience: z.enum(['committee', 'proposers']),
    assignments: z.array(Assignment),
    summary: ReviewSummary.nullable(),
    feedback: z.array(ProposerFeedback),
    decisionMessage: z.string().nullable(),
    /** Members who may be assigned: committee, active, not from the proposers' institution, not yet assigned. */
    eligibleReviewers: z.array(z.object({ personId: z.uuid(), name: z.string(), institutionName: z.string().nullable() })),
    can: z.object({ assign: z.boolean(), review: z.boolean(), declareConflict: z.boolean(), decide: z.boolean() }),
    myAssignmentId: z.uuid().nullable(),
  })
  .meta({ id: 'CampaignReviews' });
export type CampaignReviews = z.infer<typeof CampaignReviews>;

/** The committee's queue: proposals in front of the committee, with my part and everyone's progress. */
export const CommitteeQueueItem = z
  .object({
    campaignId: z.uuid(),
    title: z.string(),
    state: CampaignState,
    groupName: z.string(),
    institutionName: z.string(),
    roundId: z.uuid(),
    roundName: z.string(),
    machine: z.string(),
    requestedCoreHours: z.number(),
    submittedAt: z.iso.datetime().nullable(),
    assigned: z.number().int(),
    reviewed: z.number().int(),
    conflicts: z.number().int(),
    myAssignmentId: z.uuid().nullable(),
    myState: AssignmentState.nullable(),
    meanScore: z.number().nullable(),
  })
  .meta({ id: 'CommitteeQueueItem' });
export type CommitteeQueueItem = z.infer<typeof CommitteeQueueItem>;

export const CommitteeQueueQuery = z.object({
  scope: z.enum(['mine', 'all']).default('mine'),
  roundId: z.uuid('roundId must be a round id').optional(),
});
export type CommitteeQueueQuery = z.infer<typeof CommitteeQueueQuery>;

export const CommitteeQueue = z.object({ items: z.array(CommitteeQueueItem) }).meta({ id: 'CommitteeQueue' });
export type CommitteeQueue = z.infer<typeof CommitteeQueue>;

export const DECISION_OUTCOMES = ['grant-all', 'grant-part', 'decline'] as const;

export const DecisionInput = z
  .object({
    outcome: z.enum(DECISION_OUTCOMES, { message: 'choose grant-all, grant-part or decline' }),
    /** Only for grant-part: the core-hours granted, less than requested. */
    coreHours: z.number().int('grant whole core-hours').min(1, 'grant at least 1 core-hour').max(1e12).optional(),
    message: z.string().trim().min(10, 'write the proposers a message of at least 10 characters').max(20_000),
  })
  .strict()
  .superRefine((d, ctx) => {
    if (d.outcome === 'grant-part' && d.coreHours === undefined) ctx.addIssue({ code: 'custom', path: ['coreHours'], message: 'give the core-hours of a partial grant' });
    if (d.outcome !== 'grant-part' && d.coreHours !== undefined) ctx.addIssue({ code: 'custom', path: ['coreHours'], message: `leave core-hours out for ${d.outcome}` });
  })
  .meta({ id: 'DecisionInput' });
export type DecisionInput = z.infer<typeof DecisionInput>;

export const ReviewsIdParams = z.object({ id: z.uuid('that is not a campaign id'), assignmentId: z.uuid('that is not an assignment id') });
