import { ipKeyGenerator, rateLimit, type RateLimitRequestHandler } from 'express-rate-limit';
import { RedisStore, type RedisReply } from 'rate-limit-redis';
import type { Redis } from 'ioredis';
import type { NextFunction, Request, Response } from 'express';
import { errors, type Settings } from '@localis/shared';

/** Counters live in Redis so several api instances share one limit. */
function store(redis: Redis, prefix: string) {
  return new RedisStore({
    prefix: `localis:rl:${prefix}:`,
    sendCommand: (command: string, ...args: string[]) => redis.call(command, ...args) as Promise<RedisReply>,
  });
}

function limiter(
  redis: Redis,
  prefix: string,
  perMinute: number,
  key: (req: Request) => string,
  skip?: (req: Request) => boolean,
  countOnlyFailures = false,
  pageForBrowsers?: string,
): RateLimitRequestHandler {
  return rateLimit({
    skipSuccessfulRequests: countOnlyFailures,
    requestWasSuccessful: (_req, res) => res.statusCode !== 401,
    windowMs: 60_000,
    limit: perMinute,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    store: store(redis, prefix),
    keyGenerator: key,
    skip,
    handler: (req, res, next, options) => {
      const retry = Math.ceil((options.windowMs ?? 60_000) / 1000);
      res.setHeader('Retry-After', String(retry));
      // Sign-in is a page a person opens: show them our page with the reason, not raw JSON.
      if (pageForBrowsers && req.accepts(['json', 'html']) === 'html') return res.redirect(pageForBrowsers);
      next(errors.rateLimited(retry));
    },
  });
}

/**
 * Wrong API tokens per client address. Written here rather than with express-rate-limit: its
 * count-only-failures mode counts every request on arrival and takes the successes back when they
 * finish, so a script sending 25 good requests at once was refused as if it were guessing. This
 * guard only reads the counter on arrival and adds to it when a token was really refused (401).
 */
function failedTokenGuard(redis: Redis, perMinute: number) {
  const keyOf = (req: Request) => `localis:rl:badtoken:ip:${ipKeyGenerator(req.ip ?? 'unknown')}`;
  return async (req: Request, res: Response, next: NextFunction) => {
    if (req.get('authorization') === undefined) return next();
    const key = keyOf(req);
    const count = () => redis.multi().incr(key).pexpire(key, 60_000, 'NX').exec();
    let paidUpFront = false;
    try {
      const [failures, ttl] = await Promise.all([redis.get(key), redis.pttl(key)]);
      if (Number(failures ?? 0) >= perMinute) {
        const retry = Math.max(1, Math.ceil((ttl > 0 ? ttl : 60_000) / 1000));
        res.setHeader('Retry-After', String(retry));
        return next(errors.rateLimited(retry));
      }
      // An address that has failed already pays on arrival, so a parallel burst of guesses cannot
      // all slip past the check; a request that turns out good gives its count back.
      if (Number(failures ?? 0) > 0) {
        await count();
        paidUpFront = true;
      }
    } catch (e) {
      return next(e);
    }
    res.on('finish', () => {
      if (res.statusCode === 401 && !paidUpFront) void count().catch(() => undefined);
      else if (res.statusCode !== 401 && paidUpFront) void redis.decr(key).catch(() => undefined);
    });
    next();
  };
}

export function createRateLimits(redis: Redis, s: Pick<Settings, 'SIGNIN_RATE_PER_MINUTE' | 'TOKEN_RATE_PER_MINUTE' | 'FAILED_TOKEN_RATE_PER_MINUTE' | 'PUBLIC_URL'>) {
  return {
    /** Wrong API tokens, per client address: guessing costs a database lookup each. */
    failedTokens: failedTokenGuard(redis, s.FAILED_TOKEN_RATE_PER_MINUTE),
    /** Sign-in pages, per client address. */
    signIn: limiter(redis, 'signin', s.SIGNIN_RATE_PER_MINUTE, (req) => `ip:${ipKeyGenerator(req.ip ?? 'unknown')}`, undefined, false, new URL('/sign-in?error=rate_limited', s.PUBLIC_URL).href),
    /** Requests made with an API token, per token. */
    token: limiter(redis, 'token', s.TOKEN_RATE_PER_MINUTE, (req) => `token:${req.principal?.tokenId}`, (req) => req.principal?.via !== 'token'),
  };
}
export type RateLimits = ReturnType<typeof createRateLimits>;
