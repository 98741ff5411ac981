import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { estimateReport, CampaignSpec, type Campaign, type Role } from '@localis/shared';
import { BrowserSession, createInstitution, createPerson, startTestApp, SYSTEM, tokenFor, withToken, type TestApp } from '../../test/harness';
import type { RequestContext } from '../http/principal';
import { AuditLog, Campaign as CampaignModel, CampaignEvent } from '../db/models';

let t: TestApp;
let researcherToken: string;
let piToken: string;
let adminToken: string;
let committeeToken: string;
let groupId: string;
let openRoundId: string;
let closedRoundId: string;
let researcher: Awaited<ReturnType<typeof createPerson>>;

const MACHINE = 'campaign-test-cluster';
const SPEC = {
  model: 'anderson-box', dimension: 3, symmetryClass: 'AI', sizes: [6, 8, 12, 16], disorder: { from: 15, to: 18, step: 0.25 },
  energies: [0], realizations: 1, method: 'transfer-matrix', targetPrecision: 0.002,
  methodOptions: { moments: 1024, randomVectors: 8, eigenpairs: 50, expectedLambda: 0.6 }, node: { coresPerNode: 64, memoryGiBPerNode: 256 },
};
const call = (token: string, method: string, path: string, body?: unknown) => withToken(t, token, method, `/api/v1${path}`, body);
const draftBody = (over: Record<string, unknown> = {}) => ({
  title: 'Critical exponent of the 3D Anderson model', abstract: 'Transfer-matrix study of the orthogonal class around W = 16.5.',
  justification: '## Why\nThe **exponent** needs large L.', groupId, roundId: openRoundId, machine: MACHINE, spec: SPEC, ...over,
});
const ctxOf = (p: { id: string; name: string; email: string; institutionId: string | null; roles: Role[] }): RequestContext => ({
  ...SYSTEM, principal: { personId: p.id, name: p.name, email: p.email, institutionId: p.institutionId, roles: p.roles, scopes: ['read', 'write', 'admin'], via: 'session' },
});

async function draft(over: Record<string, unknown> = {}): Promise<Campaign> {
  const res = await call(researcherToken, 'POST', '/campaigns', draftBody(over));
  expect(res.status, await res.clone().text()).toBe(201);
  return (await res.json()) as Campaign;
}

beforeAll(async () => {
  t = await startTestApp();
  const inst = await createInstitution(t);
  const pi = await createPerson(t, { roles: ['pi', 'researcher'], institutionId: inst.id, label: 'camp-pi' });
  researcher = await createPerson(t, { roles: ['researcher'], institutionId: inst.id, label: 'camp-researcher' });
  const admin = await createPerson(t, { roles: ['admin'], label: 'camp-admin' });
  const committee = await createPerson(t, { roles: ['committee'], label: 'camp-committee' });
  groupId = (await t.services.groups.create(SYSTEM, { name: 'Campaign Group', institutionId: inst.id, piPersonId: pi.id })).id;
  await t.services.groups.addMember(ctxOf(admin), groupId, researcher.id);
  const day = 86_400_000;
  openRoundId = (await t.services.rounds.create(ctxOf(admin), { name: `Open ${Date.now()}`, opensAt: new Date(Date.now() - day).toISOString(), closesAt: new Date(Date.now() + 30 * day).toISOString(), pools: [{ machine: MACHINE, coreHours: 2_000_000 }] })).id;
  closedRoundId = (await t.services.rounds.create(ctxOf(admin), { name: `Closed ${Date.now()}`, opensAt: new Date(Date.now() - 60 * day).toISOString(), closesAt: new Date(Date.now() - 30 * day).toISOString(), pools: [{ machine: MACHINE, coreHours: 1000 }] })).id;
  [researcherToken, piToken, adminToken, committeeToken] = await Promise.all([tokenFor(t, researcher), tokenFor(t, pi), tokenFor(t, admin), tokenFor(t, committee)]);
});
afterAll(async () => t.close());

