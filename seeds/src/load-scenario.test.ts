import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CAMPAIGN_STATES, loadSettings, roundStatus, type Ledger } from '@localis/shared';
import { ApiToken, AuditLog, Campaign, openDatabase, Person, ResearchGroup, ReviewAssignment, Round, Run, type Database } from '@localis/api/db';
import { createServices, type Services } from '@localis/api/services';
import { hashToken } from '@localis/api/tokens';
import { CAMPAIGNS, ROUNDS } from './campaigns-scenario';
import { loadScenario } from './load-scenario';
import { REVIEW_PLANS } from './reviews-scenario';
import { RUN_PLANS } from './runs-scenario';
import { GROUPS, PEOPLE } from './scenario';
import { adminContext } from './seed-context';

const settings = loadSettings(process.env);
let db: Database;
let services: Services;
beforeAll(() => {
  db = openDatabase(settings, { poolMax: 2 });
  services = createServices(db, settings);
});
afterAll(async () => db.close());

const QUANTUM_TRANSPORT_GRANT = '5e000000-0000-4000-8000-000000000005';
const DEVICE_MODELLING_GRANT = '5e000000-0000-4000-8000-000000000006';
const ledgerOf = (campaignId: string): Promise<Ledger> => services.ledger.get(adminContext(), campaignId);
const ledgersOfRunPlans = () => Promise.all(RUN_PLANS.map((p) => ledgerOf(p.campaignId)));

