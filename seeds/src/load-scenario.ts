import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { hashToken } from '@localis/api/tokens';
import { createServices, type Services } from '@localis/api/services';
import type { Database } from '@localis/api/db';
import { CampaignInput, TOKEN_SCOPES, type Settings } from '@localis/shared';
import { ApiToken, Campaign, Institution, Person, ResearchGroup, Round } from '@localis/api/db';
import { GROUPS, INSTITUTIONS, PEOPLE } from './scenario';
import { CAMPAIGNS, ROUNDS } from './campaigns-scenario';
import { loadReviews, type ReviewCounts } from './load-reviews';
import { loadInvoices, type InvoiceCounts } from './load-invoices';
import { loadResults, type ResultCounts } from './load-results';
import { loadRuns, type RunCounts } from './load-runs';
import { adminContext, personContext, scenarioPerson, SEED_CONTEXT } from './seed-context';

/** What a load added; all zero when the scenario was loaded already. */
export interface LoadReport extends ReviewCounts, RunCounts, ResultCounts, InvoiceCounts {
  institutions: number;
  people: number;
  groups: number;
  members: number;
  tokens: number;
  rounds: number;
  campaigns: number;
}

const EMPTY_REPORT: Readonly<LoadReport> = {
  institutions: 0, people: 0, groups: 0, members: 0, tokens: 0, rounds: 0, campaigns: 0, assignments: 0, conflicts: 0, reviews: 0, runs: 0, refunds: 0, adjustments: 0, archives: 0, invoices: 0,
};

/**
 * Load the demo scenario through the services, so every rule, audit entry, ledger entry and
 * notification applies. Repeatable: what exists (by fixed id, or looked up where the services
 * make the id) is left alone, so a second load changes nothing.
 */
export async function loadScenario(db: Database, settings: Settings): Promise<LoadReport> {
  const services = createServices(db, settings);
  const report: LoadReport = { ...EMPTY_REPORT };

  for (const i of INSTITUTIONS) {
    if (await Institution.findByPk(i.id)) continue;
    await services.institutions.create(SEED_CONTEXT, { name: i.name, kind: i.kind, country: i.country, billingEmail: i.billingEmail }, i.id);
    report.institutions++;
  }
  for (const p of PEOPLE) {
    if (await Person.findByPk(p.id)) continue;
    await services.people.create(SEED_CONTEXT, { name: p.name, email: p.email, institutionId: p.institutionId, roles: p.roles }, p.id);
    report.people++;
  }
  for (const g of GROUPS) {
    if (!(await ResearchGroup.findByPk(g.id))) {
      await services.groups.create(SEED_CONTEXT, { name: g.name, institutionId: g.institutionId, piPersonId: g.piPersonId }, g.id);
      report.groups++;
    }
    const detail = await services.groups.get(adminContext(), g.id);
    for (const memberId of g.memberIds) {
      if (detail.members.some((m) => m.personId === memberId)) continue;
      await services.groups.addMember(adminContext(), g.id, memberId);
      report.members++;
    }
  }
  report.tokens = await ensureDemoTokens(services, settings);
  await loadRoundsAndCampaigns(services, report);
  await loadRuns(services, report);
  await loadInvoices(db, services, settings, report);
  await loadResults(services, settings, report);
  return report;
}

const monthsFrom = (start: Date, months: number) => new Date(Date.UTC(start.getUTCFullYear(), start.getUTCMonth() + months, 1)).toISOString();

/**
 * Rounds and campaigns go through the same services as people do: drafted by their owners,
 * submitted by their PIs, reviewed by the committee and decided by the office. A closed round is
 * loaded open, its campaigns decided, and then closed, as it would have happened.
 */
