import { z } from 'zod';
import { listQuery, page } from '../lists';

/** A machine's name inside Localis: short, lower case, safe in URLs and CSV. */
export const MachineName = z
  .string()
  .trim()
  .regex(/^[a-z0-9][a-z0-9-]{1,39}$/, 'machine names are 2–40 lower-case letters, digits and hyphens, e.g. cluster-a');

export const RoundPool = z
  .object({
    machine: MachineName,
    coreHours: z.number().int('core-hours must be a whole number').min(1, 'a pool needs at least 1 core-hour').max(1e12, 'that pool is larger than Localis accepts (10^12 core-hours)'),
  })
  .strict()
  .meta({ id: 'RoundPool' });
export type RoundPool = z.infer<typeof RoundPool>;

/** Where a round stands at a moment: before it opens, open for proposals, closed. */
export const ROUND_STATUSES = ['upcoming', 'open', 'closed'] as const;
export const RoundStatus = z.enum(ROUND_STATUSES);
export type RoundStatus = z.infer<typeof RoundStatus>;

export function roundStatus(round: { opensAt: string; closesAt: string }, now = new Date()): RoundStatus {
  if (now < new Date(round.opensAt)) return 'upcoming';
  return now <= new Date(round.closesAt) ? 'open' : 'closed';
}

export const Round = z
  .object({
    id: z.uuid(),
    name: z.string(),
    opensAt: z.iso.datetime(),
    closesAt: z.iso.datetime(),
    /** Grants of the round can be used until then; what is left expires. */
    allocationEndsAt: z.iso.datetime(),
    /** How far below zero a run may take a grant, in % of the grant (0 = refuse such runs). */
    overdraftPercent: z.number().int(),
    status: RoundStatus,
    pools: z.array(RoundPool),
    totalCoreHours: z.number().int(),
    campaignCount: z.number().int(),
    createdAt: z.iso.datetime(),
  })
  .meta({ id: 'Round' });
export type Round = z.infer<typeof Round>;

const poolsField = z
  .array(RoundPool)
  .min(1, 'a round needs a pool of core-hours on at least one machine')
  .max(50)
  .refine((pools) => new Set(pools.map((p) => p.machine)).size === pools.length, 'each machine may have only one pool');

const RoundFields = z.object({
  name: z.string().trim().min(3, 'name needs at least 3 characters').max(120),
  opensAt: z.iso.datetime({ offset: true, message: 'opens must be a date and time, e.g. 2027-01-15T00:00:00Z' }),
  closesAt: z.iso.datetime({ offset: true, message: 'closes must be a date and time, e.g. 2027-03-31T23:59:59Z' }),
  pools: poolsField,
  /** Left out when creating: a year after the round closes. */
  allocationEndsAt: z.iso.datetime({ offset: true, message: 'allocation ends must be a date and time, e.g. 2028-03-31T23:59:59Z' }).optional(),
  /** Left out when creating: 0, runs beyond the grant are refused. */
  overdraftPercent: z.number().int('a whole percentage').min(0, 'the overdraft is 0 % or more').max(50, 'an overdraft may be at most 50 % of a grant').optional(),
});

/** Default end of the allocation period: a year after the round closes. */
export const DEFAULT_ALLOCATION_DAYS = 365;

const closesAfterOpens = (r: { opensAt?: string; closesAt?: string; allocationEndsAt?: string }, ctx: z.RefinementCtx) => {
  if (r.opensAt && r.closesAt && new Date(r.closesAt) <= new Date(r.opensAt)) {
    ctx.addIssue({ code: 'custom', path: ['closesAt'], message: 'a round must close after it opens' });
  }
  if (r.closesAt && r.allocationEndsAt && new Date(r.allocationEndsAt) <= new Date(r.closesAt)) {
    ctx.addIssue({ code: 'custom', path: ['allocationEndsAt'], message: 'the allocation period must end after the round closes' });
  }
};

export const RoundInput = RoundFields.strict().superRefine(closesAfterOpens).meta({ id: 'RoundInput' });
export type RoundInput = z.infer<typeof RoundInput>;

export const RoundPatch = RoundFields.partial().strict().superRefine(closesAfterOpens).meta({ id: 'RoundPatch' });
export type RoundPatch = z.infer<typeof RoundPatch>;

export const RoundListQuery = listQuery(['name', 'opensAt', 'closesAt', 'createdAt'], {
  q: z.string().trim().max(100).optional(),
  status: RoundStatus.optional(),
}, '-opensAt');
export type RoundListQuery = z.infer<typeof RoundListQuery>;

export const RoundPage = page(Round).meta({ id: 'RoundPage' });
