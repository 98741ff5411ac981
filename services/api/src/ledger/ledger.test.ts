import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { Ledger, LedgerEntry as EntryDto, Run } from '@localis/shared';
import { BrowserSession, startTestApp, type TestApp } from '../../test/harness';
import { actingAs, makeCampaignWorld, type CampaignWorld } from '../../test/campaign-world';
import { IdempotencyKey, LedgerEntry, OutboxMessage, UsageAlert } from '../db/models';

let t: TestApp;
let w: CampaignWorld;

const call = (token: string, method: string, path: string, body?: unknown, headers: Record<string, string> = {}) =>
  fetch(`${t.url}/api/v1${path}`, {
    method,
    headers: { authorization: `Bearer ${token}`, ...(body !== undefined ? { 'content-type': 'application/json' } : {}), ...headers },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
const run = (over: Record<string, unknown> = {}) => ({
  externalJobId: `job-${randomUUID()}`, machine: w.machine, startedAt: '2027-02-01T08:00:00Z', endedAt: '2027-02-01T20:00:00Z',
  cores: 128, codeName: 'tmm-bar', codeVersion: '3f2c1e9', parameters: { sizes: [12], disorder: [16.5], energies: [0], seeds: [1, 2] }, ...over,
});
const ledgerOf = async (id: string) => (await (await call(w.tokens.pi, 'GET', `/campaigns/${id}/ledger`)).json()) as Ledger;

beforeAll(async () => {
  // Scripts hammer the api here on purpose; the per-token rate limit is not what these tests are about.
  t = await startTestApp({ TOKEN_RATE_PER_MINUTE: '100000' });
  w = await makeCampaignWorld(t, { label: 'ledger' });
});
afterAll(async () => t.close());

describe('ledger and runs', () => {
  describe('recording a run', () => {
    it('should debit cores x wall-clock when core-hours are left out (128 cores x 12 h = 1536)', async () => {
      const id = await w.granted(5000);
      const res = await call(w.tokens.researcher, 'POST', `/campaigns/${id}/runs`, run());
      expect(res.status, await res.clone().text()).toBe(201);
      expect(((await res.json()) as Run).coreHours).toBe(1536);
      const ledger = await ledgerOf(id);
      expect(ledger).toMatchObject({ granted: 5000, used: 1536, remaining: 3464 });
      expect(ledger.entries.map((e) => [e.kind, e.coreHours, e.balanceAfter])).toEqual([['grant', 5000, 5000], ['debit', -1536, 3464]]);
    });

    it('should take the given core-hours when a script sends them', async () => {
      const id = await w.granted(5000);
      const res = await call(w.tokens.pi, 'POST', `/campaigns/${id}/runs`, run({ coreHours: 1000.5 }));
      expect(((await res.json()) as Run).coreHours).toBe(1000.5);
      expect((await ledgerOf(id)).remaining).toBe(3999.5);
    });

    it.each([
      ['end before start', { endedAt: '2027-02-01T07:00:00Z' }, ['endedAt']],
      ['negative cores', { cores: -4 }, ['cores']],
      ['a misspelt key', { coreHour: 3 }, []],
      ['a date without a zone', { startedAt: '2027-02-01 08:00' }, ['startedAt']],
    ])('should refuse %s with 422 and write nothing', async (_name, over, path) => {
      const id = await w.granted(5000);
      const res = await call(w.tokens.pi, 'POST', `/campaigns/${id}/runs`, run(over));
      expect(res.status).toBe(422);
      const body = (await res.json()) as { error: { details: { path: unknown[] }[] } };
      if (path.length) expect(body.error.details.map((d) => d.path)).toContainEqual(path);
      expect(await LedgerEntry.count({ where: { campaignId: id, kind: 'debit' } })).toBe(0);
    });

    it('should refuse a job id already recorded on the machine with 409', async () => {
      const id = await w.granted(5000);
      const body = run();
      expect((await call(w.tokens.pi, 'POST', `/campaigns/${id}/runs`, body)).status).toBe(201);
      const again = await call(w.tokens.pi, 'POST', `/campaigns/${id}/runs`, body);
      expect(again.status).toBe(409);
      expect(((await again.json()) as { error: { message: string } }).error.message).toMatch(/recorded already/);
      expect((await ledgerOf(id)).used).toBe(1536);
    });

    it('should refuse a run on a campaign that is not granted with 409', async () => {
      const id = await w.submitted();
      const res = await call(w.tokens.pi, 'POST', `/campaigns/${id}/runs`, run());
      expect(res.status).toBe(409);
      expect(((await res.json()) as { error: { message: string } }).error.message).toMatch(/not granted/);
    });

    it('should refuse a run on another machine with 422 at path machine', async () => {
      const id = await w.granted(5000);
      const res = await call(w.tokens.pi, 'POST', `/campaigns/${id}/runs`, run({ machine: 'elsewhere-1' }));
      expect(res.status).toBe(422);
    });

    it('should refuse a debit beyond the remaining grant under the default policy', async () => {
      const id = await w.granted(1000);
      const res = await call(w.tokens.pi, 'POST', `/campaigns/${id}/runs`, run());
      expect(res.status).toBe(409);
      expect(((await res.json()) as { error: { message: string } }).error.message).toMatch(/1,000 core-hours left/);
      expect((await ledgerOf(id)).remaining).toBe(1000);
    });

    it('should let outsiders and committee members record nothing', async () => {
      const id = await w.granted(5000);
      expect((await call(w.tokens.outsider, 'POST', `/campaigns/${id}/runs`, run())).status).toBe(404);
      expect((await call(w.tokens.reviewer, 'POST', `/campaigns/${id}/runs`, run())).status).toBe(403);
    });

    it('should list runs with a job-id filter and as CSV', async () => {
      const id = await w.granted(5000);
      const body = run({ externalJobId: `findme-${randomUUID().slice(0, 6)}` });
      await call(w.tokens.pi, 'POST', `/campaigns/${id}/runs`, body);
      await call(w.tokens.pi, 'POST', `/campaigns/${id}/runs`, run());
      const page = (await (await call(w.tokens.pi, 'GET', `/campaigns/${id}/runs?q=findme`)).json()) as { items: Run[]; total: number };
      expect(page.total).toBe(1);
      expect(page.items[0].externalJobId).toBe(body.externalJobId);
      const csv = await (await call(w.tokens.pi, 'GET', `/campaigns/${id}/runs?format=csv`)).text();
      expect(csv.split('\r\n')[0]).toContain('externalJobId');
      expect(csv).toContain(body.externalJobId);
    });
  });

  describe('overdraft policy', () => {
    it('should allow a debit up to the round percentage, flag it, and refuse beyond', async () => {
      const world = await makeCampaignWorld(t, { label: 'overdraft', overdraftPercent: 10 });
      const id = await world.granted(1500);
      const res = await call(world.tokens.pi, 'POST', `/campaigns/${id}/runs`, { ...run(), machine: world.machine });
      expect(res.status).toBe(201);
      const ledger = (await (await call(world.tokens.pi, 'GET', `/campaigns/${id}/ledger`)).json()) as Ledger;
      expect(ledger.remaining).toBe(-36);
      expect(ledger.overdraftAllowance).toBe(150);
      expect(ledger.entries.at(-1)!.overdraft).toBe(true);
      const beyond = await call(world.tokens.pi, 'POST', `/campaigns/${id}/runs`, { ...run({ coreHours: 115 }), machine: world.machine });
      expect(beyond.status).toBe(409);
    });
  });

  describe('adjustments, transfers, refunds', () => {
    it('should refund a run in part, then the rest, and refuse more', async () => {
      const id = await w.granted(5000);
      const r = (await (await call(w.tokens.pi, 'POST', `/campaigns/${id}/runs`, run())).json()) as Run;
      expect((await call(w.tokens.admin, 'POST', `/campaigns/${id}/ledger/refunds`, { runId: r.id, coreHours: 36, reason: 'node failure at the end' })).status).toBe(201);
      expect((await call(w.tokens.admin, 'POST', `/campaigns/${id}/ledger/refunds`, { runId: r.id, reason: 'the whole run was lost' })).status).toBe(201);
      expect((await call(w.tokens.admin, 'POST', `/campaigns/${id}/ledger/refunds`, { runId: r.id, reason: 'once more' })).status).toBe(409);
      expect(await ledgerOf(id)).toMatchObject({ used: 0, remaining: 5000 });
    });

    it('should move core-hours between campaigns of the group and keep the pool total', async () => {
      const a = await w.granted(3000, { title: 'Giver' });
      const b = await w.granted(1000, { title: 'Receiver' });
      const res = await call(w.tokens.pi, 'POST', `/campaigns/${a}/ledger/transfers`, { toCampaignId: b, coreHours: 500, reason: 'the receiver needs the largest size' });
      expect(res.status, await res.clone().text()).toBe(201);
      const { from, to } = (await res.json()) as { from: EntryDto; to: EntryDto };
      expect([from.coreHours, to.coreHours]).toEqual([-500, 500]);
      expect([(await ledgerOf(a)).remaining, (await ledgerOf(b)).remaining]).toEqual([2500, 1500]);
      const tooMuch = await call(w.tokens.pi, 'POST', `/campaigns/${a}/ledger/transfers`, { toCampaignId: b, coreHours: 2501, reason: 'more than is left' });
      expect(tooMuch.status).toBe(409);
      expect((await call(w.tokens.researcher, 'POST', `/campaigns/${a}/ledger/transfers`, { toCampaignId: b, coreHours: 1, reason: 'not the PI' })).status).toBe(403);
    });

    it('should refuse an adjustment that takes a campaign below zero or a pool beyond its size', async () => {
      const world = await makeCampaignWorld(t, { label: 'adjust', poolCoreHours: 10_000 });
      const id = await world.granted(9000);
      const call2 = (body: unknown) => call(world.tokens.admin, 'POST', `/campaigns/${id}/ledger/adjustments`, body);
      expect((await call2({ coreHours: -9001, reason: 'too much' })).status).toBe(409);
      expect((await call2({ coreHours: 1001, reason: 'beyond the pool' })).status).toBe(409);
      expect((await call2({ coreHours: 1000, reason: 'the rest of the pool' })).status).toBe(201);
      expect((await call2({ coreHours: 0, reason: 'nothing' })).status).toBe(422);
      expect((await call2({ coreHours: 5 })).status).toBe(422);
    });
  });

  describe('append-only', () => {
    it('should refuse to edit or delete a ledger entry', async () => {
      const id = await w.granted(100);
      await expect(LedgerEntry.update({ reason: 'rewritten' }, { where: { campaignId: id } })).rejects.toThrow(/append-only/);
      await expect(LedgerEntry.destroy({ where: { campaignId: id } })).rejects.toThrow(/append-only/);
    });
  });

  describe('usage alerts', () => {
    it('should alert 75, 90 and 100 % once each, with mail in the outbox', async () => {
      const id = await w.granted(100);
      const charge = (coreHours: number) => call(w.tokens.pi, 'POST', `/campaigns/${id}/runs`, run({ coreHours }));
      await charge(74);
      expect(await UsageAlert.count({ where: { campaignId: id } })).toBe(0);
      await charge(1);
      await charge(1);
      expect((await UsageAlert.findAll({ where: { campaignId: id } })).map((a) => a.threshold)).toEqual([75]);
      await charge(24);
      expect((await UsageAlert.findAll({ where: { campaignId: id }, order: [['threshold', 'ASC']] })).map((a) => a.threshold)).toEqual([75, 90, 100]);
      const mails = await OutboxMessage.findAll({ where: { kind: 'mail' } });
      const alerts = mails.filter((m) => String(m.payload.dedupeKey).includes(id) && String(m.payload.dedupeKey).startsWith('usage-threshold'));
      // Owner (the researcher) and the PI, three thresholds each.
      expect(alerts.length).toBe(6);
    });
  });

  describe('concurrency', () => {
    it('should never overdraw a grant under 120 parallel debits', async () => {
      const id = await w.granted(1000);
      const results = await Promise.all(Array.from({ length: 120 }, () => call(w.tokens.pi, 'POST', `/campaigns/${id}/runs`, run({ coreHours: 10 })).then((r) => r.status)));
      expect(results.filter((s) => s === 201).length).toBe(100);
      expect(results.filter((s) => s === 409).length).toBe(20);
      const ledger = await ledgerOf(id);
      expect(ledger).toMatchObject({ used: 1000, remaining: 0 });
      expect(ledger.entries.every((e) => e.balanceAfter >= 0)).toBe(true);
    });

    it('should charge once per Idempotency-Key when each request is sent twice at the same time', async () => {
      const id = await w.granted(400);
      const bodies = Array.from({ length: 60 }, () => run({ coreHours: 10 }));
      const sends = bodies.flatMap((body, i) => [0, 1].map(() => call(w.tokens.pi, 'POST', `/campaigns/${id}/runs`, body, { 'idempotency-key': `race-${id}-${i}` })));
      const answers = await Promise.all(sends.map(async (p) => {
        const r = await p;
        return { status: r.status, replayed: r.headers.get('idempotent-replayed') === 'true', body: await r.text() };
      }));
      for (let i = 0; i < 60; i++) {
        const [a, b] = [answers[2 * i], answers[2 * i + 1]];
        expect(a.status).toBe(b.status);
        expect(a.body).toBe(b.body);
        expect([a.replayed, b.replayed].filter(Boolean).length).toBe(1);
      }
      expect(answers.filter((a) => a.status === 201).length).toBe(80);
      const ledger = await ledgerOf(id);
      expect(ledger).toMatchObject({ used: 400, remaining: 0 });
      expect(ledger.entries.filter((e) => e.kind === 'debit').length).toBe(40);
    });

    it('should give a client that gave up and retried the first answer, never a second transfer', async () => {
      const from = await w.granted(1000);
      const to = await w.granted(10);
      const key = `abandoned-${randomUUID()}`;
      const body = JSON.stringify({ toCampaignId: to, coreHours: 100, reason: 'the client times out and retries' });
      const headers = { authorization: `Bearer ${w.tokens.pi}`, 'content-type': 'application/json', 'idempotency-key': key };
      // Hold the campaign row, so the first request waits inside its transaction.
      const holder = await t.db.sequelize.transaction();
      await t.db.sequelize.query("SELECT id FROM campaigns WHERE id = :id FOR UPDATE", { replacements: { id: from }, transaction: holder });
      const gaveUp = new AbortController();
      const abandoned = fetch(`${t.url}/api/v1/campaigns/${from}/ledger/transfers`, { method: 'POST', headers, body, signal: gaveUp.signal }).catch(() => 'aborted');
      await new Promise((r) => setTimeout(r, 300));
      gaveUp.abort();
      expect(await abandoned).toBe('aborted');
      const retry = fetch(`${t.url}/api/v1/campaigns/${from}/ledger/transfers`, { method: 'POST', headers, body });
      await new Promise((r) => setTimeout(r, 300));
      await holder.commit();
      const answer = await retry;
      expect(answer.status).toBe(201);
      expect(answer.headers.get('idempotent-replayed')).toBe('true');
      const ledger = await ledgerOf(from);
      expect(ledger.entries.filter((e) => e.kind === 'transfer').length).toBe(1);
      expect(ledger.remaining).toBe(900);
    });

    it('should never store or replay the secret of a new API token', async () => {
      const session = new BrowserSession(t.url);
      await session.signIn(w.pi.email);
      const key = `token-${randomUUID()}`;
      const make = () => session.api('POST', '/api/v1/me/tokens', { name: 'made twice', scopes: ['read'], expiresInDays: 1 }, { 'idempotency-key': key });
      const [a, b] = [await make(), await make()];
      expect([a.status, b.status]).toEqual([201, 201]);
      expect(b.headers.get('idempotent-replayed')).toBeNull();
      const secrets = [((await a.json()) as { secret: string }).secret, ((await b.json()) as { secret: string }).secret];
      expect(secrets[0]).not.toBe(secrets[1]);
      expect(await IdempotencyKey.count({ where: { key } })).toBe(0);
    });

    it('should answer 409 when a key is reused with another body, and replay the first answer for the same one', async () => {
      const id = await w.granted(5000);
      const key = `reuse-${randomUUID()}`;
      const first = await call(w.tokens.pi, 'POST', `/campaigns/${id}/runs`, run({ externalJobId: 'same-1' + key }), { 'idempotency-key': key });
      expect(first.status).toBe(201);
      const other = await call(w.tokens.pi, 'POST', `/campaigns/${id}/runs`, run({ externalJobId: 'other-1' + key }), { 'idempotency-key': key });
      expect(other.status).toBe(409);
      expect(((await other.json()) as { error: { message: string } }).error.message).toMatch(/different request/);
      // Keys belong to their caller: the researcher's identical key is a new request.
      const researchers = await call(w.tokens.researcher, 'POST', `/campaigns/${id}/runs`, run({ externalJobId: 'r-' + key }), { 'idempotency-key': key });
      expect(researchers.status).toBe(201);
    });

    it('should keep balances equal to the sum of entries for any sequence of operations (property, real database)', async () => {
      await fc.assert(
        fc.asyncProperty(
          fc.array(fc.oneof(
            fc.record({ op: fc.constant('run' as const), coreHours: fc.integer({ min: 1, max: 400 }) }),
            fc.record({ op: fc.constant('adjust' as const), coreHours: fc.integer({ min: -300, max: 300 }).filter((v) => v !== 0) }),
            fc.record({ op: fc.constant('refund' as const), share: fc.double({ min: 0.1, max: 1, noNaN: true }) }),
            fc.record({ op: fc.constant('transfer' as const), coreHours: fc.integer({ min: 1, max: 300 }) }),
          ), { minLength: 1, maxLength: 12 }),
          async (ops) => {
            const id = await w.granted(1000);
            const sink = await w.granted(10);
            const runs: Run[] = [];
            for (const o of ops) {
              if (o.op === 'run') {
                const r = await call(w.tokens.pi, 'POST', `/campaigns/${id}/runs`, run({ coreHours: o.coreHours }));
                expect([201, 409]).toContain(r.status);
                if (r.status === 201) runs.push((await r.json()) as Run);
              } else if (o.op === 'adjust') {
                expect([201, 409]).toContain((await call(w.tokens.admin, 'POST', `/campaigns/${id}/ledger/adjustments`, { coreHours: o.coreHours, reason: 'property test' })).status);
              } else if (o.op === 'refund' && runs.length) {
                const r = runs[runs.length - 1];
                expect([201, 409]).toContain((await call(w.tokens.admin, 'POST', `/campaigns/${id}/ledger/refunds`, { runId: r.id, coreHours: Math.max(0.001, Math.round(r.coreHours * o.share * 1000) / 1000), reason: 'property test' })).status);
              } else if (o.op === 'transfer') {
                expect([201, 409]).toContain((await call(w.tokens.pi, 'POST', `/campaigns/${id}/ledger/transfers`, { toCampaignId: sink, coreHours: o.coreHours, reason: 'property test' })).status);
              }
              const ledger = await ledgerOf(id);
              const sum = ledger.entries.reduce((s, e) => s + Math.round(e.coreHours * 1000), 0) / 1000;
              expect(ledger.remaining).toBeCloseTo(sum, 6);
              expect(ledger.remaining).toBeCloseTo(ledger.granted - ledger.used - ledger.expired, 6);
              expect(ledger.remaining).toBeGreaterThanOrEqual(0);
            }
          },
        ),
        { numRuns: 12 },
      );
    }, 120_000);
  });

  describe('expiry', () => {
    it('should expire what is left at the end of the allocation period, once', async () => {
      const world = await makeCampaignWorld(t, { label: 'expiry' });
      const id = await world.granted(700);
      await call(world.tokens.pi, 'POST', `/campaigns/${id}/runs`, { ...run({ coreHours: 200 }), machine: world.machine });
      // Only this round's period ends before `later`; every other round of the test database runs for months.
      const hour = 3600_000;
      await t.services.rounds.update(actingAs(world.admin), world.roundId, { closesAt: new Date(Date.now() - 2 * hour).toISOString(), allocationEndsAt: new Date(Date.now() - hour).toISOString() });
      const later = new Date();
      await t.services.ledger.expireEndedAllocations(actingAs(world.admin), later);
      await t.services.ledger.expireEndedAllocations(actingAs(world.admin), later);
      const ledgerOfWorld = async () => (await (await call(world.tokens.pi, 'GET', `/campaigns/${id}/ledger`)).json()) as Ledger;
      const ledger = await ledgerOfWorld();
      expect(ledger).toMatchObject({ expired: 500, remaining: 0 });
      expect(ledger.entries.filter((e) => e.kind === 'expiry').map((e) => e.coreHours)).toEqual([-500]);

      // A refund after the end is given back and then expires at the next sweep, like the rest.
      const [debit] = ledger.entries.filter((e) => e.kind === 'debit');
      expect((await call(world.tokens.admin, 'POST', `/campaigns/${id}/ledger/refunds`, { runId: debit.runId, coreHours: 50, reason: 'node failure found late' })).status).toBe(201);
      // No new core-hours after the end: adjustments are refused, runs too.
      expect((await call(world.tokens.admin, 'POST', `/campaigns/${id}/ledger/adjustments`, { coreHours: 10, reason: 'too late' })).status).toBe(409);
      expect((await call(world.tokens.pi, 'POST', `/campaigns/${id}/runs`, { ...run({ coreHours: 1 }), machine: world.machine })).status).toBe(409);
      await t.services.ledger.expireEndedAllocations(actingAs(world.admin), later);
      expect(await ledgerOfWorld()).toMatchObject({ used: 150, expired: 550, remaining: 0 });
    });
  });
});
