import { createHash } from 'node:crypto';
import { z } from 'zod';
import { detailsFromZod, RunInput, type ErrorDetail } from '@localis/shared';
import { CliError, EXIT } from './cli-error';
import { parseJson } from './parse-json';
import { readInput } from './read-input';

/** The options of `localis runs add` that describe the run, as commander hands them over (text). */
export interface RunFlags {
  job?: string;
  machine?: string;
  start?: string;
  end?: string;
  cores?: string;
  coreHours?: string;
  code?: string;
  codeVersion?: string;
  sizes?: string;
  disorder?: string;
  energies?: string;
  seeds?: string;
}

type ScalarFlag = Exclude<keyof RunFlags, ListFlag>;
type ListFlag = 'sizes' | 'disorder' | 'energies' | 'seeds';

/** Which option gives which field, so a problem is reported with the option the person typed. */
const SCALAR_FIELDS: Record<ScalarFlag, { field: string; option: string; numeric: boolean; required: boolean }> = {
  job: { field: 'externalJobId', option: '--job', numeric: false, required: true },
  machine: { field: 'machine', option: '--machine', numeric: false, required: true },
  start: { field: 'startedAt', option: '--start', numeric: false, required: true },
  end: { field: 'endedAt', option: '--end', numeric: false, required: true },
  cores: { field: 'cores', option: '--cores', numeric: true, required: true },
  coreHours: { field: 'coreHours', option: '--core-hours', numeric: true, required: false },
  code: { field: 'codeName', option: '--code', numeric: false, required: true },
  codeVersion: { field: 'codeVersion', option: '--code-version', numeric: false, required: true },
};
const LIST_FLAGS: ListFlag[] = ['sizes', 'disorder', 'energies', 'seeds'];

export const RUN_FLAG_NAMES = [...(Object.keys(SCALAR_FIELDS) as ScalarFlag[]), ...LIST_FLAGS];

/** A decimal number as people type it; Number() alone would take "", "0x10" and "Infinity". */
const DECIMAL = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;
const numberOrText = (text: string): number | string => (DECIMAL.test(text.trim()) ? Number(text) : text);

/** Where a run to record comes from: options, or a RunInput JSON file. */
export type RunSource = { kind: 'flags'; flags: RunFlags } | { kind: 'file'; path: string };

/**
 * The run as RunInput accepts it, checked here before anything is sent: a mistake on a login node
 * is cheaper to see at once than as a refusal from the portal (or, worse, as a wrong charge).
 * Every problem is listed with its field; exit code 2.
 */
export async function readRun(source: RunSource): Promise<RunInput> {
  if (source.kind === 'file') return readRunFile(source.path);
  return runFromFlags(source.flags);
}

export function runFromFlags(flags: RunFlags): RunInput {
  const missing = (Object.keys(SCALAR_FIELDS) as ScalarFlag[]).filter((f) => SCALAR_FIELDS[f].required && flags[f] === undefined);
  if (missing.length) {
    throw new CliError(`a run needs ${missing.map((f) => SCALAR_FIELDS[f].option).join(', ')}; nothing was sent.`, {
      exitCode: EXIT.usage,
      hint: 'Give every one of them, or the whole run as JSON with --file run.json (see `localis runs add --help`).',
    });
  }

  const candidate: Record<string, unknown> = {};
  for (const flag of Object.keys(SCALAR_FIELDS) as ScalarFlag[]) {
    const text = flags[flag];
    if (text === undefined) continue;
    candidate[SCALAR_FIELDS[flag].field] = SCALAR_FIELDS[flag].numeric ? numberOrText(text) : text;
  }
  const listProblems: ErrorDetail[] = [];
  const parameters: Record<string, number[]> = {};
  /** For each list, the position in the option's text of each number handed to the schema. */
  const positions: Partial<Record<ListFlag, number[]>> = {};
  for (const flag of LIST_FLAGS) {
    const text = flags[flag];
    if (text === undefined) continue;
    const items = text.split(/[\s,;]+/).filter(Boolean);
    items.forEach((item, i) => {
      if (!DECIMAL.test(item)) listProblems.push({ path: ['parameters', flag, i], message: `"${item}" is not a number (--${flag} "${text}")` });
    });
    // Only the numbers go on to the schema, so each bad item is reported once, by the line above.
    positions[flag] = items.flatMap((item, i) => (DECIMAL.test(item) ? [i] : []));
    parameters[flag] = items.filter((item) => DECIMAL.test(item)).map(Number);
  }
  candidate.parameters = parameters;

  const parsed = RunInput.safeParse(candidate);
  const schemaProblems = parsed.success ? [] : detailsFromZod(parsed.error).map((d) => withOption(d, flags, positions));
  if (!parsed.success || listProblems.length) {
    const problems = [...listProblems, ...schemaProblems];
    const timeFormat = problems.some((d) => (d.path[0] === 'startedAt' || d.path[0] === 'endedAt') && d.message.includes('must be a date and time'));
    throw new CliError('the run is not valid; nothing was sent:', {
      exitCode: EXIT.usage,
      details: problems,
      hint: timeFormat
        ? 'Times need a zone: 2027-02-01T08:00:00Z (UTC) or 2027-02-01T09:00:00+01:00; `date -Iseconds` prints one.'
        : 'The options and an example are in `localis runs add --help`.',
    });
  }
  return normaliseTimes(parsed.data);
}

