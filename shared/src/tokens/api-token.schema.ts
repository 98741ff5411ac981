import { z } from 'zod';
import { TokenScope } from '../auth/roles';

/** Prefix of every personal API token, so a leaked one is easy to recognise and scan for. */
export const API_TOKEN_PREFIX = 'lcs_';
export const MAX_TOKEN_DAYS = 366;

export const ApiToken = z
  .object({
    id: z.uuid(),
    name: z.string(),
    prefix: z.string().describe('the first characters of the token, to tell tokens apart'),
    scopes: z.array(TokenScope),
    expiresAt: z.iso.datetime(),
    lastUsedAt: z.iso.datetime().nullable(),
    revokedAt: z.iso.datetime().nullable(),
    createdAt: z.iso.datetime(),
  })
  .meta({ id: 'ApiToken' });
export type ApiToken = z.infer<typeof ApiToken>;

export const ApiTokenInput = z
  .object({
    name: z.string().trim().min(1, 'give the token a name, such as the machine it is for').max(100),
    scopes: z.array(TokenScope).min(1, 'choose at least one scope'),
    expiresInDays: z.coerce
      .number()
      .int('days must be a whole number')
      .min(1, 'a token lives at least 1 day')
      .max(MAX_TOKEN_DAYS, `a token lives at most ${MAX_TOKEN_DAYS} days`)
      .default(90),
  })
  .meta({ id: 'ApiTokenInput' });
export type ApiTokenInput = z.infer<typeof ApiTokenInput>;

/** Returned once, at creation: the only time the secret is ever shown. */
export const CreatedApiToken = z
  .object({ token: ApiToken, secret: z.string() })
  .meta({ id: 'CreatedApiToken' });
export type CreatedApiToken = z.infer<typeof CreatedApiToken>;

export const ApiTokenList = z.object({ items: z.array(ApiToken) }).meta({ id: 'ApiTokenList' });