describe('campaigns', () => {
  describe('estimates', () => {
    it('should answer the same estimate as the shared cost model when a spec is posted', async () => {
      const res = await call(researcherToken, 'POST', '/estimates', SPEC);
      expect(res.status).toBe(200);
      const body = (await res.json()) as { totalCoreHours: number; rows: { size: number }[]; notices: unknown[] };
      const expected = estimateReport(CampaignSpec.parse(SPEC));
      expect(body.totalCoreHours).toBeCloseTo(expected.totalCoreHours, 9);
      expect(body.rows.map((r) => r.size)).toEqual([6, 8, 12, 16]);
      expect(body.notices).toEqual([]);
    });

    it('should return the notices when the grid misses the critical disorder', async () => {
      const res = await call(researcherToken, 'POST', '/estimates', { ...SPEC, disorder: { from: 10, to: 14, step: 0.5 }, sizes: [8, 10] });
      const codes = ((await res.json()) as { notices: { code: string }[] }).notices.map((n) => n.code).sort();
      expect(codes).toEqual(['grid-misses-critical-disorder', 'narrow-size-range', 'too-few-sizes']);
    });

    it.each([
      ['sizes not positive integers', { sizes: [0, 2.5] }, ['sizes', 0]],
      ['a reversed grid', { disorder: { from: 18, to: 15, step: 0.25 } }, ['disorder', 'to']],
      ['step 0', { disorder: { from: 15, to: 18, step: 0 } }, ['disorder', 'step']],
      ['an empty list of values', { disorder: { values: [] } }, ['disorder', 'values']],
      ['a grid over 100 000 points', { disorder: { from: 0, to: 200, step: 0.001 } }, ['disorder', 'step']],
      ['an unknown class', { symmetryClass: 'XYZ' }, ['symmetryClass']],
      ['an unknown method', { method: 'monte-carlo' }, ['method']],
      ['precision 0', { targetPrecision: 0 }, ['targetPrecision']],
      ['precision 1', { targetPrecision: 1 }, ['targetPrecision']],
      ['a precision finer than 0.001 %', { targetPrecision: 1e-9 }, ['targetPrecision']],
      ['a plan larger than any round', { sizes: [64, 400], targetPrecision: 1e-5, realizations: 1000 }, ['sizes']],
      ['a misspelt field', { pilotTiming: [] }, []],
      ['a pilot without its time', { pilotTimings: [{ size: 4, cores: 1 }, { size: 6, seconds: 3, cores: 1 }] }, ['pilotTimings', 0, 'seconds']],
      ['non-positive pilot times', { pilotTimings: [{ size: 4, seconds: 0, cores: 1 }, { size: 6, seconds: 3, cores: 1 }] }, ['pilotTimings', 0, 'seconds']],
    ])('should refuse %s with its field path', async (_name, change, path) => {
      const res = await call(researcherToken, 'POST', '/estimates', { ...SPEC, ...change });
      expect(res.status).toBe(422);
      const details = ((await res.json()) as { error: { details: { path: unknown[]; message: string }[] } }).error.details;
      expect(details.map((d) => d.path)).toContainEqual(path);
      expect(details.every((d) => d.message.length > 5)).toBe(true);
    });
  });

  describe('drafts', () => {
    it('should store the server-computed estimate, notices and a history entry when a draft is created', async () => {
      const c = await draft();
      expect(c.state).toBe('draft');
      expect(c.requestedCoreHours).toBe(Math.ceil(estimateReport(CampaignSpec.parse(SPEC)).totalCoreHours));
      expect(c.estimate.rows).toHaveLength(4);
      expect(c.history.map((h) => [h.fromState, h.toState])).toEqual([[null, 'draft']]);
      expect(c.can).toEqual({ edit: true, submit: false, withdraw: true, startReview: false, decide: false, recordRuns: false, transfer: false, uploadResults: false, attachFiles: true, withdrawArchives: false });
      const audit = await AuditLog.findAll({ where: { targetType: 'campaign', targetId: c.id } });
      expect(audit.map((a) => a.action)).toEqual(['campaign.created']);
    });

    it('should store nothing when the spec is invalid', async () => {
      const before = await CampaignModel.count();
      const res = await call(researcherToken, 'POST', '/campaigns', draftBody({ spec: { ...SPEC, disorder: { from: 15, to: 18, step: 0 } } }));
      expect(res.status).toBe(422);
      expect(((await res.json()) as { error: { details: { path: unknown[] }[] } }).error.details[0].path).toEqual(['spec', 'disorder', 'step']);
      expect(await CampaignModel.count()).toBe(before);
    });

    it('should refuse a machine the round has no pool for, and a closed round', async () => {
      const noPool = await call(researcherToken, 'POST', '/campaigns', draftBody({ machine: 'elsewhere' }));
      expect(noPool.status).toBe(422);
      expect(((await noPool.json()) as { error: { details: { path: string[] }[] } }).error.details[0].path).toEqual(['machine']);
      const closed = await call(researcherToken, 'POST', '/campaigns', draftBody({ roundId: closedRoundId }));
      expect(closed.status).toBe(422);
    });

    it('should recompute the estimate and notices when the spec changes', async () => {
      const c = await draft();
      const res = await call(researcherToken, 'PATCH', `/campaigns/${c.id}`, { spec: { ...SPEC, sizes: [6, 8] } });
      expect(res.status).toBe(200);
      const updated = (await res.json()) as Campaign;
      expect(updated.estimate.rows).toHaveLength(2);
      expect(updated.notices.map((n) => n.code)).toContain('too-few-sizes');
      expect(updated.warningCount).toBe(updated.notices.filter((n) => n.severity === 'warning').length);
      expect(updated.title).toBe(c.title);
    });
  });

  describe('workflow', () => {
    it('should let the PI submit, keep it read-only, let the office start the review and keep the history', async () => {
      const c = await draft();
      expect((await call(researcherToken, 'POST', `/campaigns/${c.id}/submit`)).status).toBe(403);
      const submitted = await call(piToken, 'POST', `/campaigns/${c.id}/submit`, { note: 'ready' });
      expect(submitted.status).toBe(200);
      expect(((await submitted.json()) as Campaign).submittedAt).not.toBeNull();

      const edit = await call(researcherToken, 'PATCH', `/campaigns/${c.id}`, { title: 'Changed after submission' });
      expect(edit.status).toBe(409);
      expect((await call(piToken, 'POST', `/campaigns/${c.id}/submit`)).status).toBe(409);

      const review = await call(adminToken, 'POST', `/campaigns/${c.id}/start-review`);
      expect(review.status).toBe(200);
      const seen = (await (await call(committeeToken, 'GET', `/campaigns/${c.id}`)).json()) as Campaign;
      expect(seen.state).toBe('in-review');
      expect(seen.history.map((h) => h.toState)).toEqual(['draft', 'submitted', 'in-review']);
      expect(seen.history[1].note).toBe('ready');
      const audit = await AuditLog.findAll({ where: { targetType: 'campaign', targetId: c.id }, order: [['id', 'ASC']] });
      expect(audit.map((a) => a.action)).toEqual(['campaign.created', 'campaign.submitted', 'campaign.in-review']);
    });

    it('should let the owner withdraw before a decision and not after', async () => {
      const c = await draft();
      await call(piToken, 'POST', `/campaigns/${c.id}/submit`);
      const withdrawn = await call(researcherToken, 'POST', `/campaigns/${c.id}/withdraw`, { note: 'merged into another proposal' });
      expect(withdrawn.status).toBe(200);
      expect(((await withdrawn.json()) as Campaign).state).toBe('withdrawn');
      expect((await call(researcherToken, 'POST', `/campaigns/${c.id}/withdraw`)).status).toBe(409);

      const decided = await draft();
      await call(piToken, 'POST', `/campaigns/${decided.id}/submit`);
      const admin = await createPerson(t, { roles: ['admin'], label: 'camp-decider' });
      await t.services.reviews.decide(ctxOf(admin), decided.id, { outcome: 'grant-all', message: 'Granted in full for the test.' });
      const late = await call(researcherToken, 'POST', `/campaigns/${decided.id}/withdraw`);
      expect(late.status).toBe(409);
      expect(((await late.json()) as { error: { message: string } }).error.message).toMatch(/granted/);
    });

    it('should never let the history be edited or deleted', async () => {
      const c = await draft();
      await expect(CampaignEvent.update({ note: 'rewritten' }, { where: { campaignId: c.id } })).rejects.toThrow(/append-only/);
      await expect(CampaignEvent.destroy({ where: { campaignId: c.id } })).rejects.toThrow(/append-only/);
    });

    it('should submit once when the PI submits twice at the same moment', async () => {
      const c = await draft();
      const answers = await Promise.all([1, 2, 3].map(() => call(piToken, 'POST', `/campaigns/${c.id}/submit`)));
      expect(answers.map((r) => r.status).sort()).toEqual([200, 409, 409]);
      expect(await CampaignEvent.count({ where: { campaignId: c.id, toState: 'submitted' } })).toBe(1);
    });

    it('should refuse changes through tokens that may only read', async () => {
      const c = await draft();
      const pi = (await t.db.models.ResearchGroup.findByPk(groupId))!.piPersonId;
      const piPerson = await t.services.people.get(ctxOf({ ...researcher, roles: ['admin'] }), pi);
      const readOnlyPi = await tokenFor(t, piPerson, ['read']);
      const readOnlyResearcher = await tokenFor(t, researcher, ['read']);
      expect((await call(readOnlyResearcher, 'PATCH', `/campaigns/${c.id}`, { title: 'Through a read token' })).status).toBe(403);
      expect((await call(readOnlyResearcher, 'POST', `/campaigns/${c.id}/withdraw`)).status).toBe(403);
      expect((await call(readOnlyPi, 'POST', `/campaigns/${c.id}/submit`)).status).toBe(403);
      const seen = (await (await call(readOnlyResearcher, 'GET', `/campaigns/${c.id}`)).json()) as Campaign;
      expect(seen.can).toEqual({ edit: false, submit: false, withdraw: false, startReview: false, decide: false, recordRuns: false, transfer: false, uploadResults: false, attachFiles: false, withdrawArchives: false });
      expect(seen.state).toBe('draft');
    });

    it('should let a draft in a round that has closed be edited without moving it', async () => {
      const c = await draft();
      await CampaignModel.update({ roundId: closedRoundId }, { where: { id: c.id } });
      const kept = await call(researcherToken, 'PATCH', `/campaigns/${c.id}`, { title: 'Typo fixed', roundId: closedRoundId, machine: MACHINE });
      expect(kept.status).toBe(200);
      const moved = await call(researcherToken, 'PATCH', `/campaigns/${c.id}`, { roundId: openRoundId });
      expect(moved.status).toBe(200);
      const back = await call(researcherToken, 'PATCH', `/campaigns/${c.id}`, { roundId: closedRoundId });
      expect(back.status).toBe(422);
    });

    it('should refuse to submit a draft whose round has closed', async () => {
      const c = await draft();
      await CampaignModel.update({ roundId: closedRoundId }, { where: { id: c.id } });
      const res = await call(piToken, 'POST', `/campaigns/${c.id}/submit`);
      expect(res.status).toBe(409);
      expect(((await res.json()) as { error: { message: string } }).error.message).toMatch(/closed/);
    });
  });

  describe('lists', () => {
    it('should filter by scope, state, method and dimension and hide drafts from the committee', async () => {
      const mine = await draft({ title: 'List filter probe' });
      const list = async (token: string, query: string) => (await (await call(token, 'GET', `/campaigns?${query}`)).json()) as { items: { id: string; state: string }[]; total: number };
      expect((await list(researcherToken, 'scope=mine&q=List%20filter%20probe')).items.map((c) => c.id)).toEqual([mine.id]);
      expect((await list(researcherToken, 'state=draft&method=transfer-matrix&dimension=3&symmetryClass=AI')).items.some((c) => c.id === mine.id)).toBe(true);
      expect((await list(researcherToken, 'dimension=2')).items.some((c) => c.id === mine.id)).toBe(false);
      expect((await list(committeeToken, 'limit=200')).items.some((c) => c.state === 'draft')).toBe(false);
      expect((await list(adminToken, 'q=List%20filter%20probe')).total).toBe(1);
      const byAbstract = await draft({ abstract: 'Mentions the quasiperiodic Aubry-André limit once, to be found by it.' });
      expect((await list(researcherToken, 'q=aubry-andr')).items.map((c) => c.id)).toEqual([byAbstract.id]);
    });

    it('should export the filtered list as CSV', async () => {
      await draft({ title: 'CSV probe campaign' });
      const res = await call(researcherToken, 'GET', '/campaigns?format=csv&q=CSV%20probe');
      expect(res.headers.get('content-type')).toMatch(/text\/csv/);
      const lines = (await res.text()).trim().split('\r\n');
      expect(lines[0]).toMatch(/^id,title,state,/);
      expect(lines).toHaveLength(2);
    });

    it('should refuse an unknown filter value with its field', async () => {
      const res = await call(researcherToken, 'GET', '/campaigns?dimension=4');
      expect(res.status).toBe(422);
    });
  });

  describe('browser session', () => {
    it('should need the CSRF token to save a draft from the browser', async () => {
      const session = new BrowserSession(t.url);
      await session.signIn(researcher.email);
      const refused = await session.api('POST', '/api/v1/campaigns', draftBody(), { 'x-csrf-token': '' });
      expect(refused.status).toBe(403);
      const ok = await session.api('POST', '/api/v1/campaigns', draftBody());
      expect(ok.status).toBe(201);
    });
  });
});
