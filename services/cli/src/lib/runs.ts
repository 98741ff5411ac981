import { detailsFromZod, MAX_PAGE_SIZE, Run, RunPage } from '@localis/shared';
import { ApiClient } from './api-client';
import { CliError, EXIT, isCliError } from './cli-error';
import { resolveConnection } from './connection';
import { formatRecordedRun, formatRunList, LedgerBalance } from './format-runs';
import { terminalOutput, type Output } from './output';
import { checkCampaignId, checkIdempotencyKey, readRun, RUN_FLAG_NAMES, runIdempotencyKey, type RunFlags } from './run-input';

export interface AddRunOptions extends RunFlags {
  campaign: string;
  /** A RunInput JSON file, or `-` for standard input, instead of the run options. */
  file?: string;
  idempotencyKey?: string;
  json: boolean;
  profile: string;
}

/**
 * Record one run on a campaign: checked here first, then sent with an Idempotency-Key so that
 * sending it again (a timeout, a retried batch step) does not charge the grant twice.
 */
export async function addRun(opts: AddRunOptions, io: Output = terminalOutput, env: NodeJS.ProcessEnv = process.env): Promise<void> {
  const campaignId = checkCampaignId(opts.campaign);
  const flagsGiven = RUN_FLAG_NAMES.filter((name) => opts[name] !== undefined);
  if (opts.file !== undefined && flagsGiven.length) {
    throw new CliError(`give the run either with --file or with options, not both (--file came with ${flagsGiven.map(optionName).join(', ')}).`, { exitCode: EXIT.usage });
  }
  const key = opts.idempotencyKey === undefined ? undefined : checkIdempotencyKey(opts.idempotencyKey);
  const run = await readRun(opts.file === undefined ? { kind: 'flags', flags: opts } : { kind: 'file', path: opts.file });

  // Only now, with a valid run, is a token needed: a typo is reported even on a node with no sign-in.
  const client = new ApiClient(resolveConnection({ profile: opts.profile }, env));
  const headers = { 'idempotency-key': key ?? runIdempotencyKey(campaignId, run) };
  const path = `/campaigns/${campaignId}/runs`;
  let replayed = false;
  const onHeaders = (h: Headers) => void (replayed = h.get('idempotent-replayed') === 'true');
  if (opts.json) {
    // The portal's own answer, untouched, for scripts and jq.
    io.out(JSON.stringify(await client.request('POST', path, { body: run, headers }), null, 2));
    return;
  }
  const recorded = await client.request('POST', path, { body: run, schema: Run, headers, onHeaders });
  if (replayed) io.note('this run was recorded by an earlier attempt with the same Idempotency-Key; it is charged once, not again.');
  let balance: LedgerBalance | null = null;
  try {
    balance = await client.get(`/campaigns/${campaignId}/ledger`, LedgerBalance);
  } catch (e) {
    // The run is recorded; failing now would only invite a retry of something that worked.
    io.note(`the run is recorded, but the remaining grant could not be read: ${isCliError(e) ? e.message : String(e)}`);
  }
  io.out(formatRecordedRun(recorded, balance));
}

export interface ListRunsOptions {
  campaign: string;
  /** Show at most this many, newest first; all when left out. */
  limit?: string;
  json: boolean;
  profile: string;
}

/** The runs recorded on a campaign, newest first, page by page until all (or `--limit`) are read. */
export async function listRuns(opts: ListRunsOptions, io: Output = terminalOutput, env: NodeJS.ProcessEnv = process.env): Promise<void> {
  const campaignId = checkCampaignId(opts.campaign);
  const limit = opts.limit === undefined ? Infinity : checkLimit(opts.limit);
  const client = new ApiClient(resolveConnection({ profile: opts.profile }, env));
  const runs: Run[] = [];
  const raw: unknown[] = [];
  let total = 0;
  do {
    const size = Math.min(MAX_PAGE_SIZE, limit - runs.length);
    const query = new URLSearchParams({ sort: '-startedAt', limit: String(size), offset: String(runs.length) });
    const answer = await client.get(`/campaigns/${campaignId}/runs?${query}`);
    const page = RunPage.safeParse(answer);
    if (!page.success) {
      throw new CliError(`the answer of ${client.url} to GET /api/v1/campaigns/${campaignId}/runs is not what this CLI expects; update the CLI or check --url.`, {
        details: detailsFromZod(page.error),
      });
    }
    runs.push(...page.data.items);
    raw.push(...(answer as { items: unknown[] }).items);
    total = page.data.total;
    // A page shorter than asked means the list ended, even if runs were added meanwhile.
    if (page.data.items.length < size) break;
  } while (runs.length < Math.min(total, limit));
  if (opts.json) io.out(JSON.stringify(raw, null, 2));
  else io.out(formatRunList(runs, total));
}

function checkLimit(text: string): number {
  const n = Number(text);
  if (!/^\d+$/.test(text.trim()) || n < 1) {
    throw new CliError(`--limit takes a whole number of runs, 1 or more (read "${text}").`, { exitCode: EXIT.usage });
  }
  return n;
}

const optionName = (flag: string) => `--${flag.replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`)}`;
