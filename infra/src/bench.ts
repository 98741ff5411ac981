import { randomUUID } from 'node:crypto';
import { spawn } from 'node:child_process';
import { join } from 'node:path';
import { CampaignInput, CampaignSpec, estimateReport, loadSettings, TOKEN_SCOPES } from '@localis/shared';
import { Campaign, LedgerEntry, openDatabase, Person, RoleGrant, Run } from '@localis/api/db';
import { createServices, SYSTEM_CONTEXT } from '@localis/api/services';

/**
 * `npm run bench`: throughput and latency of the API on this machine: the real api process
 * (as `npm start` runs it) against the real PostgreSQL and Redis of the test profile (a fresh
 * database), loaded from this separate process. Targets are common practice for an
 * interactive web API on one small machine: p95 under 50 ms for a signed request, under 100 ms
 * for a sorted, filtered page of a 5,000-row table. The campaign form recomputes its estimate in the
 * browser on every change, so the pure estimate must fit well inside one 60 Hz frame (16 ms), also
 * for the largest grid the schema admits.
 */
interface Result {
  name: string;
  requests: number;
  seconds: number;
  p50: number;
  p95: number;
  p99: number;
}

async function load(name: string, url: string, headers: Record<string, string>, total: number, concurrency: number, body?: unknown | (() => unknown)): Promise<Result> {
  const latencies: number[] = [];
  let next = 0;
  const start = performance.now();
  await Promise.all(
    Array.from({ length: concurrency }, async () => {
      while (next < total) {
        next++;
        const t0 = performance.now();
        const payload = typeof body === 'function' ? body() : body;
        const res = await fetch(url, payload === undefined ? { headers } : { method: 'POST', headers: { ...headers, 'content-type': 'application/json' }, body: JSON.stringify(payload) });
        await res.arrayBuffer();
        if (!res.ok) throw new Error(`${name}: HTTP ${res.status}`);
        latencies.push(performance.now() - t0);
      }
    }),
  );
  const seconds = (performance.now() - start) / 1000;
  latencies.sort((a, b) => a - b);
  const q = (p: number) => latencies[Math.min(latencies.length - 1, Math.floor(p * latencies.length))];
  return { name, requests: total, seconds, p50: q(0.5), p95: q(0.95), p99: q(0.99) };
}

const PORT = 4290;
const env = { ...process.env, TOKEN_RATE_PER_MINUTE: '1000000', LOG_LEVEL: 'silent', APP_PORT: String(PORT), PUBLIC_URL: `http://127.0.0.1:${PORT}` } as Record<string, string>;
const settings = loadSettings(env);
const db = openDatabase(settings, { poolMax: 4 });
const url = settings.PUBLIC_URL;
const api = spawn(join(import.meta.dirname, '..', '..', 'node_modules', '.bin', 'tsx'), [join(import.meta.dirname, '..', '..', 'services', 'api', 'src', 'main.ts')], { env, stdio: 'inherit' });
for (let i = 0; ; i++) {
  if (i > 150) throw new Error('the api did not start');
  if (await fetch(`${url}/readyz`).then((r) => r.ok, () => false)) break;
  await new Promise((r) => setTimeout(r, 100));
}

const services = createServices(db, settings);
const admin = await services.people.create(SYSTEM_CONTEXT, { name: 'Bench Admin', email: `bench-${randomUUID().slice(0, 6)}@bench.example`, institutionId: null, roles: ['admin'] });
const { secret } = await services.tokens.create(
  { ...SYSTEM_CONTEXT, principal: { personId: admin.id, name: admin.name, email: admin.email, institutionId: null, roles: ['admin'], scopes: [...TOKEN_SCOPES], via: 'session' } },
  { name: 'bench', scopes: ['read', 'runs'], expiresInDays: 1 },
);
const ROWS = 5000;
/** About the requests a busy consortium sends at once: a handful of people and scripts. */
const CONCURRENCY = 8;
const people = Array.from({ length: ROWS }, (_, i) => ({ id: randomUUID(), name: `Bench Person ${String(i).padStart(5, '0')}`, email: `p${i}-${randomUUID().slice(0, 6)}@bench.example`, institutionId: null, oidcSubject: null, lastSignInAt: null }));
await Person.bulkCreate(people);
await RoleGrant.bulkCreate(people.filter((_, i) => i % 3 === 0).map((p) => ({ personId: p.id, role: 'researcher' as const, grantedByPersonId: null })));

