import type { Request, Response } from 'express';
import type { Redis } from 'ioredis';
import { Health, Readiness } from '@localis/shared';
import type { Database } from '../db';
import { access, defineRoutes } from '../http/route-registry';

async function timed(check: () => Promise<unknown>, timeoutMs = 2000) {
  const start = performance.now();
  try {
    await Promise.race([check(), new Promise((_, reject) => setTimeout(() => reject(new Error(`no answer in ${timeoutMs} ms`)), timeoutMs))]);
    return { ok: true, ms: Math.round(performance.now() - start) };
  } catch (e) {
    return { ok: false, ms: Math.round(performance.now() - start), error: (e as Error).message };
  }
}

export function healthRoutes(db: Database, redis: Redis) {
  return defineRoutes([
    {
      method: 'get', path: '/healthz', root: true, tag: 'health', summary: 'The process is up',
      access: access.public, responses: { 200: { description: 'Up', schema: Health } },
      handler: (_req: Request, res: Response) => res.json({ status: 'ok' }),
    },
    {
      method: 'get', path: '/readyz', root: true, tag: 'health', summary: 'PostgreSQL and Redis are reachable',
      access: access.public, responses: { 200: { description: 'Ready', schema: Readiness }, 503: { description: 'Not ready', schema: Readiness } },
      handler: async (_req: Request, res: Response) => {
        const checks = { postgres: await timed(() => db.sequelize.query('SELECT 1')), redis: await timed(() => redis.ping()) };
        const ready = Object.values(checks).every((c) => c.ok);
        res.status(ready ? 200 : 503).json({ status: ready ? 'ready' : 'not-ready', checks });
      },
    },
  ]);
}
