import { Writable } from 'node:stream';
import { createServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import { Redis } from 'ioredis';
import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadSettings } from '@localis/shared';
import { createApp } from '../app';
import { openDatabase } from '../db';
import { createPerson, startTestApp, tokenFor, type TestApp } from '../../test/harness';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp();
});
afterAll(async () => t.close());

describe('health', () => {
  describe('readiness', () => {
    it('should report PostgreSQL and Redis ready when both answer', async () => {
      const res = await fetch(`${t.url}/readyz`);
      expect(res.status).toBe(200);
      expect(await res.json()).toMatchObject({ status: 'ready', checks: { postgres: { ok: true }, redis: { ok: true } } });
    });

    it('should answer 503 naming the failing part when Redis is unreachable', async () => {
      const settings = loadSettings({ ...process.env, REDIS_PORT: '9' });
      const db = openDatabase(settings, { poolMax: 1 });
      const redis = new Redis({ host: '127.0.0.1', port: 9, maxRetriesPerRequest: 0, retryStrategy: () => null, lazyConnect: true });
      redis.on('error', () => undefined);
      const { app, close } = createApp({ settings, db, redis, logger: pino({ level: 'silent' }) });
      const server = createServer(app);
      await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
      try {
        const res = await fetch(`http://127.0.0.1:${(server.address() as AddressInfo).port}/readyz`);
        expect(res.status).toBe(503);
        const body = (await res.json()) as { checks: { redis: { ok: boolean; error: string }; postgres: { ok: boolean } } };
        expect(body.checks.postgres.ok).toBe(true);
        expect(body.checks.redis.ok).toBe(false);
      } finally {
        server.close();
        await close();
        await db.close();
        redis.disconnect();
      }
    });
  });

  describe('request logs', () => {
    it('should keep tokens, cookies and CSRF tokens out of the logs', async () => {
      const lines: string[] = [];
      const sink = new Writable({ write: (chunk, _enc, cb) => (lines.push(chunk.toString()), cb()) });
      const settings = loadSettings({ ...process.env });
      const db = openDatabase(settings, { poolMax: 2 });
      const redis = new Redis({ host: settings.REDIS_HOST, port: settings.REDIS_PORT });
      const { app, close } = createApp({ settings, db, redis, logger: pino({ level: 'debug' }, sink) });
      const server = createServer(app);
      await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
      try {
        const person = await createPerson(t, { roles: ['researcher'], label: 'logs' });
        const secret = await tokenFor(t, person, ['read']);
        const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
        await fetch(`${url}/api/v1/me`, { headers: { authorization: `Bearer ${secret}`, cookie: 'localis.sid=s%3Asecret-session-id', 'x-csrf-token': 'secret-csrf' } });
        const log = lines.join('');
        expect(log).toContain('/api/v1/me');
        expect(log).not.toContain(secret);
        expect(log).not.toContain('secret-session-id');
        expect(log).not.toContain('secret-csrf');
      } finally {
        server.close();
        await close();
        await db.close();
        await redis.quit();
      }
    });
  });
});
