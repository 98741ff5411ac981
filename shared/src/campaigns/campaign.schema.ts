import { z } from 'zod';
import { listQuery, page } from '../lists';
import { MachineName } from '../rounds/round.schema';
import { CampaignSpec, Method, SymmetryClass } from './campaign-spec.schema';
import { Notice } from './notices';

/**
 * A campaign's life: a draft its owner edits; submitted by the group's PI (read-only from then);
 * in review with the committee; decided (granted, partly granted, declined); or withdrawn at any
 * time before a decision.
 */
export const CAMPAIGN_STATES = ['draft', 'submitted', 'in-review', 'granted', 'partly-granted', 'declined', 'withdrawn'] as const;
export const CampaignState = z.enum(CAMPAIGN_STATES, { message: `state must be one of: ${CAMPAIGN_STATES.join(', ')}` });
export type CampaignState = z.infer<typeof CampaignState>;

export const CAMPAIGN_STATE_LABELS: Record<CampaignState, string> = {
  draft: 'Draft',
  submitted: 'Submitted',
  'in-review': 'In review',
  granted: 'Granted',
  'partly-granted': 'Partly granted',
  declined: 'Declined',
  withdrawn: 'Withdrawn',
};

/** The moves between states and where each may start. The services enforce who may make them. */
export const CAMPAIGN_TRANSITIONS = {
  submit: { from: ['draft'], to: 'submitted' },
  withdraw: { from: ['draft', 'submitted', 'in-review'], to: 'withdrawn' },
  'start-review': { from: ['submitted'], to: 'in-review' },
  decide: { from: ['submitted', 'in-review'], to: null },
} as const satisfies Record<string, { from: readonly CampaignState[]; to: CampaignState | null }>;
export type CampaignTransition = keyof typeof CAMPAIGN_TRANSITIONS;

export const DECIDED_STATES: readonly CampaignState[] = ['granted', 'partly-granted', 'declined'];

export function canTransition(state: CampaignState, transition: CampaignTransition): boolean {
  return (CAMPAIGN_TRANSITIONS[transition].from as readonly CampaignState[]).includes(state);
}

/** The science case: what the committee reads. Markdown in the justification, rendered safely. */
const ScienceCase = {
  title: z.string().trim().min(3, 'title needs at least 3 characters').max(200, 'title may have at most 200 characters'),
  abstract: z.string().trim().min(20, 'write an abstract of at least 20 characters').max(3000, 'abstract may have at most 3000 characters'),
  justification: z.string().trim().max(50_000, 'justification may have at most 50 000 characters').default(''),
};

export const CampaignInput = z
  .object({
    ...ScienceCase,
    groupId: z.uuid('choose the research group'),
    roundId: z.uuid('choose the allocation round'),
    machine: MachineName,
    spec: CampaignSpec,
  })
  .strict()
  .meta({ id: 'CampaignInput' });
export type CampaignInput = z.infer<typeof CampaignInput>;

/** A draft's changes; the group stays. Fields left out keep their values. */
export const CampaignPatch = z
  .object({
    title: ScienceCase.title,
    abstract: ScienceCase.abstract,
    justification: z.string().trim().max(50_000, 'justification may have at most 50 000 characters'),
    roundId: z.uuid('choose the allocation round'),
    machine: MachineName,
    spec: CampaignSpec,
  })
  .partial()
  .strict()
  .meta({ id: 'CampaignPatch' });
export type CampaignPatch = z.infer<typeof CampaignPatch>;

export const CampaignEvent = z
  .object({
    fromState: CampaignState.nullable(),
    toState: CampaignState,
    actorPersonId: z.uuid().nullable(),
    actorName: z.string().nullable(),
    note: z.string().nullable(),
    at: z.iso.datetime(),
  })
  .meta({ id: 'CampaignEvent' });
export type CampaignEvent = z.infer<typeof CampaignEvent>;

