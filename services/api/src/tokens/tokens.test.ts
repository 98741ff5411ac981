import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ApiToken, AuditLog } from '../db/models';
import { BrowserSession, createPerson, startTestApp, tokenFor, type TestApp } from '../../test/harness';
import { hashToken } from './token-secret';

let t: TestApp;
let browser: BrowserSession;
let person: Awaited<ReturnType<typeof createPerson>>;

beforeAll(async () => {
  t = await startTestApp();
  person = await createPerson(t, { roles: ['researcher'], label: 'tokens' });
  browser = new BrowserSession(t.url);
  await browser.signIn(person.email);
});
afterAll(async () => t.close());

describe('personal API tokens', () => {
  describe('creation', () => {
    it('should show the secret once and store only its SHA-256 when a token is created', async () => {
      const res = await browser.api('POST', '/api/v1/me/tokens', { name: 'cluster-a login node', scopes: ['read', 'runs'], expiresInDays: 30 });
      expect(res.status).toBe(201);
      const { token, secret } = (await res.json()) as { token: { id: string; prefix: string; scopes: string[]; expiresAt: string }; secret: string };
      expect(secret).toMatch(/^lcs_[\w-]{43}$/);
      expect(secret.startsWith(token.prefix)).toBe(true);
      const row = await ApiToken.findByPk(token.id);
      expect(row!.tokenHash).toBe(hashToken(secret));
      expect(JSON.stringify(row!.toJSON())).not.toContain(secret);
      const days = (new Date(token.expiresAt).getTime() - Date.now()) / 86_400_000;
      expect(days).toBeGreaterThan(29.9);
      const listed = await (await browser.api('GET', '/api/v1/me/tokens')).text();
      expect(listed).toContain(token.id);
      expect(listed).not.toContain(secret);
      const audit = await AuditLog.findAll({ where: { targetId: token.id } });
      expect(JSON.stringify(audit.map((a) => a.toJSON()))).not.toContain(secret);
    });

    it('should refuse the admin scope when the person is not an admin', async () => {
      const res = await browser.api('POST', '/api/v1/me/tokens', { name: 'too much', scopes: ['admin'] });
      expect(res.status).toBe(422);
      expect(((await res.json()) as { error: { details: { path: string[] }[] } }).error.details[0].path).toEqual(['scopes']);
    });

    it('should refuse to make a token with a token', async () => {
      const token = await tokenFor(t, person, ['read', 'write']);
      const res = await fetch(`${t.url}/api/v1/me/tokens`, {
        method: 'POST',
        headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' },
        body: JSON.stringify({ name: 'child', scopes: ['read'] }),
      });
      expect(res.status).toBe(403);
    });
  });

  describe('revocation', () => {
    it("should refuse to revoke someone else's token", async () => {
      const other = await createPerson(t, { roles: ['researcher'], label: 'tokens-other' });
      const otherSession = new BrowserSession(t.url);
      await otherSession.signIn(other.email);
      const created = (await (await otherSession.api('POST', '/api/v1/me/tokens', { name: 'theirs', scopes: ['read'] })).json()) as { token: { id: string } };
      const res = await browser.api('DELETE', `/api/v1/me/tokens/${created.token.id}`);
      expect(res.status).toBe(403);
      expect((await ApiToken.findByPk(created.token.id))!.revokedAt).toBeNull();
    });
  });

  describe('use', () => {
    it('should record when a token was last used', async () => {
      const token = await tokenFor(t, person, ['read']);
      expect((await ApiToken.findOne({ where: { tokenHash: hashToken(token) } }))!.lastUsedAt).toBeNull();
      await fetch(`${t.url}/api/v1/me`, { headers: { authorization: `Bearer ${token}` } });
      expect((await ApiToken.findOne({ where: { tokenHash: hashToken(token) } }))!.lastUsedAt).not.toBeNull();
    });
  });
});
