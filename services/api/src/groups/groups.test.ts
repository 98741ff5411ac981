import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createInstitution, createPerson, startTestApp, SYSTEM, tokenFor, withToken, type TestApp } from '../../test/harness';

let t: TestApp;
let piToken: string;
let groupId: string;
let pi: Awaited<ReturnType<typeof createPerson>>;

const call = (token: string, method: string, path: string, body?: unknown) => withToken(t, token, method, `/api/v1${path}`, body);

beforeAll(async () => {
  t = await startTestApp();
  const inst = await createInstitution(t);
  pi = await createPerson(t, { roles: ['pi', 'researcher'], institutionId: inst.id, label: 'group-pi' });
  piToken = await tokenFor(t, pi);
  groupId = (await t.services.groups.create(SYSTEM, { name: 'Flow Group', institutionId: inst.id, piPersonId: pi.id })).id;
});
afterAll(async () => t.close());

describe('research groups', () => {
  describe('membership', () => {
    it('should let the PI add and remove a member of their own group', async () => {
      const student = await createPerson(t, { roles: ['researcher'], label: 'group-student' });
      const added = await call(piToken, 'POST', `/groups/${groupId}/members`, { personId: student.id });
      expect(added.status).toBe(200);
      expect(((await added.json()) as { members: { personId: string }[] }).members.map((m) => m.personId)).toEqual([pi.id, student.id]);
      const mine = (await (await call(await tokenFor(t, student, ['read']), 'GET', '/groups?mine=true')).json()) as { items: { id: string }[] };
      expect(mine.items.map((g) => g.id)).toEqual([groupId]);
      const removed = await call(piToken, 'DELETE', `/groups/${groupId}/members/${student.id}`);
      expect(removed.status).toBe(200);
      expect(((await removed.json()) as { memberCount: number }).memberCount).toBe(1);
    });

    it('should refuse to remove the PI from their own group', async () => {
      const res = await call(piToken, 'DELETE', `/groups/${groupId}/members/${pi.id}`);
      expect(res.status).toBe(409);
    });

    it('should refuse a group whose leader does not hold the PI role', async () => {
      const admin = await createPerson(t, { roles: ['admin'], label: 'group-admin' });
      const notPi = await createPerson(t, { roles: ['researcher'], label: 'group-notpi' });
      const inst = await createInstitution(t);
      const res = await call(await tokenFor(t, admin), 'POST', '/groups', { name: 'No Lead', institutionId: inst.id, piPersonId: notPi.id });
      expect(res.status).toBe(422);
      expect(((await res.json()) as { error: { details: { path: string[] }[] } }).error.details[0].path).toEqual(['piPersonId']);
    });
  });
});