async function loadRoundsAndCampaigns(services: Services, report: LoadReport): Promise<void> {
  const monthStart = new Date();
  const admin = adminContext();
  for (const r of ROUNDS) {
    if (await Round.findByPk(r.id)) continue;
    const closesMonths = r.closesMonths < 1 ? 1 : r.closesMonths;
    await services.rounds.create(
      admin,
      { name: r.name, opensAt: monthsFrom(monthStart, r.opensMonths), closesAt: monthsFrom(monthStart, closesMonths), allocationEndsAt: monthsFrom(monthStart, r.allocationEndsMonths), pools: r.pools },
      r.id,
    );
    report.rounds++;
  }
  // A database loaded by an older scenario may miss campaigns of a round closed since: the round
  // is opened again for them, as the office would, and closed below once they are decided.
  for (const r of ROUNDS.filter((r) => r.closesMonths < 1)) {
    const missing = await Promise.all(CAMPAIGNS.filter((c) => c.roundId === r.id).map(async (c) => !(await Campaign.findByPk(c.id, { attributes: ['id'] }))));
    if (!missing.some(Boolean)) continue;
    const round = await services.rounds.get(r.id);
    if (round.status === 'closed') await services.rounds.update(admin, r.id, { closesAt: monthsFrom(monthStart, 1) });
  }
  for (const c of CAMPAIGNS) {
    let current = await Campaign.findByPk(c.id);
    if (!current) {
      const owner = personContext(scenarioPerson(c.ownerId));
      await services.campaigns.create(owner, CampaignInput.parse({ ...c.input, roundId: c.roundId }), c.id);
      report.campaigns++;
      current = (await Campaign.findByPk(c.id))!;
    }
    await advance(services, c, Number(current.requestedCoreHours), report);
  }
  // Rounds that lie in the past close once their campaigns have been decided (also after a load
  // that stopped half-way: whatever is still open that should not be is closed now).
  for (const r of ROUNDS.filter((r) => r.closesMonths < 1)) {
    const round = await services.rounds.get(r.id);
    if (round.status !== 'closed') await services.rounds.update(admin, r.id, { closesAt: monthsFrom(monthStart, r.closesMonths) });
  }
}

const BEFORE_DECISION = ['submitted', 'in-review'];
const stateOf = async (id: string) => (await Campaign.findByPk(id, { attributes: ['state'] }))!.state;

/**
 * Move a demo campaign from where it stands to where the story has it, one step at a time through
 * the services, so a load that stopped half-way finishes the story when run again: the PI submits,
 * the office assigns reviewers (which puts the proposal in review) and the committee reviews
 * (`loadReviews`), then the office decides.
 */
async function advance(services: Services, c: (typeof CAMPAIGNS)[number], requested: number, report: LoadReport): Promise<void> {
  const admin = adminContext();
  let state = await stateOf(c.id);
  if (c.state === 'withdrawn') {
    if (state !== 'withdrawn') await services.campaigns.withdraw(personContext(scenarioPerson(c.ownerId)), c.id, c.withdrawNote ?? null);
    return;
  }
  if (state === 'draft' && c.state !== 'draft') {
    const group = GROUPS.find((g) => g.id === c.input.groupId)!;
    await services.campaigns.submit(personContext(scenarioPerson(group.piPersonId)), c.id);
    state = 'submitted';
  }
  const reviewed = c.state === 'in-review' || !!c.decision;
  if (!reviewed || !BEFORE_DECISION.includes(state)) return;
  const planned = await loadReviews(services, c.id, requested, report);
  // A proposal the story gives no reviews still goes through review before its decision.
  if (!planned && state === 'submitted') await services.campaigns.startReview(admin, c.id);
  if (c.decision) {
    const outcome = c.state === 'granted' ? 'grant-all' : c.state === 'declined' ? 'decline' : 'grant-part';
    await services.reviews.decide(admin, c.id, { outcome, coreHours: outcome === 'grant-part' ? Math.round(requested * c.decision.grantedShare) : undefined, message: c.decision.message });
  }
}

/**
 * Each demo person gets an API token, written to DATA_DIR/demo-tokens.json as
 * { "<e-mail>": "<token>" } so the CLI and scripts can be tried at once. Kept while valid.
 */
async function ensureDemoTokens(services: Services, settings: Settings): Promise<number> {
  const file = join(settings.DATA_DIR, 'demo-tokens.json');
  const existing: Record<string, string> = existsSync(file) ? JSON.parse(readFileSync(file, 'utf8')) : {};
  const result: Record<string, string> = {};
  let created = 0;
  for (const p of PEOPLE) {
    const known = existing[p.email];
    if (known) {
      const row = await ApiToken.findOne({ where: { tokenHash: hashToken(known) } });
      if (row && !row.revokedAt && row.expiresAt.getTime() > Date.now() + 86_400_000) {
        result[p.email] = known;
        continue;
      }
    }
    const person = await services.people.get(adminContext(), p.id);
    const ctx = {
      ...SEED_CONTEXT,
      principal: { personId: p.id, name: p.name, email: p.email, institutionId: p.institutionId, roles: person.roles, scopes: [...TOKEN_SCOPES], via: 'system' as const },
    };
    const scopes = TOKEN_SCOPES.filter((s) => s !== 'admin' || person.roles.includes('admin'));
    const { secret } = await services.tokens.create(ctx, { name: 'demo token', scopes, expiresInDays: 366 });
    result[p.email] = secret;
    created++;
  }
  mkdirSync(dirname(file), { recursive: true });
  writeFileSync(file, JSON.stringify(result, null, 2) + '\n', { mode: 0o600 });
  return created;
}
