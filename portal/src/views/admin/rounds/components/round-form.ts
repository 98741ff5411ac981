import type { Round, RoundInput, RoundPatch } from '@localis/shared';

/** One row of the pools editor; core-hours stay null until typed. */
export interface PoolRow {
  machine: string;
  coreHours: number | null;
}

/** What the round dialog edits: RoundInput's shape, with times as ISO text ('' when not chosen). */
export interface RoundForm {
  name: string;
  opensAt: string;
  closesAt: string;
  pools: PoolRow[];
  /** '' leaves the server's default: a year after the round closes. */
  allocationEndsAt: string;
  /** null leaves the server's default: 0 %, runs beyond a grant are refused. */
  overdraftPercent: number | null;
}

export const emptyPool = (): PoolRow => ({ machine: '', coreHours: null });

export function formOf(round: Round | null): RoundForm {
  return {
    name: round?.name ?? '',
    opensAt: round?.opensAt ?? '',
    closesAt: round?.closesAt ?? '',
    pools: round ? round.pools.map((p) => ({ machine: p.machine, coreHours: p.coreHours })) : [emptyPool()],
    allocationEndsAt: round?.allocationEndsAt ?? '',
    overdraftPercent: round?.overdraftPercent ?? null,
  };
}

/** What RoundInput checks: the optional policy fields left out while empty, so the defaults apply. */
export function roundInputOf(form: RoundForm): Record<string, unknown> {
  const { allocationEndsAt, overdraftPercent, ...rest } = form;
  return {
    ...rest,
    ...(allocationEndsAt ? { allocationEndsAt } : {}),
    ...(overdraftPercent === null ? {} : { overdraftPercent }),
  };
}

// The dialog's time boxes; kept importable from here for the round's own code and tests.
export { fromLocalInput, toLocalInput } from '../../../../lib/local-datetime';

interface Issue {
  path: readonly PropertyKey[];
  message: string;
  code?: string;
}

export interface PoolErrors {
  /** About the pools as a whole: none given, a machine twice. */
  list?: string;
  /** Per row, per field. */
  rows: Record<number, { machine?: string; coreHours?: string }>;
}

const MISSING: Record<'machine' | 'coreHours', string> = {
  machine: 'name the machine',
  coreHours: 'enter the core-hours of this pool',
};

/** Sorts the schema's (or the server's) issues about `pools` onto the editor's rows and fields. */
export function poolErrors(issues: readonly Issue[]): PoolErrors {
  const out: PoolErrors = { rows: {} };
  for (const issue of issues) {
    if (issue.path[0] !== 'pools') continue;
    const [, index, field] = issue.path;
    if (typeof index === 'number' && (field === 'machine' || field === 'coreHours')) {
      const row = (out.rows[index] ??= {});
      // An empty box reaches the schema as null: say what to do, not what type was expected.
      row[field] ??= issue.code === 'invalid_type' ? MISSING[field] : issue.message;
    } else {
      out.list ??= issue.message;
    }
  }
  return out;
}

const sameInstant = (a: string, b: string) => new Date(a).getTime() === new Date(b).getTime();
const samePools = (a: RoundInput['pools'], b: RoundInput['pools']) =>
  a.length === b.length && a.every((p, i) => p.machine === b[i].machine && p.coreHours === b[i].coreHours);

/** Only what changed, so a save never overwrites another admin's edit of another field. */
export function roundChanges(input: RoundInput, before: Round): RoundPatch {
  const patch: RoundPatch = {};
  if (input.name !== before.name) patch.name = input.name;
  if (!sameInstant(input.opensAt, before.opensAt)) patch.opensAt = input.opensAt;
  if (!sameInstant(input.closesAt, before.closesAt)) patch.closesAt = input.closesAt;
  if (!samePools(input.pools, before.pools)) patch.pools = input.pools;
  if (input.allocationEndsAt !== undefined && !sameInstant(input.allocationEndsAt, before.allocationEndsAt)) patch.allocationEndsAt = input.allocationEndsAt;
  if (input.overdraftPercent !== undefined && input.overdraftPercent !== before.overdraftPercent) patch.overdraftPercent = input.overdraftPercent;
  return patch;
}

/** The pools' total, counting only rows with a number. */
export function poolTotal(pools: readonly PoolRow[]): number {
  return pools.reduce((sum, p) => sum + (typeof p.coreHours === 'number' && Number.isFinite(p.coreHours) ? p.coreHours : 0), 0);
}
