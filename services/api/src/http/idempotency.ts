import { createHash } from 'node:crypto';
import type { NextFunction, Request, Response } from 'express';
import { Op } from 'sequelize';
import { errors } from '@localis/shared';
import { IdempotencyKey } from '../db/models';

/** How long a key is remembered: long enough for any client retry loop. */
export const IDEMPOTENCY_TTL_HOURS = 24;
const WAIT_FOR_FIRST_MS = 30_000;
const KEY_PATTERN = /^[\x21-\x7e]{1,200}$/;

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
/** A first request that has not answered after this long died with its process: its key is spent. */
const ABANDONED_AFTER_MS = 10 * 60_000;
let lastPurge = 0;

/**
 * `Idempotency-Key` on writes: the first request with a key runs and its answer is stored; the
 * same key with the same method, path and body gets that answer again (marked with
 * `Idempotent-Replayed: true`), even while the first is still running (it waits for it); the
 * same key with a different request gets 409. Answers of 500 and above are not stored, so a
 * retry after a failure runs again. A client that gives up and retries while the first request
 * is still working gets the first answer, never a second run. Keys belong to the caller.
 * Routes whose answer is a secret shown once (new API tokens) opt out with `idempotency: false`.
 */
export async function idempotency(req: Request, res: Response, next: NextFunction) {
  const key = req.get('idempotency-key');
  if (key === undefined || req.method === 'GET' || !req.principal) return next();
  if (!KEY_PATTERN.test(key)) {
    return next(errors.invalid('The Idempotency-Key header must be 1–200 visible ASCII characters, e.g. a UUID.', [{ path: ['headers', 'idempotency-key'], message: 'use 1–200 visible ASCII characters' }]));
  }
  const owner = `person:${req.principal.personId}`;
  const requestHash = createHash('sha256').update(`${req.method} ${req.originalUrl}\n${JSON.stringify(req.body ?? null)}`).digest('hex');
  try {
    if (Date.now() - lastPurge > 3600_000) {
      lastPurge = Date.now();
      await IdempotencyKey.destroy({ where: { createdAt: { [Op.lt]: new Date(Date.now() - IDEMPOTENCY_TTL_HOURS * 3600_000) } } });
    }
    for (let attempt = 0; attempt < 2; attempt++) {
      const [row, created] = await IdempotencyKey.findOrCreate({ where: { owner, key }, defaults: { owner, key, requestHash, status: null, response: null } });
      if (created) return runAndStore(owner, key, res, next);
      if (row.requestHash !== requestHash) {
        return next(errors.conflict('This Idempotency-Key was used for a different request. Use a new key for a new request; reuse a key only to retry the same one.'));
      }
      const deadline = Date.now() + WAIT_FOR_FIRST_MS;
      let first: IdempotencyKey | null = row;
      for (let pause = 20; first && first.status === null && Date.now() < deadline; pause = Math.min(pause * 2, 500)) {
        if (Date.now() - first.createdAt.getTime() > ABANDONED_AFTER_MS) {
          return next(errors.conflict(`The request first sent with this Idempotency-Key at ${first.createdAt.toISOString()} never finished; check whether it took effect, then use a new key.`));
        }
        await sleep(pause);
        first = await IdempotencyKey.findOne({ where: { owner, key } });
      }
      if (!first) continue; // The first request failed on our side (5xx) and let go of the key: run this one.
      if (first.status === null) return next(errors.conflict('A request with this Idempotency-Key is still running; try again in a moment.'));
      res.set('Idempotent-Replayed', 'true');
      return first.response === null ? res.status(first.status).end() : res.status(first.status).type('application/json').send(first.response);
    }
    return next(errors.conflict('A request with this Idempotency-Key is still running; try again in a moment.'));
  } catch (e) {
    return next(e);
  }
}

/**
 * Store the answer when the handler gives it, whether or not the client is still there: a client
 * that timed out will retry with the same key and must get this answer, not a second run.
 */
function runAndStore(owner: string, key: string, res: Response, next: NextFunction) {
  let body: unknown = null;
  const json = res.json.bind(res);
  res.json = (value: unknown) => {
    body = value;
    return json(value);
  };
  const end = res.end.bind(res) as (...args: unknown[]) => Response;
  let settled = false;
  res.end = ((...args: unknown[]) => {
    if (!settled) {
      settled = true;
      const settle = res.statusCode >= 500
        ? IdempotencyKey.destroy({ where: { owner, key } })
        : IdempotencyKey.update({ status: res.statusCode, response: body === null ? null : JSON.stringify(body) }, { where: { owner, key } });
      settle.catch(() => undefined);
    }
    return end(...args);
  }) as Response['end'];
  next();
}
