import { randomBytes } from 'node:crypto';
import { Ledger, MAX_PAGE_SIZE, RunPage, type Run, type RunInput } from '@localis/shared';
import { CAMPAIGNS } from '../../../seeds/src/campaigns-scenario';
import { demoToken } from './cli-harness';

/** A campaign of the demo scenario that is granted, with a member of its group who records runs. */
export interface GrantedDemoCampaign {
  id: string;
  title: string;
  machine: string;
  recorder: string;
}

function granted(title: string, recorder: string): GrantedDemoCampaign {
  const c = CAMPAIGNS.find((campaign) => campaign.input.title === title);
  if (!c?.decision) throw new Error(`the demo scenario has no decided campaign "${title}"`);
  return { id: c.id, title, machine: c.input.machine, recorder };
}

/**
 * Two granted campaigns, one per test file: vitest runs files in parallel, and a file that reads
 * the remaining grant before and after its own run must be the only one charging that grant.
 */
export const DEVICE_MODELLING = granted('Disorder-limited density of states in nanowire channels', 'sofia.lindqvist@orrin-qd.example');
export const QUANTUM_TRANSPORT = granted('Conductance at the 3D unitary critical point', 'priya.raman@kestrel.example');
/** Submitted, not granted; Ines Albrecht's own, so she sees it. */
export const SUBMITTED_PROPOSAL = CAMPAIGNS.find((c) => c.state === 'submitted')!;
export const COMMITTEE_MEMBER = 'aiko.tanaka@brennmoor.example';

/**
 * A job id no earlier test run can have used: the tests run again and again against the same
 * database (the demo stack's, or `npm test`'s), and a job is charged once per machine.
 */
export const freshJobId = () => `cli-test-${Date.now().toString(36)}-${randomBytes(4).toString('hex')}`;

/**
 * A run of 1 core for 36 s, 0.01 core-hours: so small that repeated test runs never use up a
 * demo grant. It started an hour ago, to the second, so that the options and the JSON agree.
 */
export function tinyRun(machine: string, jobId = freshJobId()): { input: RunInput; options: string[] } {
  const start = new Date(Math.floor(Date.now() / 1000) * 1000 - 3_600_000);
  const end = new Date(start.getTime() + 36_000);
  const input: RunInput = {
    externalJobId: jobId,
    machine,
    startedAt: start.toISOString(),
    endedAt: end.toISOString(),
    cores: 1,
    codeName: 'tmm',
    codeVersion: 'cli-test',
    parameters: { sizes: [], disorder: [], energies: [], seeds: [] },
  };
  const options = ['--job', jobId, '--machine', machine, '--start', input.startedAt, '--end', input.endedAt, '--cores', '1', '--code', 'tmm', '--code-version', 'cli-test'];
  return { input, options };
}

/** GET from the api with a demo person's token, as a script beside the CLI would. */
async function apiGet(email: string, path: string): Promise<unknown> {
  const res = await fetch(`${process.env.PUBLIC_URL}/api/v1${path}`, { headers: { authorization: `Bearer ${demoToken(email)}`, accept: 'application/json' } });
  if (!res.ok) throw new Error(`GET ${path} answered ${res.status}: ${await res.text()}`);
  return res.json();
}

/** The campaign's ledger as the api answers it: balances and every entry. */
export async function ledgerOf(campaign: GrantedDemoCampaign): Promise<Ledger> {
  return Ledger.parse(await apiGet(campaign.recorder, `/campaigns/${campaign.id}/ledger`));
}

/** Every run of the campaign, newest first, read page by page. */
export async function runsOf(campaign: GrantedDemoCampaign): Promise<Run[]> {
  const runs: Run[] = [];
  for (;;) {
    const query = new URLSearchParams({ sort: '-startedAt', limit: String(MAX_PAGE_SIZE), offset: String(runs.length) });
    const page = RunPage.parse(await apiGet(campaign.recorder, `/campaigns/${campaign.id}/runs?${query}`));
    runs.push(...page.items);
    if (page.items.length < MAX_PAGE_SIZE) return runs;
  }
}

/** The ledger entries of one job: its debit, and refunds if any. */
export const entriesOfJob = (ledger: Ledger, jobId: string) => ledger.entries.filter((e) => e.externalJobId === jobId);
