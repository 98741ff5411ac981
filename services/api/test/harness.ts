import { randomUUID } from 'node:crypto';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { Redis } from 'ioredis';
import { pino } from 'pino';
import { DEMO_PASSWORD } from '@localis/seeds/scenario';
import { loadSettings, TOKEN_SCOPES, type Role, type SessionInfo, type Settings, type TokenScope } from '@localis/shared';
import { createApp } from '../src/app';
import { openDatabase, type Database } from '../src/db';
import type { RequestContext } from '../src/http/principal';
import { createServices } from '../src/services';

/**
 * Boots the real app on a random port against the real PostgreSQL and Redis that `npm test`
 * starts (settings come from its environment). Nothing of our own is replaced.
 */
export interface TestApp {
  url: string;
  settings: Settings;
  db: Database;
  redis: Redis;
  services: ReturnType<typeof createServices>;
  routes: ReturnType<typeof createApp>['routes'];
  close(): Promise<void>;
}

export async function startTestApp(overrides: Partial<Record<keyof Settings, string>> = {}): Promise<TestApp> {
  const server: Server = createServer();
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  const port = (server.address() as AddressInfo).port;
  const url = `http://127.0.0.1:${port}`;
  const settings = loadSettings({ ...process.env, PUBLIC_URL: url, APP_PORT: String(port), SIGNIN_RATE_PER_MINUTE: '100000', ...overrides });
  const db = openDatabase(settings, { poolMax: 5 });
  const redis = new Redis({ host: settings.REDIS_HOST, port: settings.REDIS_PORT, maxRetriesPerRequest: 2 });
  const { app, routes, close } = createApp({ settings, db, redis, logger: pino({ level: 'silent' }) });
  server.on('request', app);
  return {
    url,
    settings,
    db,
    redis,
    routes,
    services: createServices(db, settings),
    async close() {
      server.closeAllConnections();
      await new Promise<void>((r) => server.close(() => r()));
      await close();
      await db.close();
      await redis.quit();
    },
  };
}

export const SYSTEM: RequestContext = { principal: null, ip: null, userAgent: 'test-fixture' };

export function uniqueEmail(label: string): string {
  return `${label}-${randomUUID().slice(0, 8)}@test.example`;
}

/** A person made through the services; the identity-provider fake accepts any @test.example address. */
export async function createPerson(t: TestApp, opts: { roles?: Role[]; institutionId?: string | null; label?: string } = {}) {
  return t.services.people.create(SYSTEM, {
    name: `Test ${opts.label ?? 'Person'}`,
    email: uniqueEmail(opts.label ?? 'person'),
    institutionId: opts.institutionId ?? null,
    roles: opts.roles ?? [],
  });
}

export async function createInstitution(t: TestApp, kind: 'member' | 'partner' = 'member') {
  return t.services.institutions.create(SYSTEM, { name: `Test Institute ${randomUUID().slice(0, 8)}`, kind, country: 'DE', billingEmail: null });
}

/** An API token for a person, created the way the profile page does it. */
export async function tokenFor(t: TestApp, person: { id: string; name: string; email: string; institutionId: string | null; roles: Role[] }, scopes: TokenScope[] = [...TOKEN_SCOPES]) {
  const ctx: RequestContext = {
    ...SYSTEM,
    principal: { personId: person.id, name: person.name, email: person.email, institutionId: person.institutionId, roles: person.roles, scopes: [...TOKEN_SCOPES], via: 'session' },
  };
  const allowed = scopes.filter((s) => s !== 'admin' || person.roles.includes('admin'));
  return (await t.services.tokens.create(ctx, { name: 'test', scopes: allowed, expiresInDays: 30 })).secret;
}

/** Call the app as a script does: a bearer API token, JSON in and out. `path` is from the site root. */
export function withToken(t: TestApp, token: string, method: string, path: string, body?: unknown): Promise<Response> {
  return fetch(t.url + path, {
    method,
    headers: { authorization: `Bearer ${token}`, ...(body !== undefined ? { 'content-type': 'application/json' } : {}) },
    body: body !== undefined ? JSON.stringify(body) : undefined,
  });
}

/** A browser-like client: a cookie jar and manual redirects, for the real OIDC sign-in. */
export class BrowserSession {
  private readonly jar = new Map<string, string>();
  csrfToken = '';
  constructor(readonly appUrl: string) {}

  get cookieHeader(): string {
    return [...this.jar].map(([k, v]) => `${k}=${v}`).join('; ');
  }

  async fetch(url: string, init: RequestInit = {}): Promise<Response> {
    const headers = new Headers(init.headers);
    if (this.jar.size) headers.set('cookie', this.cookieHeader);
    const res = await fetch(url, { ...init, headers, redirect: 'manual' });
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(';');
      const eq = pair.indexOf('=');
      const name = pair.slice(0, eq).trim();
      const value = pair.slice(eq + 1).trim();
      if (/expires=Thu, 01 Jan 1970/i.test(c) || value === '') this.jar.delete(name);
      else this.jar.set(name, value);
    }
    return res;
  }

  /** Calls the API with the session cookie and, for writes, the CSRF token. */
  api(method: string, path: string, body?: unknown, extra: Record<string, string> = {}): Promise<Response> {
    const headers: Record<string, string> = { ...extra };
    if (body !== undefined) headers['content-type'] = 'application/json';
    if (method !== 'GET' && this.csrfToken && !('x-csrf-token' in extra)) headers['x-csrf-token'] = this.csrfToken;
    return this.fetch(this.appUrl + path, { method, headers, body: body === undefined ? undefined : JSON.stringify(body) });
  }

  /**
   * Sign in through the identity provider as a person would: follow the redirects, fill in the
   * provider's form, come back through the callback. Returns where the app finally sent us.
   */
  async signIn(email: string, opts: { redirect?: string; password?: string } = {}): Promise<URL> {
    let res = await this.fetch(`${this.appUrl}/api/v1/auth/login?redirect=${encodeURIComponent(opts.redirect ?? '/')}`);
    for (let hop = 0; hop < 15; hop++) {
      if (res.status >= 300 && res.status < 400) {
        const next = new URL(res.headers.get('location')!, res.url || this.appUrl);
        if (next.origin === this.appUrl && !next.pathname.startsWith('/api/')) {
          await this.refreshSession();
          return next;
        }
        res = await this.fetch(next.href);
        continue;
      }
      const html = await res.text();
      const action = /<form method="post" action="([^"]+)"/.exec(html)?.[1];
      if (res.status === 200 && action) {
        const formUrl = new URL(action, res.url);
        res = await this.fetch(formUrl.href, {
          method: 'POST',
          headers: { 'content-type': 'application/x-www-form-urlencoded' },
          body: new URLSearchParams({ email, password: opts.password ?? DEMO_PASSWORD }).toString(),
        });
        if (res.status === 401) throw new Error(`the identity provider refused ${email}`);
        continue;
      }
      throw new Error(`sign-in stopped at ${res.url} with HTTP ${res.status}: ${html.slice(0, 200)}`);
    }
    throw new Error('sign-in did not finish within 15 redirects');
  }

  async refreshSession() {
    const res = await this.fetch(`${this.appUrl}/api/v1/session`);
    const body = (await res.json()) as SessionInfo;
    this.csrfToken = body.csrfToken;
    return body;
  }
}
