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
    handler: (_req, res, next, options) => {
      const retry = Math.ceil((options.windowMs ?? 60_000) / 1000);
      res.setHeader('Retry-After', String(retry));
      next(errors.rateLimited(retry));
    },
  });
}

export function createRateLimits(redis: Redis, s: Pick<Settings, 'SIGNIN_RATE_PER_MINUTE' | 'TOKEN_RATE_PER_MINUTE' | 'FAILED_TOKEN_RATE_PER_MINUTE'>) {
  return {
    /** Wrong API tokens, per client address: guessing costs a database lookup each. */
    failedTokens: limiter(redis, 'badtoken', s.FAILED_TOKEN_RATE_PER_MINUTE, (req) => `ip:${ipKeyGenerator(req.ip ?? 'unknown')}`, (req) => req.get('authorization') === undefined, true),
    /** Sign-in pages, per client address. */
    signIn: limiter(redis, 'signin', s.SIGNIN_RATE_PER_MINUTE, (req) => `ip:${ipKeyGenerator(req.ip ?? 'unknown')}`),
    /** Requests made with an API token, per token. */
    token: limiter(redis, 'token', s.TOKEN_RATE_PER_MINUTE, (req) => `token:${req.principal?.tokenId}`, (req) => req.principal?.via !== 'token'),
  };
}
export type RateLimits = ReturnType<typeof createRateLimits>;
