import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OUTSIDER, PEOPLE } from '@localis/seeds/scenario';
import { BrowserSession, createPerson, startTestApp, SYSTEM, type TestApp } from '../../test/harness';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp();
});
afterAll(async () => t.close());

describe('sign-in', () => {
  describe('OIDC authorization code flow', () => {
    it('should send PKCE, state and nonce when starting sign-in', async () => {
      const browser = new BrowserSession(t.url);
      const res = await browser.fetch(`${t.url}/api/v1/auth/login?redirect=/profile`);
      expect(res.status).toBe(302);
      const to = new URL(res.headers.get('location')!);
      expect(to.origin).toBe(t.settings.OIDC_ISSUER);
      expect(to.searchParams.get('code_challenge_method')).toBe('S256');
      expect(to.searchParams.get('code_challenge')).toMatch(/^[\w-]{43}$/);
      expect(to.searchParams.get('state')).toBeTruthy();
      expect(to.searchParams.get('nonce')).toBeTruthy();
      expect(to.searchParams.get('redirect_uri')).toBe(`${t.url}/api/v1/auth/callback`);
    });

    it('should link a known e-mail at first sign-in and return to the requested page', async () => {
      const person = await createPerson(t, { roles: ['researcher'], label: 'first' });
      expect(person.linked).toBe(false);
      const browser = new BrowserSession(t.url);
      const landed = await browser.signIn(person.email, { redirect: '/profile' });
      expect(landed.pathname).toBe('/profile');
      const session = await browser.refreshSession();
      expect(session).toMatchObject({ signedIn: true, person: { id: person.id, roles: ['researcher'] } });
      const after = await t.services.people.list({ q: person.email, limit: 1, offset: 0, sort: 'name', format: 'json' });
      expect(after.items[0]).toMatchObject({ linked: true });
      expect(after.items[0].lastSignInAt).not.toBeNull();
    });

    it('should give admins alone the link to the mail inbox of the demo and test stacks', async () => {
      // npm test sets MAIL_INBOX_URL to the mail fake's inbox, as npm start does.
      expect(t.settings.MAIL_INBOX_URL).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/index\.html$/);
      const admin = await createPerson(t, { roles: ['admin'], label: 'inbox-admin' });
      const researcher = await createPerson(t, { roles: ['researcher'], label: 'inbox-researcher' });
      const asAdmin = new BrowserSession(t.url);
      await asAdmin.signIn(admin.email);
      const asResearcher = new BrowserSession(t.url);
      await asResearcher.signIn(researcher.email);
      expect((await asAdmin.refreshSession()).mailInboxUrl).toBe(t.settings.MAIL_INBOX_URL);
      expect((await asResearcher.refreshSession()).mailInboxUrl).toBeNull();
    });

    it('should rotate the session id at sign-in when a session existed before', async () => {
      const person = await createPerson(t, { roles: ['researcher'], label: 'rotate' });
      const browser = new BrowserSession(t.url);
      // Starting sign-in makes a session (it holds the PKCE verifier, state and nonce).
      await browser.fetch(`${t.url}/api/v1/auth/login`);
      const before = browser.cookieHeader.match(/localis\.sid=([^;]+)/)?.[1];
      expect(before).toBeTruthy();
      await browser.signIn(person.email);
      const after = browser.cookieHeader.match(/localis\.sid=([^;]+)/)?.[1];
      expect(after).toBeTruthy();
      expect(after).not.toBe(before);
    });

    it('should show the not-a-member page when the provider knows the person but Localis does not', async () => {
      const browser = new BrowserSession(t.url);
      const landed = await browser.signIn(OUTSIDER.email);
      expect(landed.pathname).toBe('/not-a-member');
      expect(landed.searchParams.get('email')).toBe(OUTSIDER.email);
      expect((await browser.refreshSession()).signedIn).toBe(false);
    });

    it('should not link an account when the provider has not verified the e-mail', async () => {
      const person = await t.services.people.create(SYSTEM, { name: 'Unverified', email: `unverified-${Date.now()}@test.example`, institutionId: null, roles: ['researcher'] });
      const landed = await new BrowserSession(t.url).signIn(person.email);
      expect(landed.pathname).toBe('/not-a-member');
      const after = await t.services.people.get({ ...SYSTEM, principal: { personId: person.id, name: '', email: '', institutionId: null, roles: [], scopes: [], via: 'session' } }, person.id);
      expect(after.linked).toBe(false);
    });

    it('should read the e-mail from userinfo when the ID token does not carry it', async () => {
      const person = await t.services.people.create(SYSTEM, { name: 'Userinfo Only', email: `userinfo-only-${Date.now()}@test.example`, institutionId: null, roles: ['researcher'] });
      const browser = new BrowserSession(t.url);
      const landed = await browser.signIn(person.email);
      expect(landed.pathname).toBe('/');
      expect(await browser.refreshSession()).toMatchObject({ signedIn: true, person: { id: person.id } });
    });

    it('should refuse a deactivated account when it signs in', async () => {
      const person = await createPerson(t, { roles: ['researcher'], label: 'inactive' });
      await t.services.people.update({ principal: null, ip: null, userAgent: null }, person.id, { active: false });
      const landed = await new BrowserSession(t.url).signIn(person.email);
      expect(landed.pathname).toBe('/sign-in');
      expect(landed.searchParams.get('error')).toBe('account_inactive');
    });

    it('should refuse a callback that carries no valid state when it is forged', async () => {
      const browser = new BrowserSession(t.url);
      const res = await browser.fetch(`${t.url}/api/v1/auth/callback?code=forged&state=forged`);
      expect(res.status).toBe(302);
      expect(res.headers.get('location')).toContain('/sign-in?error=signin_failed');
    });

    it('should never send the browser to another site when the redirect is foreign', async () => {
      const person = PEOPLE.find((p) => p.roles.includes('researcher'))!;
      for (const foreign of ['//evil.example/x', 'https://evil.example/', '/\\evil.example']) {
        const landed = await new BrowserSession(t.url).signIn(person.email, { redirect: foreign });
        expect(landed.origin, foreign).toBe(t.url);
        expect(landed.pathname, foreign).toBe('/');
      }
    });
  });

  describe('sign-out', () => {
    it('should end the session and point to the provider sign-out when signing out', async () => {
      const person = await createPerson(t, { roles: ['researcher'], label: 'out' });
      const browser = new BrowserSession(t.url);
      await browser.signIn(person.email);
      const res = await browser.api('POST', '/api/v1/auth/logout');
      expect(res.status).toBe(200);
      const body = (await res.json()) as { endSessionUrl: string };
      expect(new URL(body.endSessionUrl).origin).toBe(t.settings.OIDC_ISSUER);
      expect(new URL(body.endSessionUrl).searchParams.get('post_logout_redirect_uri')).toBe(`${t.url}/signed-out`);
      expect((await browser.api('GET', '/api/v1/me')).status).toBe(401);
    });
  });
});