describe('demo scenario', () => {
  describe('repeatability', () => {
    it('should change nothing when loaded a second time', async () => {
      await loadScenario(db, settings);
      const auditBefore = await AuditLog.count();
      const ledgersBefore = await ledgersOfRunPlans();
      const assignmentsBefore = await ReviewAssignment.count({ where: { campaignId: CAMPAIGNS.map((c) => c.id) } });
      const again = await loadScenario(db, settings);
      expect(Object.entries(again).filter(([, n]) => n !== 0)).toEqual([]);
      expect(again).toMatchObject({ assignments: 0, conflicts: 0, reviews: 0, runs: 0, refunds: 0, adjustments: 0 });
      expect(await AuditLog.count()).toBe(auditBefore);
      expect(await ledgersOfRunPlans()).toEqual(ledgersBefore);
      expect(await ReviewAssignment.count({ where: { campaignId: CAMPAIGNS.map((c) => c.id) } })).toBe(assignmentsBefore);
    });
  });

  describe('content', () => {
    it('should give every demo person their roles, groups and a working API token', async () => {
      for (const p of PEOPLE) expect(await Person.findByPk(p.id), p.email).not.toBeNull();
      const tokens = JSON.parse(readFileSync(join(settings.DATA_DIR, 'demo-tokens.json'), 'utf8')) as Record<string, string>;
      expect(Object.keys(tokens).sort()).toEqual(PEOPLE.map((p) => p.email).sort());
      for (const [email, secret] of Object.entries(tokens)) {
        const row = await ApiToken.findOne({ where: { tokenHash: hashToken(secret) } });
        expect(row?.personId, email).toBe(PEOPLE.find((p) => p.email === email)!.id);
      }
      expect(GROUPS.every((g) => g.memberIds.includes(g.piPersonId))).toBe(true);
    });

    it('should hold an open and a closed round and campaigns in every state, each as the story has it', async () => {
      const rounds = await Round.findAll({ where: { id: ROUNDS.map((r) => r.id) } });
      expect(rounds.map((r) => roundStatus({ opensAt: r.opensAt.toISOString(), closesAt: r.closesAt.toISOString() })).sort()).toEqual(['closed', 'open']);
      const campaigns = await Campaign.findAll({ where: { id: CAMPAIGNS.map((c) => c.id) } });
      for (const c of CAMPAIGNS) expect(campaigns.find((x) => x.id === c.id)?.state, c.input.title).toBe(c.state);
      expect(new Set(campaigns.map((c) => c.state))).toEqual(new Set(CAMPAIGN_STATES));
      expect(campaigns.some((c) => (c.spec.pilotTimings ?? []).length > 0)).toBe(true);
    });
  });

  describe('committee review', () => {
    it('should review every decided campaign before its decision, with the conflict on record', async () => {
      for (const plan of REVIEW_PLANS) {
        const story = CAMPAIGNS.find((c) => c.id === plan.campaignId)!;
        if (!story.decision) continue;
        const { assignments, summary } = await services.reviews.forCampaign(adminContext(), plan.campaignId);
        for (const a of plan.assignments) expect(assignments.find((x) => x.reviewerPersonId === a.reviewerId)?.state, story.input.title).toBe('reviewed');
        for (const c of plan.conflicts) expect(assignments.find((x) => x.reviewerPersonId === c.reviewerId)).toMatchObject({ state: 'conflict', conflictReason: c.reason });
        expect(summary?.reviews).toBe(plan.assignments.length);
      }
      expect(REVIEW_PLANS.some((p) => p.conflicts.length > 0)).toBe(true);
    });

    it('should leave the campaign in review with one review written and one assignment open', async () => {
      const inReview = CAMPAIGNS.find((c) => c.state === 'in-review')!;
      const { assignments, summary } = await services.reviews.forCampaign(adminContext(), inReview.id);
      expect(assignments.map((a) => a.state).sort()).toEqual(['assigned', 'reviewed']);
      expect(summary?.reviews).toBe(1);
    });

    it('should have no reviewer on a proposal of their own institution or group', async () => {
      const assignments = await ReviewAssignment.findAll({ where: { campaignId: CAMPAIGNS.map((c) => c.id), state: ['assigned', 'reviewed'] } });
      expect(assignments.length).toBeGreaterThan(0);
      for (const a of assignments) {
        const reviewer = (await Person.findByPk(a.reviewerPersonId))!;
        const campaign = (await Campaign.findByPk(a.campaignId))!;
        const group = (await ResearchGroup.findByPk(campaign.groupId))!;
        expect(reviewer.institutionId, `${reviewer.name} on "${campaign.title}"`).not.toBe(group.institutionId);
        expect(GROUPS.find((g) => g.id === group.id)?.memberIds ?? []).not.toContain(reviewer.id);
      }
    });
  });

  describe('runs and ledger', () => {
    // Other suites (the CLI's and the browser's) charge small runs to the same demo grants in the
    // same test database: these checks look at the scenario's own jobs.
    const demoJobIds = (campaignId: string) => {
      const plan = RUN_PLANS.find((p) => p.campaignId === campaignId)!;
      return new Set(plan.steps.flatMap((s) => (s.kind === 'run' ? [s.run.externalJobId] : s.kind === 'import' ? s.runs.map((r) => r.externalJobId) : [])));
    };

    it('should have used a bit more than 75 % of the Quantum Transport grant, with the 75 % alert and a refund', async () => {
      const ledger = await ledgerOf(QUANTUM_TRANSPORT_GRANT);
      const ours = demoJobIds(QUANTUM_TRANSPORT_GRANT);
      const usedByDemo = -ledger.entries.filter((e) => (e.kind === 'debit' || e.kind === 'refund') && ours.has(e.externalJobId ?? '')).reduce((s, e) => s + e.coreHours, 0);
      expect(usedByDemo / ledger.granted).toBeGreaterThanOrEqual(0.75);
      expect(usedByDemo / ledger.granted).toBeLessThan(0.9);
      expect(ledger.alerted).toContain(75);
      expect(ledger.entries.filter((e) => e.kind === 'refund')).toHaveLength(1);
      expect(ledger.entries.every((e) => !e.overdraft)).toBe(true);
    });

    it('should leave most of the Device Modelling grant, adjusted once by the office', async () => {
      const ledger = await ledgerOf(DEVICE_MODELLING_GRANT);
      expect(ledger.used).toBeGreaterThan(0);
      expect(ledger.remaining).toBeGreaterThan(ledger.granted / 2);
      expect(ledger.alerted).toEqual([]);
      expect(ledger.entries.filter((e) => e.kind === 'adjustment' && !e.reason?.startsWith('matrix'))).toHaveLength(1);
    });

    it('should record every demo job once, one import among them, and none of the scheduler export kept for trying the import', async () => {
      for (const plan of RUN_PLANS) {
        const jobIds = plan.steps.flatMap((s) => (s.kind === 'run' ? [s.run.externalJobId] : s.kind === 'import' ? s.runs.map((r) => r.externalJobId) : []));
        const runs = await Run.findAll({ where: { campaignId: plan.campaignId, externalJobId: jobIds } });
        expect(runs.map((r) => r.externalJobId).sort()).toEqual([...jobIds].sort());
        for (const r of runs) {
          expect(r.cores).toBeGreaterThanOrEqual(1);
          expect(r.cores).toBeLessThanOrEqual(512);
          expect(r.endedAt.getTime()).toBeLessThan(Date.now());
        }
      }
      expect(await Run.count({ where: { campaignId: RUN_PLANS.map((p) => p.campaignId), source: 'import' } })).toBeGreaterThan(0);
      const exportCsv = readFileSync(new URL('../data/scheduler-export.csv', import.meta.url), 'utf8');
      const exportJobIds = exportCsv.trim().split('\n').slice(1).map((line) => line.split(',')[0]);
      expect(exportJobIds.length).toBeGreaterThan(0);
      // The browser tests import the export into this database, so the scenario's own plan is checked.
      const seeded = new Set(RUN_PLANS.flatMap((p) => [...demoJobIds(p.campaignId)]));
      expect(exportJobIds.filter((id) => seeded.has(id))).toEqual([]);
    });
  });
});
