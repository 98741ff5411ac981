import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OutboxMessage } from '../db/models';
import { createInstitution, createPerson, startTestApp, tokenFor, withToken, type TestApp } from '../../test/harness';

let t: TestApp;
let adminToken: string;
let admin: Awaited<ReturnType<typeof createPerson>>;
const label = `ppl${Date.now().toString(36)}`;

const api = (method: string, path: string, body?: unknown, token = adminToken) => withToken(t, token, method, `/api/v1${path}`, body);

beforeAll(async () => {
  t = await startTestApp();
  admin = await createPerson(t, { roles: ['admin'], label: `${label}-admin` });
  adminToken = await tokenFor(t, admin);
  for (const n of ['c', 'a', 'b']) await createPerson(t, { roles: ['researcher'], label: `${label}-${n}` });
});
afterAll(async () => t.close());

describe('people', () => {
  describe('list', () => {
    it('should page, sort and filter on the server when asked', async () => {
      const res = await api('GET', `/people?q=${label}-&role=researcher&sort=-email&limit=2&offset=0`);
      expect(res.status).toBe(200);
      const page = (await res.json()) as { items: { email: string }[]; total: number; limit: number; offset: number };
      expect(page.total).toBe(3);
      expect(page.limit).toBe(2);
      expect(page.items.map((p) => p.email.split('-')[1])).toEqual(['c', 'b']);
      const second = (await (await api('GET', `/people?q=${label}-&role=researcher&sort=-email&limit=2&offset=2`)).json()) as { items: { email: string }[] };
      expect(second.items.map((p) => p.email.split('-')[1])).toEqual(['a']);
    });

    it('should list only the people who never signed in when linked=false', async () => {
      const page = (await (await api('GET', `/people?q=${label}-&linked=false&limit=200`)).json()) as { items: { linked: boolean }[]; total: number };
      expect(page.total).toBeGreaterThanOrEqual(3);
      expect(page.items.every((p) => p.linked === false)).toBe(true);
      const linked = (await (await api('GET', `/people?q=${label}-&linked=true`)).json()) as { total: number };
      expect(linked.total).toBe(0);
    });

    it('should export every matching row as CSV when format=csv', async () => {
      const res = await api('GET', `/people?q=${label}-&role=researcher&sort=email&format=csv&limit=1`);
      expect(res.status).toBe(200);
      expect(res.headers.get('content-type')).toMatch(/text\/csv/);
      expect(res.headers.get('content-disposition')).toMatch(/attachment; filename="?localis-people-\d{4}-\d\d-\d\d\.csv"?/);
      const lines = (await res.text()).trim().split('\r\n');
      expect(lines[0]).toBe('name,email,institutionName,roles,active,linked,lastSignInAt,createdAt,id');
      expect(lines).toHaveLength(4);
    });
  });

  describe('create', () => {
    it('should refuse a second person with the same e-mail when added twice', async () => {
      const body = { name: 'Twice Added', email: `${label}-twice@test.example`, roles: [] };
      expect((await api('POST', '/people', body)).status).toBe(201);
      const again = await api('POST', '/people', { ...body, email: body.email.toUpperCase() });
      expect(again.status).toBe(409);
      expect(((await again.json()) as { error: { message: string } }).error.message).toContain(body.email);
    });

    it('should answer 422 beside the field when the institution does not exist', async () => {
      const res = await api('POST', '/people', { name: 'Nowhere', email: `${label}-nowhere@test.example`, institutionId: '00000000-0000-4000-8000-000000000000' });
      expect(res.status).toBe(422);
      expect(((await res.json()) as { error: { details: { path: string[] }[] } }).error.details[0].path).toEqual(['institutionId']);
    });
  });

  describe('roles', () => {
    it('should grant a role, write the audit log and queue an e-mail in one go', async () => {
      const person = await createPerson(t, { roles: [], label: `${label}-grant` });
      const res = await api('PUT', `/people/${person.id}/roles/committee`);
      expect(res.status).toBe(200);
      expect(((await res.json()) as { roles: string[] }).roles).toEqual(['committee']);
      const audit = (await (await api('GET', `/audit?targetType=person&targetId=${person.id}&action=role.`)).json()) as { items: { action: string; actorPersonId: string; via: string; details: { role: string } }[] };
      expect(audit.items[0]).toMatchObject({ action: 'role.granted', actorPersonId: admin.id, via: 'token', details: { role: 'committee' } });
      const mails = await OutboxMessage.findAll({ where: { kind: 'mail' } });
      expect(mails.some((m) => (m.payload as { to: string[] }).to.includes(person.email))).toBe(true);
      // granting again changes nothing
      expect((await api('PUT', `/people/${person.id}/roles/committee`)).status).toBe(200);
      const again = (await (await api('GET', `/audit?targetType=person&targetId=${person.id}&action=role.`)).json()) as { total: number };
      expect(again.total).toBe(1);
    });

    it('should keep the last active admin when someone tries to remove them', async () => {
      // Count the admins there are; remove all but `admin`, then try to remove `admin`.
      const admins = (await (await api('GET', '/people?role=admin&active=true&limit=200')).json()) as { items: { id: string }[] };
      const tokenOfOthers: string[] = [];
      for (const a of admins.items.filter((a) => a.id !== admin.id)) {
        await api('PATCH', `/people/${a.id}`, { active: false });
        tokenOfOthers.push(a.id);
      }
      try {
        const res = await api('DELETE', `/people/${admin.id}/roles/admin`);
        expect(res.status).toBe(409);
        expect(((await res.json()) as { error: { message: string } }).error.message).toMatch(/last active admin/);
      } finally {
        for (const id of tokenOfOthers) await api('PATCH', `/people/${id}`, { active: true });
      }
    });
  });

  describe('update', () => {
    it('should record what changed, from and to, when an admin edits a person', async () => {
      const inst = await createInstitution(t);
      const person = await createPerson(t, { roles: ['researcher'], label: `${label}-edit` });
      const res = await api('PATCH', `/people/${person.id}`, { institutionId: inst.id, name: 'Edited Name' });
      expect(res.status).toBe(200);
      expect(await res.json()).toMatchObject({ institutionId: inst.id, institutionName: inst.name, name: 'Edited Name' });
      const audit = (await (await api('GET', `/audit?targetId=${person.id}&action=person.updated`)).json()) as { items: { details: Record<string, { from: unknown; to: unknown }> }[] };
      expect(audit.items[0].details.name).toEqual({ from: person.name, to: 'Edited Name' });
    });

    it('should lock a deactivated person out of the API at once', async () => {
      const person = await createPerson(t, { roles: ['researcher'], label: `${label}-off` });
      const token = await tokenFor(t, person, ['read']);
      expect((await api('GET', '/me', undefined, token)).status).toBe(200);
      await api('PATCH', `/people/${person.id}`, { active: false });
      expect((await api('GET', '/me', undefined, token)).status).toBe(401);
    });
  });
});