export const CampaignSummary = z
  .object({
    id: z.uuid(),
    title: z.string(),
    state: CampaignState,
    groupId: z.uuid(),
    groupName: z.string(),
    institutionName: z.string(),
    roundId: z.uuid(),
    roundName: z.string(),
    ownerPersonId: z.uuid(),
    ownerName: z.string(),
    machine: z.string(),
    method: Method,
    dimension: z.number().int(),
    symmetryClass: SymmetryClass,
    requestedCoreHours: z.number().int(),
    peakMemoryBytes: z.number(),
    warningCount: z.number().int(),
    createdAt: z.iso.datetime(),
    updatedAt: z.iso.datetime(),
    submittedAt: z.iso.datetime().nullable(),
  })
  .meta({ id: 'CampaignSummary' });
export type CampaignSummary = z.infer<typeof CampaignSummary>;

/** What the caller may do with this campaign now, so the portal shows only what will work. */
export const CampaignPermissions = z.object({
  edit: z.boolean(),
  submit: z.boolean(),
  withdraw: z.boolean(),
  startReview: z.boolean(),
  /** The office may decide (grant all, part, none). */
  decide: z.boolean(),
  /** Granted, and the caller is in the group or the office (tokens need the runs scope). */
  recordRuns: z.boolean(),
  /** Granted, and the caller is the group's PI or the office. */
  transfer: z.boolean(),
  /** Granted, and the caller is in the group or the office (tokens need the archives scope). */
  uploadResults: z.boolean(),
  /** The caller is in the group or the office: the science case and pilot timings go with the proposal. */
  attachFiles: z.boolean(),
  /** The group's PI or the office may withdraw a checked archive. */
  withdrawArchives: z.boolean(),
});
export type CampaignPermissions = z.infer<typeof CampaignPermissions>;

export const Campaign = CampaignSummary.extend({
  abstract: z.string(),
  justification: z.string(),
  spec: CampaignSpec,
  /** The estimate as the server computed it at the last save (see CampaignEstimate). */
  estimate: z.record(z.string(), z.unknown()),
  notices: z.array(Notice),
  /** Core-hours granted by the decision (0 when declined, null before it). The ledger has the balance. */
  grantedCoreHours: z.number().int().nullable(),
  history: z.array(CampaignEvent),
  can: CampaignPermissions,
}).meta({ id: 'Campaign' });
export type Campaign = Omit<z.infer<typeof Campaign>, 'estimate'> & { estimate: import('./cost-model').CampaignEstimate };

/** Optional note with a state change ("withdrawn: merged into another proposal"). */
export const TransitionNote = z.object({ note: z.string().trim().max(2000, 'a note may have at most 2000 characters').optional() }).strict().meta({ id: 'TransitionNote' });
export type TransitionNote = z.infer<typeof TransitionNote>;

/** Which campaigns a list shows: those you own, your groups', or all you may see. */
export const CAMPAIGN_SCOPES = ['mine', 'my-groups', 'all'] as const;

export const CampaignListQuery = listQuery(
  ['title', 'state', 'requestedCoreHours', 'createdAt', 'updatedAt', 'submittedAt', 'groupName', 'roundName'],
  {
    q: z.string().trim().max(100).optional(),
    scope: z.enum(CAMPAIGN_SCOPES).default('all'),
    state: CampaignState.optional(),
    roundId: z.uuid('roundId must be a round id').optional(),
    groupId: z.uuid('groupId must be a group id').optional(),
    method: Method.optional(),
    dimension: z.enum(['1', '2', '3'], { message: 'dimension must be 1, 2 or 3' }).transform(Number).optional(),
    symmetryClass: SymmetryClass.optional(),
  },
  '-updatedAt',
);
export type CampaignListQuery = z.infer<typeof CampaignListQuery>;

export const CampaignPage = page(CampaignSummary).meta({ id: 'CampaignPage' });
