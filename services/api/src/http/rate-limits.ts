import { ipKeyGenerator, rateLimit, type RateLimitRequestHandler } from 'express-rate-limit';
import { RedisStore, type RedisReply } from 'rate-limit-redis';
import type { Redis } from 'ioredis';
import type { Request } from 'express';
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

export function createRateLimits(redis: Redis, s: Pick<Settings, 'SIGNIN_RATE_PER_MINUTE' | 'TOKEN_RATE_PER_MINUTE' | 'FAILED_TOKEN_RATE_PER_MINUTE' | 'PUBLIC_URL'>) {
  return {
    /** Wrong API tokens, per client address: guessing costs a database lookup each. */
    failedTokens: limiter(redis, 'badtoken', s.FAILED_TOKEN_RATE_PER_MINUTE, (req) => `ip:${ipKeyGenerator(req.ip ?? 'unknown')}`, (req) => req.get('authorization') === undefined, true),
    /** Sign-in pages, per client address. */
    signIn: limiter(redis, 'signin', s.SIGNIN_RATE_PER_MINUTE, (req) => `ip:${ipKeyGenerator(req.ip ?? 'unknown')}`, undefined, false, new URL('/sign-in?error=rate_limited', s.PUBLIC_URL).href),
    /** Requests made with an API token, per token. */
    token: limiter(redis, 'token', s.TOKEN_RATE_PER_MINUTE, (req) => `token:${req.principal?.tokenId}`, (req) => req.principal?.via !== 'token'),
  };
}
export type RateLimits = ReturnType<typeof createRateLimits>;