// Campaigns: one made through the services (so its estimate is real), then copies in every state.
const adminCtx = { ...SYSTEM_CONTEXT, principal: { personId: admin.id, name: admin.name, email: admin.email, institutionId: null, roles: ['admin' as const, 'pi' as const], scopes: [...TOKEN_SCOPES], via: 'session' as const } };
await RoleGrant.create({ personId: admin.id, role: 'pi', grantedByPersonId: null });
const institution = await services.institutions.create(SYSTEM_CONTEXT, { name: `Bench Institute ${randomUUID().slice(0, 6)}`, kind: 'member', country: 'DE', billingEmail: null });
const group = await services.groups.create(SYSTEM_CONTEXT, { name: 'Bench Group', institutionId: institution.id, piPersonId: admin.id });
const round = await services.rounds.create(adminCtx, { name: `Bench round ${randomUUID().slice(0, 6)}`, opensAt: new Date(Date.now() - 86_400_000).toISOString(), closesAt: new Date(Date.now() + 86_400_000 * 30).toISOString(), pools: [{ machine: 'bench-cluster', coreHours: 1e9 }] });
const EXAMPLE_SPEC = CampaignSpec.parse({
  model: 'anderson-box', dimension: 3, symmetryClass: 'AI', sizes: [6, 8, 12, 16], disorder: { from: 15, to: 18, step: 0.25 }, energies: [0], realizations: 1,
  method: 'transfer-matrix', targetPrecision: 0.002, methodOptions: { expectedLambda: 0.6 }, node: { coresPerNode: 64, memoryGiBPerNode: 256 },
});
const template = await services.campaigns.create(adminCtx, CampaignInput.parse({ title: 'Bench campaign', abstract: 'A campaign the benchmark copies many times.', groupId: group.id, roundId: round.id, machine: 'bench-cluster', spec: EXAMPLE_SPEC }));
const row = (await Campaign.findByPk(template.id))!.get({ plain: true });
const STATES = ['draft', 'submitted', 'in-review', 'granted', 'partly-granted', 'declined', 'withdrawn'] as const;
const METHODS = ['transfer-matrix', 'exact-diagonalization', 'kernel-polynomial'] as const;
await Campaign.bulkCreate(Array.from({ length: ROWS }, (_, i) => ({
  ...row, id: randomUUID(), title: `Bench campaign ${String(i).padStart(5, '0')}`, state: STATES[i % STATES.length], method: METHODS[i % 3],
  requestedCoreHours: 1000 + ((i * 7919) % 100_000), submittedAt: i % STATES.length ? new Date() : null, createdAt: undefined, updatedAt: undefined,
})));

// One granted campaign with RUNS runs, each with its debit: the ledger and runs pages of a busy campaign.
const RUNS = 5000;
const busySubmitted = await services.campaigns.submit(adminCtx, (await services.campaigns.create(adminCtx, CampaignInput.parse({ title: 'Bench busy campaign', abstract: 'A granted campaign with thousands of runs.', groupId: group.id, roundId: round.id, machine: 'bench-cluster', spec: EXAMPLE_SPEC }))).id);
await services.reviews.decide(adminCtx, busySubmitted.id, { outcome: 'grant-all', message: 'Granted for the benchmark.' });
await services.ledger.adjust(adminCtx, busySubmitted.id, { coreHours: 1e8, reason: 'room for the benchmark runs' });
const busy = busySubmitted.id;
const runRows = Array.from({ length: RUNS }, (_, i) => ({
  id: randomUUID(), campaignId: busy, externalJobId: `bench-${i}`, machine: 'bench-cluster', startedAt: new Date(Date.now() - (RUNS - i) * 3_600_000), endedAt: new Date(Date.now() - (RUNS - i) * 3_600_000 + 1_800_000),
  cores: 64, coreHoursMilli: 32_000, codeName: 'tmm-bar', codeVersion: 'bench', parameters: { sizes: [12], disorder: [16.5], energies: [0], seeds: [i] }, source: 'api' as const, recordedByPersonId: admin.id,
}));
await Run.bulkCreate(runRows);
await LedgerEntry.bulkCreate(runRows.map((r) => ({ campaignId: busy, kind: 'debit' as const, milli: -32_000, runId: r.id, counterpartCampaignId: null, reason: null, actorPersonId: admin.id })));
let benchJob = 0;
const freshRun = () => ({ externalJobId: `bench-live-${++benchJob}-${randomUUID().slice(0, 6)}`, machine: 'bench-cluster', startedAt: '2027-02-01T08:00:00Z', endedAt: '2027-02-01T09:00:00Z', cores: 64, codeName: 'tmm-bar', codeVersion: 'bench' });