/** Add the option and what it read to a schema problem, e.g. `cores: a run uses at least 1 core (--cores "0")`. */
function withOption(detail: ErrorDetail, flags: RunFlags, positions: Partial<Record<ListFlag, number[]>>): ErrorDetail {
  const [first, second, index] = detail.path;
  if (first === 'parameters' && LIST_FLAGS.includes(second as ListFlag)) {
    const flag = second as ListFlag;
    // The index in the option's text, not among the numbers the schema saw.
    const path = typeof index === 'number' ? ['parameters', flag, positions[flag]?.[index] ?? index, ...detail.path.slice(3)] : detail.path;
    return { path, message: `${detail.message} (--${flag} "${flags[flag]}")` };
  }
  const flag = (Object.keys(SCALAR_FIELDS) as ScalarFlag[]).find((f) => SCALAR_FIELDS[f].field === first);
  if (!flag) return detail;
  return { ...detail, message: `${detail.message} (${SCALAR_FIELDS[flag].option} "${flags[flag]}")` };
}

async function readRunFile(path: string): Promise<RunInput> {
  const input = await readInput(path, 'run');
  const raw = parseJson(input.text, input.name);
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) {
    throw new CliError(`${input.name} holds ${Array.isArray(raw) ? 'an array' : `a ${raw === null ? 'null' : typeof raw}`}, not a run; it should be one JSON object.`, {
      exitCode: EXIT.usage,
      hint: 'See `localis runs add --help` for an example.',
    });
  }
  const parsed = RunInput.safeParse(raw);
  if (!parsed.success) {
    throw new CliError(`${input.name} is not a valid run; nothing was sent:`, {
      exitCode: EXIT.usage,
      details: detailsFromZod(parsed.error),
      hint: 'The fields and an example are in `localis runs add --help`.',
    });
  }
  return normaliseTimes(parsed.data);
}

/** Times go out in UTC, as everywhere on the wire; the same run typed in two zones is then one body and one key. */
function normaliseTimes(run: RunInput): RunInput {
  return { ...run, startedAt: new Date(run.startedAt).toISOString(), endedAt: new Date(run.endedAt).toISOString() };
}

/** JSON with object keys in a fixed order, so the key does not depend on how a file was written. */
function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  if (value && typeof value === 'object') {
    const entries = Object.entries(value).filter(([, v]) => v !== undefined);
    entries.sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
  }
  return JSON.stringify(value);
}

/**
 * The Idempotency-Key of recording `run` on a campaign: the SHA-256 of both. Sending the same
 * command again after a timeout or a dropped connection gives the same key, and the portal answers
 * with the run it already recorded instead of charging the grant twice.
 */
export function runIdempotencyKey(campaignId: string, run: RunInput): string {
  const digest = createHash('sha256').update(canonicalJson({ campaignId: campaignId.toLowerCase(), run })).digest('hex');
  return `run-${digest}`;
}

/** What a header value and the portal's key column take: visible ASCII, no spaces. */
const IdempotencyKeyText = z.string().regex(/^[\x21-\x7e]{1,200}$/);

export function checkIdempotencyKey(key: string): string {
  if (!IdempotencyKeyText.safeParse(key).success) {
    throw new CliError(`--idempotency-key "${key}" cannot be used: give 1 to 200 visible ASCII characters without spaces.`, { exitCode: EXIT.usage });
  }
  return key;
}

const CampaignId = z.uuid();

export function checkCampaignId(id: string): string {
  if (!CampaignId.safeParse(id.trim()).success) {
    throw new CliError(`--campaign "${id}" is not a campaign id; it looks like 3f2c8a4e-0b1d-4e6f-9a7b-2c5d8e1f4a6b.`, {
      exitCode: EXIT.usage,
      hint: "The id is at the end of the campaign page's address in the portal (…/campaigns/<id>).",
    });
  }
  return id.trim().toLowerCase();
}
