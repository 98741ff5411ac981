import { z } from 'zod';
import { LEDGER_KINDS } from './ledger-math';

export const LedgerKind = z.enum(LEDGER_KINDS).meta({ id: 'LedgerKind' });
export type LedgerKind = z.infer<typeof LedgerKind>;

export const LEDGER_KIND_LABELS: Record<z.infer<typeof LedgerKind>, string> = {
  grant: 'Grant',
  debit: 'Run',
  refund: 'Refund',
  adjustment: 'Adjustment',
  transfer: 'Transfer',
  expiry: 'Expiry',
};

/** One ledger entry as the api returns it. Core-hours are numbers with up to three decimals. */
export const LedgerEntry = z
  .object({
    id: z.string(),
    campaignId: z.uuid(),
    kind: LedgerKind,
    /** Signed: what the entry adds to the remaining balance. */
    coreHours: z.number(),
    /** The remaining balance just after this entry. */
    balanceAfter: z.number(),
    runId: z.uuid().nullable(),
    externalJobId: z.string().nullable(),
    /** For a transfer, the campaign on the other side. */
    counterpartCampaignId: z.uuid().nullable(),
    counterpartTitle: z.string().nullable(),
    reason: z.string().nullable(),
    /** A debit written under the round's overdraft allowance, below zero. */
    overdraft: z.boolean(),
    actorName: z.string().nullable(),
    createdAt: z.iso.datetime(),
  })
  .meta({ id: 'LedgerEntry' });
export type LedgerEntry = z.infer<typeof LedgerEntry>;

export const Ledger = z
  .object({
    campaignId: z.uuid(),
    granted: z.number(),
    used: z.number(),
    expired: z.number(),
    remaining: z.number(),
    /** How far below zero debits may go under the round's policy (0 = refuse). */
    overdraftPercent: z.number().int(),
    overdraftAllowance: z.number(),
    /** Usage thresholds (75, 90, 100 %) already reached and alerted. */
    alerted: z.array(z.number().int()),
    entries: z.array(LedgerEntry),
  })
  .meta({ id: 'Ledger' });
export type Ledger = z.infer<typeof Ledger>;

const Reason = z.string().trim().min(3, 'give a reason of at least 3 characters').max(2000, 'a reason may have at most 2000 characters');
const CoreHoursAmount = z
  .number({ message: 'core-hours must be a number' })
  .refine(Number.isFinite, 'core-hours must be a finite number')
  .refine((v) => Math.abs(v) <= 1e12, 'that is more core-hours than Localis accepts (10^12)')
  .refine((v) => Math.abs(v * 1000 - Math.round(v * 1000)) < 1e-6, 'core-hours have at most three decimals');

export const AdjustmentInput = z
  .object({
    coreHours: CoreHoursAmount.refine((v) => v !== 0, 'an adjustment of 0 changes nothing'),
    reason: Reason,
  })
  .strict()
  .meta({ id: 'AdjustmentInput' });
export type AdjustmentInput = z.infer<typeof AdjustmentInput>;

export const TransferInput = z
  .object({
    toCampaignId: z.uuid('choose the campaign that receives the core-hours'),
    coreHours: CoreHoursAmount.refine((v) => v > 0, 'transfer a positive number of core-hours'),
    reason: Reason,
  })
  .strict()
  .meta({ id: 'TransferInput' });
export type TransferInput = z.infer<typeof TransferInput>;

export const RefundInput = z
  .object({
    runId: z.uuid('choose the run to refund'),
    /** Left out: whatever of the run's debit is not refunded yet. */
    coreHours: CoreHoursAmount.refine((v) => v > 0, 'refund a positive number of core-hours').optional(),
    reason: Reason,
  })
  .strict()
  .meta({ id: 'RefundInput' });
export type RefundInput = z.infer<typeof RefundInput>;

/** A round's pool on one machine and what its campaigns hold of it, by group. */
export const PoolGroupUsage = z.object({
  groupId: z.uuid(),
  groupName: z.string(),
  granted: z.number(),
  used: z.number(),
  remaining: z.number(),
});
export const PoolUsage = z
  .object({
    roundId: z.uuid(),
    machine: z.string(),
    pool: z.number(),
    granted: z.number(),
    used: z.number(),
    remaining: z.number(),
    /** pool - granted: what the office can still grant. */
    unallocated: z.number(),
    groups: z.array(PoolGroupUsage),
  })
  .meta({ id: 'PoolUsage' });
export type PoolUsage = z.infer<typeof PoolUsage>;

export const RoundUsage = z.object({ roundId: z.uuid(), pools: z.array(PoolUsage) }).meta({ id: 'RoundUsage' });
export type RoundUsage = z.infer<typeof RoundUsage>;