const auth = { authorization: `Bearer ${secret}` };
const results: Result[] = [];
for (const [name, path, headers, body] of [
  ['GET /healthz (no auth, baseline)', '/healthz', {}, undefined],
  ['GET /api/v1/me (API token)', '/api/v1/me', auth, undefined],
  [`GET /api/v1/people (${ROWS} rows, filter + sort, page of 50)`, '/api/v1/people?role=researcher&sort=-email&limit=50&offset=500', auth, undefined],
  [`GET /api/v1/campaigns (${ROWS} rows, filters + sort, page of 50)`, '/api/v1/campaigns?state=submitted&method=transfer-matrix&dimension=3&sort=-requestedCoreHours&limit=50&offset=50', auth, undefined],
  ['POST /api/v1/estimates (example spec)', '/api/v1/estimates', auth, EXAMPLE_SPEC],
  [`GET /api/v1/campaigns/:id/ledger (${RUNS + 2} entries, balances)`, `/api/v1/campaigns/${busy}/ledger`, auth, undefined],
  [`GET /api/v1/campaigns/:id/runs (${RUNS} runs, search + sort, page of 50)`, `/api/v1/campaigns/${busy}/runs?q=bench-4&sort=-coreHours&limit=50`, auth, undefined],
  ['POST /api/v1/campaigns/:id/runs (one campaign, debits queue on its lock)', `/api/v1/campaigns/${busy}/runs`, auth, freshRun],
] as const) {
  await load(name, url + path, headers, 100, CONCURRENCY, body); // warm-up
  results.push(await load(name, url + path, headers, 2000, CONCURRENCY, body));
}

/** Median time of the pure estimate, in the process (as the form runs it in the browser). */
function timeEstimate(spec: CampaignSpec, runs: number): number {
  for (let i = 0; i < 20; i++) estimateReport(spec);
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    estimateReport(spec);
    times.push(performance.now() - t0);
  }
  return times.sort((a, b) => a - b)[Math.floor(runs / 2)];
}
const LARGEST_SPEC = CampaignSpec.parse({ ...EXAMPLE_SPEC, sizes: Array.from({ length: 64 }, (_, i) => 4 + i), disorder: { from: 0, to: 99.999, step: 0.001 } });
const estimateExample = timeEstimate(EXAMPLE_SPEC, 2000);
const estimateLargest = timeEstimate(LARGEST_SPEC, 200);

const fmt = (n: number) => n.toFixed(1).padStart(7);
console.log(`\nLocalis API benchmark: one api process, concurrency ${CONCURRENCY}, 2000 requests each after 100 warm-up`);
console.log('scenario'.padEnd(62), 'req/s'.padStart(8), 'p50 ms'.padStart(8), 'p95 ms'.padStart(8), 'p99 ms'.padStart(8));
for (const r of results) console.log(r.name.padEnd(62), fmt(r.requests / r.seconds).padStart(8), fmt(r.p50), fmt(r.p95), fmt(r.p99));
const ms3 = (n: number) => n.toFixed(3).padStart(8);
console.log(`${'estimate in process, example spec (median ms)'.padEnd(62)} ${''.padStart(8)} ${ms3(estimateExample)}`);
console.log(`${'estimate in process, 64 sizes x 100,000 W points (median ms)'.padEnd(62)} ${''.padStart(8)} ${ms3(estimateLargest)}`);
const [base, me, list, campaigns, estimate, ledger, runs, record] = results;
const targets = [
  { what: 'signed request p95', value: me.p95, target: 50 },
  { what: `${ROWS}-row list p95`, value: list.p95, target: 100 },
  { what: `${ROWS}-campaign list p95`, value: campaigns.p95, target: 100 },
  { what: 'estimate request p95', value: estimate.p95, target: 50 },
  { what: `ledger of ${RUNS} runs p95`, value: ledger.p95, target: 250 },
  { what: `runs page of ${RUNS} p95`, value: runs.p95, target: 100 },
  { what: 'record a run p95 (contended)', value: record.p95, target: 100 },
  { what: 'largest live estimate', value: estimateLargest, target: 16 },
];
console.log('\nratios');
console.log(`  token authentication cost: p50 ${fmt(me.p50 / base.p50)}x the unauthenticated baseline`);
for (const t of targets) console.log(`  ${t.what.padEnd(30)} ${fmt(t.value)} ms vs target ${t.target} ms -> ${(t.value / t.target).toFixed(2)} of target ${t.value <= t.target ? '(met)' : '(MISSED)'}`);

api.kill('SIGTERM');
await db.close();
process.exit(targets.every((t) => t.value <= t.target) ? 0 : 1);
