import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Assignment, Campaign, CampaignReviews, CommitteeQueue, PoolUsage } from '@localis/shared';
import { createPerson, startTestApp, tokenFor, type TestApp } from '../../test/harness';
import { actingAs, makeCampaignWorld, type CampaignWorld } from '../../test/campaign-world';
import { Campaign as CampaignModel, LedgerEntry, OutboxMessage } from '../db/models';

let t: TestApp;
let w: CampaignWorld;

const call = (token: string, method: string, path: string, body?: unknown) =>
  fetch(`${t.url}/api/v1${path}`, {
    method,
    headers: { authorization: `Bearer ${token}`, ...(body !== undefined ? { 'content-type': 'application/json' } : {}) },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
const REVIEW = {
  scores: { merit: 5, feasibility: 4, costJustification: 3 },
  toProposers: 'The finite-size scaling plan is convincing; consider one more size.',
  confidential: 'CONFIDENTIAL-NOTE: the group delivered late last round.',
  recommendedCoreHours: 40_000,
};
const message = async (res: Response) => ((await res.json()) as { error: { message: string } }).error.message;

async function assign(campaignId: string, reviewerId = w.reviewer.id): Promise<Assignment> {
  const res = await call(w.tokens.admin, 'POST', `/campaigns/${campaignId}/assignments`, { reviewerPersonId: reviewerId });
  expect(res.status, await res.clone().text()).toBe(201);
  return (await res.json()) as Assignment;
}

beforeAll(async () => {
  // Scripts hammer the api here on purpose; the per-token rate limit is not what these tests are about.
  t = await startTestApp({ TOKEN_RATE_PER_MINUTE: '100000' });
  w = await makeCampaignWorld(t, { label: 'review', poolCoreHours: 100_000 });
});
afterAll(async () => t.close());

describe('committee review and decision', () => {
  describe('assignment and conflicts of interest', () => {
    it('should assign a reviewer from another institution, start the review and mail the reviewer', async () => {
      const id = await w.submitted();
      const a = await assign(id);
      expect(a).toMatchObject({ reviewerPersonId: w.reviewer.id, state: 'assigned', review: null });
      expect((await CampaignModel.findByPk(id))!.state).toBe('in-review');
      const mails = await OutboxMessage.findAll({ where: { kind: 'mail' } });
      expect(mails.some((m) => (m.payload.to as string[]).includes(w.reviewer.email) && String(m.payload.dedupeKey).includes(a.id))).toBe(true);
    });

    it('should refuse a reviewer from the proposers own institution with 409 naming the conflict', async () => {
      const id = await w.submitted();
      const res = await call(w.tokens.admin, 'POST', `/campaigns/${id}/assignments`, { reviewerPersonId: w.sameInstitutionReviewer.id });
      expect(res.status).toBe(409);
      expect(await message(res)).toMatch(/Conflict of interest/);
      expect((await CampaignModel.findByPk(id))!.state).toBe('submitted');
    });

    it('should refuse someone who is not on the committee with 422, and a second assignment with 409', async () => {
      const id = await w.submitted();
      const res = await call(w.tokens.admin, 'POST', `/campaigns/${id}/assignments`, { reviewerPersonId: w.researcher.id });
      expect(res.status).toBe(422);
      await assign(id);
      expect((await call(w.tokens.admin, 'POST', `/campaigns/${id}/assignments`, { reviewerPersonId: w.reviewer.id })).status).toBe(409);
    });

    it('should bar a member who declared a conflict from being assigned', async () => {
      const id = await w.submitted();
      const declared = await call(w.tokens.reviewer, 'POST', `/campaigns/${id}/conflict`, { reason: 'co-author of the PI in 2026' });
      expect(declared.status).toBe(200);
      expect(((await declared.json()) as Assignment).state).toBe('conflict');
      const res = await call(w.tokens.admin, 'POST', `/campaigns/${id}/assignments`, { reviewerPersonId: w.reviewer.id });
      expect(res.status).toBe(409);
      expect(await message(res)).toMatch(/co-author of the PI/);
      expect((await call(w.tokens.reviewer, 'POST', `/campaigns/${id}/conflict`, { reason: 'x' })).status).toBe(422);
    });

    it('should let an assigned member declare a conflict, which stops their review', async () => {
      const id = await w.submitted();
      const a = await assign(id);
      expect((await call(w.tokens.reviewer, 'POST', `/campaigns/${id}/conflict`, { reason: 'I supervised the postdoc' })).status).toBe(200);
      const res = await call(w.tokens.reviewer, 'PUT', `/campaigns/${id}/assignments/${a.id}/review`, REVIEW);
      expect(res.status).toBe(409);
    });

    it('should remove an unreviewed assignment but keep a reviewed one', async () => {
      const id = await w.submitted();
      const a = await assign(id);
      expect((await call(w.tokens.admin, 'DELETE', `/campaigns/${id}/assignments/${a.id}`)).status).toBe(204);
      const b = await assign(id);
      await call(w.tokens.reviewer, 'PUT', `/campaigns/${id}/assignments/${b.id}/review`, REVIEW);
      expect((await call(w.tokens.admin, 'DELETE', `/campaigns/${id}/assignments/${b.id}`)).status).toBe(409);
    });
  });

  describe('reviews', () => {
    it.each([
      ['a score of 0', { ...REVIEW, scores: { ...REVIEW.scores, merit: 0 } }, ['scores', 'merit']],
      ['a score of 6', { ...REVIEW, scores: { ...REVIEW.scores, feasibility: 6 } }, ['scores', 'feasibility']],
      ['a fractional score', { ...REVIEW, scores: { ...REVIEW.scores, costJustification: 3.5 } }, ['scores', 'costJustification']],
      ['negative core-hours', { ...REVIEW, recommendedCoreHours: -1 }, ['recommendedCoreHours']],
    ])('should refuse %s with 422 at its path', async (_name, body, path) => {
      const id = await w.submitted();
      const a = await assign(id);
      const res = await call(w.tokens.reviewer, 'PUT', `/campaigns/${id}/assignments/${a.id}/review`, body);
      expect(res.status).toBe(422);
      expect(((await res.json()) as { error: { details: { path: unknown[] }[] } }).error.details.map((d) => d.path)).toContainEqual(path);
    });

    it('should let only the assigned reviewer write the review', async () => {
      const id = await w.submitted();
      const a = await assign(id);
      const other = await createPerson(t, { roles: ['committee'], label: 'other-reviewer' });
      const res = await call(await tokenFor(t, other), 'PUT', `/campaigns/${id}/assignments/${a.id}/review`, REVIEW);
      expect(res.status).toBe(403);
    });

    it('should show proposers nothing before the decision and only what is meant for them after', async () => {
      const id = await w.submitted();
      const a = await assign(id);
      expect((await call(w.tokens.reviewer, 'PUT', `/campaigns/${id}/assignments/${a.id}/review`, REVIEW)).status).toBe(200);

      const committeeView = (await (await call(w.tokens.reviewer, 'GET', `/campaigns/${id}/reviews`)).json()) as CampaignReviews;
      expect(committeeView.audience).toBe('committee');
      expect(committeeView.assignments[0].review?.confidential).toContain('CONFIDENTIAL-NOTE');
      expect(committeeView.summary).toMatchObject({ reviews: 1, meanScores: { merit: 5, feasibility: 4, costJustification: 3 }, meanRecommendedCoreHours: 40_000 });

      const before = (await (await call(w.tokens.researcher, 'GET', `/campaigns/${id}/reviews`)).json()) as CampaignReviews;
      expect(before).toMatchObject({ audience: 'proposers', assignments: [], feedback: [] });

      const decided = await call(w.tokens.admin, 'POST', `/campaigns/${id}/decision`, { outcome: 'grant-part', coreHours: 30_000, message: 'Partly granted: start with the smaller sizes.' });
      expect(decided.status, await decided.clone().text()).toBe(200);
      const afterRes = await call(w.tokens.researcher, 'GET', `/campaigns/${id}/reviews`);
      const text = await afterRes.clone().text();
      const after = (await afterRes.json()) as CampaignReviews;
      expect(after.feedback).toEqual([{ scores: REVIEW.scores, toProposers: REVIEW.toProposers }]);
      expect(after.decisionMessage).toBe('Partly granted: start with the smaller sizes.');
      expect(text).not.toContain('CONFIDENTIAL-NOTE');
      expect(text).not.toContain(w.reviewer.name);
      expect(text).not.toContain('40000');
      // Reviews close with the decision.
      expect((await call(w.tokens.reviewer, 'PUT', `/campaigns/${id}/assignments/${a.id}/review`, REVIEW)).status).toBe(409);
    });

    it("should list the proposal in the reviewer's queue with its progress", async () => {
      const id = await w.submitted('Queue test');
      const a = await assign(id);
      await call(w.tokens.reviewer, 'PUT', `/campaigns/${id}/assignments/${a.id}/review`, REVIEW);
      const queue = (await (await call(w.tokens.reviewer, 'GET', `/committee/queue?scope=mine&roundId=${w.roundId}`)).json()) as CommitteeQueue;
      const item = queue.items.find((i) => i.campaignId === id)!;
      expect(item).toMatchObject({ assigned: 1, reviewed: 1, myAssignmentId: a.id, myState: 'reviewed', meanScore: 4 });
      expect((await call(w.tokens.researcher, 'GET', '/committee/queue')).status).toBe(403);
    });
  });

  describe('who sees what', () => {
    it('should keep a committee member out of their own group\'s proposals in the queue', async () => {
      const member = await createPerson(t, { roles: ['committee', 'researcher'], institutionId: w.institutionId, label: 'committee-proposer' });
      await t.services.groups.addMember(actingAs(w.pi), w.groupId, member.id);
      const id = await w.submitted('Own group proposal');
      await assign(id);
      const queue = (await (await call(await tokenFor(t, member), 'GET', `/committee/queue?scope=all&roundId=${w.roundId}`)).json()) as CommitteeQueue;
      expect(queue.items.map((i) => i.campaignId)).not.toContain(id);
      const others = (await (await call(w.tokens.reviewer, 'GET', `/committee/queue?scope=all&roundId=${w.roundId}`)).json()) as CommitteeQueue;
      expect(others.items.map((i) => i.campaignId)).toContain(id);
    });

    it('should show members barred by a conflict no reviews, declared or by institution', async () => {
      const id = await w.submitted();
      const a = await assign(id);
      await call(w.tokens.reviewer, 'PUT', `/campaigns/${id}/assignments/${a.id}/review`, REVIEW);
      const colleague = (await (await call(await tokenFor(t, w.sameInstitutionReviewer), 'GET', `/campaigns/${id}/reviews`)).json()) as CampaignReviews;
      expect(colleague).toMatchObject({ audience: 'proposers', assignments: [], feedback: [] });
      const other = await createPerson(t, { roles: ['committee'], label: 'declares' });
      const otherToken = await tokenFor(t, other);
      expect((await call(otherToken, 'POST', `/campaigns/${id}/conflict`, { reason: 'I examined the PI\'s student' })).status).toBe(200);
      const declared = (await (await call(otherToken, 'GET', `/campaigns/${id}/reviews`)).json()) as CampaignReviews;
      expect(JSON.stringify(declared)).not.toContain('CONFIDENTIAL-NOTE');
    });
  });

  describe('decision within the pool', () => {
    it('should refuse to shrink a pool below what it has granted', async () => {
      const world = await makeCampaignWorld(t, { label: 'shrink', poolCoreHours: 10_000 });
      await world.granted(8000);
      const shrink = (coreHours: number) => call(world.tokens.admin, 'PATCH', `/rounds/${world.roundId}`, { pools: [{ machine: world.machine, coreHours }] });
      const res = await shrink(7999);
      expect(res.status).toBe(409);
      expect(await message(res)).toMatch(/8,000 core-hours granted already/);
      expect((await shrink(8000)).status).toBe(200);
    });

    it("should refuse a grant beyond what is left in the round's pool and write nothing", async () => {
      const world = await makeCampaignWorld(t, { label: 'pool', poolCoreHours: 50_000 });
      const first = await world.submitted();
      const second = await world.submitted();
      expect((await call(world.tokens.admin, 'POST', `/campaigns/${first}/decision`, { outcome: 'grant-part', coreHours: 40_000, message: 'Granted most of the pool.' })).status).toBe(200);
      const pool = (await (await call(world.tokens.admin, 'GET', `/campaigns/${second}/pool`)).json()) as PoolUsage;
      expect(pool).toMatchObject({ pool: 50_000, granted: 40_000, unallocated: 10_000 });
      const res = await call(world.tokens.admin, 'POST', `/campaigns/${second}/decision`, { outcome: 'grant-part', coreHours: 10_001, message: 'More than is left.' });
      expect(res.status).toBe(409);
      expect(await message(res)).toMatch(/10,000 core-hours left to grant/);
      expect((await CampaignModel.findByPk(second))!.state).toBe('submitted');
      expect(await LedgerEntry.count({ where: { campaignId: second } })).toBe(0);
      expect((await call(world.tokens.admin, 'POST', `/campaigns/${second}/decision`, { outcome: 'grant-part', coreHours: 10_000, message: 'The rest of the pool.' })).status).toBe(200);
    });

    it('should never let parallel decisions together exceed the pool', async () => {
      const world = await makeCampaignWorld(t, { label: 'pool-race', poolCoreHours: 100_000 });
      const ids = await Promise.all(Array.from({ length: 8 }, () => world.submitted()));
      const statuses = await Promise.all(ids.map((id) => call(world.tokens.admin, 'POST', `/campaigns/${id}/decision`, { outcome: 'grant-part', coreHours: 30_000, message: 'Racing for the pool.' }).then((r) => r.status)));
      expect(statuses.filter((s) => s === 200).length).toBe(3);
      const usage = (await (await call(world.tokens.admin, 'GET', `/rounds/${world.roundId}/usage`)).json()) as { pools: PoolUsage[] };
      expect(usage.pools[0]).toMatchObject({ pool: 100_000, granted: 90_000, unallocated: 10_000 });
    });

    it('should refuse a partial grant that is not less than the request, and record a decline without a ledger entry', async () => {
      const id = await w.submitted();
      const c = (await (await call(w.tokens.admin, 'GET', `/campaigns/${id}`)).json()) as Campaign;
      const res = await call(w.tokens.admin, 'POST', `/campaigns/${id}/decision`, { outcome: 'grant-part', coreHours: c.requestedCoreHours, message: 'The whole request.' });
      expect(res.status).toBe(422);
      expect((await call(w.tokens.admin, 'POST', `/campaigns/${id}/decision`, { outcome: 'grant-part', message: 'No amount given.' })).status).toBe(422);
      const declined = await call(w.tokens.admin, 'POST', `/campaigns/${id}/decision`, { outcome: 'decline', message: 'Declined: the plan cannot reach the critical regime.' });
      expect(declined.status).toBe(200);
      expect(((await declined.json()) as Campaign).state).toBe('declined');
      expect(await LedgerEntry.count({ where: { campaignId: id } })).toBe(0);
      expect((await call(w.tokens.admin, 'POST', `/campaigns/${id}/decision`, { outcome: 'decline', message: 'Once more with feeling.' })).status).toBe(409);
    });

    it("should deliver the decision mail through the worker to the mail fake's inbox", async () => {
      const title = `Inbox check ${Date.now()}`;
      const id = await w.submitted(title);
      expect((await call(w.tokens.admin, 'POST', `/campaigns/${id}/decision`, { outcome: 'grant-part', coreHours: 500, message: 'Granted in part; see the reviews.' })).status).toBe(200);
      const inbox = `http://${t.settings.SMTP_HOST}:${t.settings.MAIL_INBOX_PORT}/api/email`;
      type Mail = { subject: string; to: { address: string }[]; text: string; html: string };
      let mails: Mail[] = [];
      for (let i = 0; i < 100 && mails.length < 2; i++) {
        mails = ((await (await fetch(inbox)).json()) as Mail[]).filter((m) => m.subject.includes(title) && m.subject.startsWith('Partly granted'));
        if (mails.length < 2) await new Promise((r) => setTimeout(r, 200));
      }
      expect(mails.flatMap((m) => m.to.map((to) => to.address)).sort()).toEqual([w.pi.email, w.researcher.email].sort());
      expect(mails[0].text).toContain('Granted in part; see the reviews.');
      expect(mails[0].text).toContain('500 core-hours');
      expect(mails[0].html).toContain('<');
    });

    it('should mail the decision to the owner and the PI', async () => {
      const id = await w.submitted();
      expect((await call(w.tokens.admin, 'POST', `/campaigns/${id}/decision`, { outcome: 'grant-part', coreHours: 1000, message: 'Granted in part.' })).status).toBe(200);
      const mails = (await OutboxMessage.findAll({ where: { kind: 'mail' } })).filter((m) => String(m.payload.dedupeKey).startsWith('decision') && String(m.payload.dedupeKey).includes(id));
      const recipients = mails.flatMap((m) => m.payload.to as string[]).sort();
      expect(recipients).toEqual([w.pi.email, w.researcher.email].sort());
    });
  });
});
