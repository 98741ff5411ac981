import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { hashToken } from '@localis/api/tokens';
import { createServices, SYSTEM_CONTEXT, type Services } from '@localis/api/services';
import type { Database } from '@localis/api/db';
import { CampaignInput, TOKEN_SCOPES, type Settings } from '@localis/shared';
import { ApiToken, Campaign, Institution, Person, ResearchGroup, Round } from '@localis/api/db';
import { GROUPS, INSTITUTIONS, PEOPLE, type ScenarioPerson } from './scenario';
import { CAMPAIGNS, ROUNDS } from './campaigns-scenario';

const SEED_CONTEXT = { ...SYSTEM_CONTEXT, userAgent: 'localis-demo-scenario' };

export interface LoadReport {
  institutions: number;
  people: number;
  groups: number;
  members: number;
  tokens: number;
  rounds: number;
  campaigns: number;
}

/**
 * Load the demo scenario through the services, so every rule and audit entry applies.
 * Repeatable: what exists (by fixed id) is left alone, so a second load changes nothing.
 */
export async function loadScenario(db: Database, settings: Settings): Promise<LoadReport> {
  const services = createServices(db, settings);
  const report: LoadReport = { institutions: 0, people: 0, groups: 0, members: 0, tokens: 0, rounds: 0, campaigns: 0 };

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
  return report;
}

const monthsFrom = (start: Date, months: number) => new Date(Date.UTC(start.getUTCFullYear(), start.getUTCMonth() + months, 1)).toISOString();

/**
 * Rounds and campaigns go through the same services as people do: drafted by their owners,
 * submitted by their PIs, reviewed and decided by the office. A closed round is loaded open, its
 * campaigns decided, and then closed, as it would have happened.
 */
async function loadRoundsAndCampaigns(services: Services, report: LoadReport): Promise<void> {
  const monthStart = new Date();
  const admin = adminContext();
  for (const r of ROUNDS) {
    if (await Round.findByPk(r.id)) continue;
    const closesMonths = r.closesMonths < 1 ? 1 : r.closesMonths;
    await services.rounds.create(admin, { name: r.name, opensAt: monthsFrom(monthStart, r.opensMonths), closesAt: monthsFrom(monthStart, closesMonths), pools: r.pools }, r.id);
    report.rounds++;
  }
  for (const c of CAMPAIGNS) {
    let current = await Campaign.findByPk(c.id);
    if (!current) {
      const owner = personContext(PEOPLE.find((p) => p.id === c.ownerId)!);
      await services.campaigns.create(owner, CampaignInput.parse({ ...c.input, roundId: c.roundId }), c.id);
      report.campaigns++;
      current = (await Campaign.findByPk(c.id))!;
    }
    await advance(services, c, current.state, Number(current.requestedCoreHours));
  }
  // Rounds that lie in the past close once their campaigns have been decided (also after a load
  // that stopped half-way: whatever is still open that should not be is closed now).
  for (const r of ROUNDS.filter((r) => r.closesMonths < 1)) {
    const round = await services.rounds.get(r.id);
    if (round.status !== 'closed') await services.rounds.update(admin, r.id, { closesAt: monthsFrom(monthStart, r.closesMonths) });
  }
}

/**
 * Move a demo campaign from where it stands to where the story has it, one step at a time through
 * the services, so a load that stopped half-way finishes the story when run again.
 */
async function advance(services: Services, c: (typeof CAMPAIGNS)[number], state: string, requested: number): Promise<void> {
  const admin = adminContext();
  const group = GROUPS.find((g) => g.id === c.input.groupId)!;
  const pi = personContext(PEOPLE.find((p) => p.id === group.piPersonId)!);
  const owner = personContext(PEOPLE.find((p) => p.id === c.ownerId)!);
  if (c.state === 'withdrawn') {
    if (state !== 'withdrawn') await services.campaigns.withdraw(owner, c.id, c.withdrawNote ?? null);
    return;
  }
  const path = ['draft', 'submitted', 'in-review', c.state];
  let at = path.indexOf(state);
  if (at < 0 || state === c.state) return;
  for (; path[at] !== c.state; at++) {
    const next = path[at + 1];
    if (next === 'submitted') await services.campaigns.submit(pi, c.id);
    else if (next === 'in-review') await services.campaigns.startReview(admin, c.id);
    else if (c.decision) {
      const outcome = c.state as 'granted' | 'partly-granted' | 'declined';
      await services.campaigns.recordDecision(admin, c.id, { outcome, grantedCoreHours: Math.round(requested * c.decision.grantedShare), message: c.decision.message });
    }
  }
}

/** A demo person acting in their own name, as the system (the audit log names no actor). */
function personContext(p: ScenarioPerson) {
  return { ...SEED_CONTEXT, principal: { personId: p.id, name: p.name, email: p.email, institutionId: p.institutionId, roles: p.roles, scopes: [...TOKEN_SCOPES], via: 'system' as const } };
}

/** Where a rule needs a person (group membership), the seed acts with the office's rights, as the system. */
function adminContext() {
  const admin = PEOPLE.find((p) => p.roles.includes('admin'))!;
  return {
    ...SEED_CONTEXT,
    principal: { personId: admin.id, name: admin.name, email: admin.email, institutionId: admin.institutionId, roles: admin.roles, scopes: [...TOKEN_SCOPES], via: 'system' as const },
  };
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
