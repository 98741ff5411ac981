import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Round } from '@localis/shared';
import { createInstitution, createPerson, startTestApp, SYSTEM, tokenFor, withToken, type TestApp } from '../../test/harness';

let t: TestApp;
let adminToken: string;
let researcherToken: string;
const call = (token: string, method: string, path: string, body?: unknown) => withToken(t, token, method, `/api/v1${path}`, body);
const day = 86_400_000;
const at = (days: number) => new Date(Date.now() + days * day).toISOString();
const unique = (label: string) => `${label} ${Math.random().toString(36).slice(2, 8)}`;

beforeAll(async () => {
  t = await startTestApp();
  adminToken = await tokenFor(t, await createPerson(t, { roles: ['admin'], label: 'round-admin' }));
  researcherToken = await tokenFor(t, await createPerson(t, { roles: ['researcher'], label: 'round-researcher' }));
});
afterAll(async () => t.close());

describe('rounds', () => {
  describe('creation', () => {
    it('should open a round with its pools and say it is open when today lies between its dates', async () => {
      const res = await call(adminToken, 'POST', '/rounds', { name: unique('Spring'), opensAt: at(-1), closesAt: at(60), pools: [{ machine: 'cluster-a', coreHours: 5_000_000 }, { machine: 'gpu-b', coreHours: 200_000 }] });
      expect(res.status).toBe(201);
      const round = (await res.json()) as Round;
      expect(round.status).toBe('open');
      expect(round.totalCoreHours).toBe(5_200_000);
      const open = (await (await call(researcherToken, 'GET', '/rounds?status=open&limit=200')).json()) as { items: Round[] };
      expect(open.items.map((r) => r.id)).toContain(round.id);
      const closed = (await (await call(researcherToken, 'GET', '/rounds?status=closed&limit=200')).json()) as { items: Round[] };
      expect(closed.items.map((r) => r.id)).not.toContain(round.id);
    });

    it.each([
      ['a round that closes before it opens', { opensAt: at(10), closesAt: at(5) }, ['closesAt']],
      ['two pools on one machine', { pools: [{ machine: 'cluster-a', coreHours: 1 }, { machine: 'cluster-a', coreHours: 2 }] }, ['pools']],
      ['a pool of zero core-hours', { pools: [{ machine: 'cluster-a', coreHours: 0 }] }, ['pools', 0, 'coreHours']],
      ['a machine name with spaces', { pools: [{ machine: 'Cluster A', coreHours: 10 }] }, ['pools', 0, 'machine']],
    ])('should refuse %s with its field path', async (_name, change, path) => {
      const res = await call(adminToken, 'POST', '/rounds', { name: unique('Bad'), opensAt: at(0), closesAt: at(30), pools: [{ machine: 'cluster-a', coreHours: 10 }], ...change });
      expect(res.status).toBe(422);
      expect(((await res.json()) as { error: { details: { path: unknown[] }[] } }).error.details.map((d) => d.path)).toContainEqual(path);
    });

    it('should answer 409 when the name is taken', async () => {
      const name = unique('Twice');
      const body = { name, opensAt: at(0), closesAt: at(30), pools: [{ machine: 'cluster-a', coreHours: 10 }] };
      expect((await call(adminToken, 'POST', '/rounds', body)).status).toBe(201);
      expect((await call(adminToken, 'POST', '/rounds', body)).status).toBe(409);
    });
  });

  describe('changes', () => {
    it('should keep a pool that a campaign draws on', async () => {
      const inst = await createInstitution(t);
      const pi = await createPerson(t, { roles: ['pi', 'researcher'], institutionId: inst.id, label: 'round-pi' });
      const group = await t.services.groups.create(SYSTEM, { name: unique('Round group'), institutionId: inst.id, piPersonId: pi.id });
      const round = (await (await call(adminToken, 'POST', '/rounds', { name: unique('Used'), opensAt: at(-1), closesAt: at(30), pools: [{ machine: 'cluster-a', coreHours: 1000 }, { machine: 'spare', coreHours: 10 }] })).json()) as Round;
      const piCtx = { ...SYSTEM, principal: { personId: pi.id, name: pi.name, email: pi.email, institutionId: inst.id, roles: pi.roles, scopes: ['read' as const, 'write' as const], via: 'session' as const } };
      await t.services.campaigns.create(piCtx, {
        title: 'Pool user', abstract: 'A campaign that draws on the cluster-a pool.', justification: '', groupId: group.id, roundId: round.id, machine: 'cluster-a',
        spec: { model: 'anderson-box', dimension: 1, symmetryClass: 'AI', goal: 'localization-length', sizes: [1], disorder: { values: [1] }, energies: [0], realizations: 1, method: 'transfer-matrix', targetPrecision: 0.01, methodOptions: {}, node: { coresPerNode: 1, memoryGiBPerNode: 1 } },
      });
      const refused = await call(adminToken, 'PATCH', `/rounds/${round.id}`, { pools: [{ machine: 'spare', coreHours: 10 }] });
      expect(refused.status).toBe(409);
      expect(((await refused.json()) as { error: { message: string } }).error.message).toContain('cluster-a');
      const kept = await call(adminToken, 'PATCH', `/rounds/${round.id}`, { pools: [{ machine: 'cluster-a', coreHours: 2000 }] });
      expect(kept.status).toBe(200);
      expect(((await kept.json()) as Round).pools).toEqual([{ machine: 'cluster-a', coreHours: 2000 }]);
    });

    it('should refuse new dates that close the round before it opens', async () => {
      const round = (await (await call(adminToken, 'POST', '/rounds', { name: unique('Dates'), opensAt: at(1), closesAt: at(30), pools: [{ machine: 'cluster-a', coreHours: 10 }] })).json()) as Round;
      const res = await call(adminToken, 'PATCH', `/rounds/${round.id}`, { closesAt: at(0) });
      expect(res.status).toBe(422);
    });
  });
});
