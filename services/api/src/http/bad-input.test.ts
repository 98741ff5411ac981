import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ApiToken } from '../db/models';
import { hashToken } from '../tokens/token-secret';
import { BrowserSession, createPerson, startTestApp, tokenFor, type TestApp } from '../../test/harness';

let t: TestApp;
let browser: BrowserSession;
let researcher: Awaited<ReturnType<typeof createPerson>>;

beforeAll(async () => {
  t = await startTestApp();
  researcher = await createPerson(t, { roles: ['researcher'], label: 'bad-input' });
  browser = new BrowserSession(t.url);
  await browser.signIn(researcher.email);
});
afterAll(async () => t.close());

async function errorOf(res: Response) {
  return ((await res.json()) as { error: { code: string; message: string; details?: { path: unknown[]; message: string }[] } }).error;
}

describe('bad input', () => {
  describe('request bodies', () => {
    it('should answer 400 malformed when the JSON cannot be parsed', async () => {
      const res = await browser.fetch(`${t.url}/api/v1/me/tokens`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', 'x-csrf-token': browser.csrfToken },
        body: '{"name": "broken',
      });
      expect(res.status).toBe(400);
      const e = await errorOf(res);
      expect(e.code).toBe('malformed');
      expect(e.message).toMatch(/valid JSON/);
    });

    it('should answer 413 when the body is larger than the limit', async () => {
      const res = await browser.api('POST', '/api/v1/me/tokens', { name: 'x'.repeat(1_100_000), scopes: ['read'] });
      expect(res.status).toBe(413);
      expect((await errorOf(res)).message).toContain('1mb');
    });

    it('should answer 422 with the zod paths when fields are invalid', async () => {
      const res = await browser.api('POST', '/api/v1/me/tokens', { name: '', scopes: [], expiresInDays: 1000 });
      expect(res.status).toBe(422);
      const e = await errorOf(res);
      expect(e.code).toBe('invalid');
      expect(e.details?.map((d) => d.path.join('.'))).toEqual(expect.arrayContaining(['name', 'scopes', 'expiresInDays']));
      expect(e.details?.find((d) => d.path[0] === 'expiresInDays')?.message).toMatch(/at most 366 days/);
    });

    it('should answer 422 when an id in the address is not a UUID', async () => {
      const res = await browser.api('GET', '/api/v1/people/not-a-uuid');
      expect(res.status).toBe(422);
      expect((await errorOf(res)).details?.[0].path).toEqual(['id']);
    });

    it('should answer 422 when a list is sorted by an unknown field', async () => {
      const admin = await createPerson(t, { roles: ['admin'], label: 'sorter' });
      const token = await tokenFor(t, admin, ['read']);
      const res = await fetch(`${t.url}/api/v1/people?sort=password`, { headers: { authorization: `Bearer ${token}` } });
      expect(res.status).toBe(422);
      expect((await errorOf(res)).details?.[0].message).toMatch(/sort must be one of/);
    });
  });

  describe('routes', () => {
    it('should answer 404 in the error shape when the route is unknown', async () => {
      const res = await browser.api('GET', '/api/v1/no-such-thing');
      expect(res.status).toBe(404);
      const e = await errorOf(res);
      expect(e.code).toBe('not_found');
      expect(e.message).toContain('GET /api/v1/no-such-thing');
    });
  });

  describe('CSRF', () => {
    it('should answer 403 csrf_invalid when a session write lacks the token', async () => {
      const res = await browser.api('POST', '/api/v1/me/tokens', { name: 'no csrf', scopes: ['read'] }, { 'x-csrf-token': '' });
      expect(res.status).toBe(403);
      expect((await errorOf(res)).code).toBe('csrf_invalid');
    });

    it('should answer 403 csrf_invalid when the token belongs to another session', async () => {
      const other = new BrowserSession(t.url);
      await other.signIn((await createPerson(t, { roles: ['researcher'], label: 'csrf-other' })).email);
      const res = await browser.api('POST', '/api/v1/me/tokens', { name: 'stolen csrf', scopes: ['read'] }, { 'x-csrf-token': other.csrfToken });
      expect(res.status).toBe(403);
    });

    it('should not ask for a CSRF token when the request carries an API token', async () => {
      const token = await tokenFor(t, researcher, ['read', 'write']);
      const res = await fetch(`${t.url}/api/v1/me/tokens/${randomUUID()}`, { method: 'DELETE', headers: { authorization: `Bearer ${token}` } });
      expect(res.status).toBe(404);
    });
  });

  describe('API tokens', () => {
    const call = (token: string) => fetch(`${t.url}/api/v1/me`, { headers: { authorization: `Bearer ${token}` } });

    it('should answer 401 when the token is unknown', async () => {
      const res = await call('lcs_' + 'x'.repeat(43));
      expect(res.status).toBe(401);
      expect((await errorOf(res)).code).toBe('token_invalid');
    });

    it('should answer 401 naming the date when the token expired', async () => {
      const token = await tokenFor(t, researcher, ['read']);
      await ApiToken.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { tokenHash: hashToken(token) } });
      const res = await call(token);
      expect(res.status).toBe(401);
      expect((await errorOf(res)).message).toMatch(/expired on \d{4}-\d\d-\d\d/);
    });

    it('should answer 401 when the token was revoked', async () => {
      const created = await browser.api('POST', '/api/v1/me/tokens', { name: 'to revoke', scopes: ['read'] });
      const { token, secret } = (await created.json()) as { token: { id: string }; secret: string };
      expect((await call(secret)).status).toBe(200);
      expect((await browser.api('DELETE', `/api/v1/me/tokens/${token.id}`)).status).toBe(204);
      const res = await call(secret);
      expect(res.status).toBe(401);
      expect((await errorOf(res)).message).toMatch(/revoked/);
    });

    it('should answer 401 when the Authorization header is not a bearer token', async () => {
      const res = await fetch(`${t.url}/api/v1/me`, { headers: { authorization: 'Basic abc' } });
      expect(res.status).toBe(401);
      expect((await errorOf(res)).message).toMatch(/Bearer/);
    });

    it('should answer 403 when the token lacks the scope of a write', async () => {
      const token = await tokenFor(t, researcher, ['read']);
      const res = await fetch(`${t.url}/api/v1/me/tokens/${randomUUID()}`, { method: 'DELETE', headers: { authorization: `Bearer ${token}` } });
      expect(res.status).toBe(403);
      expect((await errorOf(res)).message).toMatch(/"write" scope/);
    });
  });

  describe('rate limits', () => {
    it('should answer 429 with Retry-After when sign-in is attempted too often', async () => {
      const limited = await startTestApp({ SIGNIN_RATE_PER_MINUTE: '3', TRUST_PROXY: 'loopback' });
      try {
        // As behind a proxy on this machine: a forwarded address gives this test its own counter.
        const headers = { 'x-forwarded-for': `198.51.100.${Math.floor(Math.random() * 250) + 1}` };
        const statuses: number[] = [];
        for (let i = 0; i < 4; i++) statuses.push((await fetch(`${limited.url}/api/v1/auth/login`, { headers, redirect: 'manual' })).status);
        expect(statuses).toEqual([302, 302, 302, 429]);
        const res = await fetch(`${limited.url}/api/v1/auth/login`, { headers, redirect: 'manual' });
        expect(res.headers.get('retry-after')).toBe('60');
        expect((await errorOf(res)).code).toBe('rate_limited');
        // A browser opening the page gets the sign-in page with the reason instead.
        const page = await fetch(`${limited.url}/api/v1/auth/login`, { headers: { ...headers, accept: 'text/html,application/xhtml+xml' }, redirect: 'manual' });
        expect(page.status).toBe(302);
        expect(page.headers.get('location')).toBe(`${limited.url}/sign-in?error=rate_limited`);
      } finally {
        await limited.close();
      }
    });

    it('should answer 429 when one address keeps presenting wrong API tokens', async () => {
      const limited = await startTestApp({ FAILED_TOKEN_RATE_PER_MINUTE: '3', TRUST_PROXY: 'loopback' });
      try {
        const headers = { 'x-forwarded-for': `203.0.113.${Math.floor(Math.random() * 250) + 1}`, authorization: 'Bearer lcs_guess' };
        const statuses: number[] = [];
        for (let i = 0; i < 4; i++) statuses.push((await fetch(`${limited.url}/api/v1/me`, { headers })).status);
        expect(statuses).toEqual([401, 401, 401, 429]);
      } finally {
        await limited.close();
      }
    });

    it('should not count good tokens against the wrong-token limit', async () => {
      const limited = await startTestApp({ FAILED_TOKEN_RATE_PER_MINUTE: '2', TRUST_PROXY: 'loopback' });
      try {
        const token = await tokenFor(limited, researcher, ['read']);
        const headers = { 'x-forwarded-for': `192.0.2.${Math.floor(Math.random() * 250) + 1}`, authorization: `Bearer ${token}` };
        const statuses: number[] = [];
        for (let i = 0; i < 4; i++) statuses.push((await fetch(`${limited.url}/api/v1/me`, { headers })).status);
        expect(statuses).toEqual([200, 200, 200, 200]);
      } finally {
        await limited.close();
      }
    });

    it('should not refuse many good requests sent at once by one script', async () => {
      const limited = await startTestApp({ FAILED_TOKEN_RATE_PER_MINUTE: '2', TRUST_PROXY: 'loopback' });
      try {
        const token = await tokenFor(limited, researcher, ['read']);
        const headers = { 'x-forwarded-for': `198.51.100.${Math.floor(Math.random() * 250) + 1}`, authorization: `Bearer ${token}` };
        const statuses = await Promise.all(Array.from({ length: 25 }, () => fetch(`${limited.url}/api/v1/me`, { headers }).then((r) => r.status)));
        expect(new Set(statuses)).toEqual(new Set([200]));
      } finally {
        await limited.close();
      }
    });

    it('should answer 429 when one API token makes too many requests', async () => {
      const limited = await startTestApp({ TOKEN_RATE_PER_MINUTE: '2' });
      try {
        const token = await tokenFor(limited, researcher, ['read']);
        const statuses: number[] = [];
        for (let i = 0; i < 3; i++) statuses.push((await fetch(`${limited.url}/api/v1/me`, { headers: { authorization: `Bearer ${token}` } })).status);
        expect(statuses).toEqual([200, 200, 429]);
      } finally {
        await limited.close();
      }
    });
  });

  describe('security headers', () => {
    it('should set a strict content security policy and an httpOnly SameSite=Lax session cookie', async () => {
      const fresh = new BrowserSession(t.url);
      const anonymous = await fresh.fetch(`${t.url}/api/v1/session`);
      // Anonymous visitors get no stored session; starting sign-in makes one.
      expect(anonymous.headers.getSetCookie()).toEqual([]);
      const res = await fresh.fetch(`${t.url}/api/v1/auth/login`);
      const csp = res.headers.get('content-security-policy') ?? '';
      expect(csp).toContain("default-src 'self'");
      expect(csp).toContain("script-src 'self'");
      expect(csp).toContain("frame-ancestors 'none'");
      const cookie = res.headers.getSetCookie().find((c) => c.startsWith('localis.sid='))!;
      expect(cookie).toMatch(/HttpOnly/i);
      expect(cookie).toMatch(/SameSite=Lax/i);
    });
  });
});
