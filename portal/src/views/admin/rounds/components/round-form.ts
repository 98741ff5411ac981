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
}

export const emptyPool = (): PoolRow => ({ machine: '', coreHours: null });

export function formOf(round: Round | null): RoundForm {
  return {
    name: round?.name ?? '',
    opensAt: round?.opensAt ?? '',
    closesAt: round?.closesAt ?? '',
    pools: round ? round.pools.map((p) => ({ machine: p.machine, coreHours: p.coreHours })) : [emptyPool()],
  };
}

/**
 * An ISO time as a `datetime-local` box shows it (the reader's local time, to the minute), and
 * back. A native box rather than the component library's date picker: that one drops typed
 * date-times in 24-hour mode, so only a mouse could set a round's dates.
 */
export function toLocalInput(iso: string): string {
  if (!iso) return '';
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return '';
  const two = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${two(d.getMonth() + 1)}-${two(d.getDate())}T${two(d.getHours())}:${two(d.getMinutes())}`;
}

/** A `datetime-local` value (local time) as ISO UTC; '' when empty or not a time. */
export function fromLocalInput(value: string): string {
  if (!value) return '';
  const d = new Date(value);
  return Number.isNaN(d.getTime()) ? '' : d.toISOString();
}

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
  return patch;
}

/** The pools' total, counting only rows with a number. */
export function poolTotal(pools: readonly PoolRow[]): number {
  return pools.reduce((sum, p) => sum + (typeof p.coreHours === 'number' && Number.isFinite(p.coreHours) ? p.coreHours : 0), 0);
}
