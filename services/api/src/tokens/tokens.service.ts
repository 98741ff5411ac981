import { errors, MAX_TOKEN_DAYS, type ApiTokenInput, type Role } from '@localis/shared';
import type { Database } from '../db';
import type { Principal, RequestContext } from '../http/principal';
import { scopesAllowedFor } from '../http/authorize';
import { auditService } from '../audit/audit.service';
import { peopleRepository } from '../people/people.repository';
import { hashToken, newTokenSecret } from './token-secret';
import { tokensRepository } from './tokens.repository';

const DAY_MS = 86_400_000;
/** Writing last-used on every request would turn reads into writes; a minute is precise enough. */
const TOUCH_INTERVAL_MS = 60_000;

export function createTokensService(db: Database) {
  return {
    list: (ctx: RequestContext) => tokensRepository.listFor(ctx.principal!.personId),

    create(ctx: RequestContext, input: ApiTokenInput) {
      const p = ctx.principal!;
      if (p.via === 'token') {
        throw errors.forbidden('API tokens cannot create other tokens. Create one on your profile page.');
      }
      const allowed = scopesAllowedFor(p.roles);
      const refused = input.scopes.filter((s) => !allowed.includes(s));
      if (refused.length) {
        throw errors.invalid(`Your roles do not allow the scope ${refused.join(', ')}.`, [{ path: ['scopes'], message: `not allowed for your roles: ${refused.join(', ')}` }]);
      }
      const days = Math.min(input.expiresInDays, MAX_TOKEN_DAYS);
      const { secret, prefix, hash } = newTokenSecret();
      return db.transaction(async (tx) => {
        const token = await tokensRepository.create(
          { personId: p.personId, name: input.name, tokenHash: hash, prefix, scopes: [...new Set(input.scopes)], expiresAt: new Date(Date.now() + days * DAY_MS) },
          tx,
        );
        await auditService.record(ctx, 'token.created', { type: 'api-token', id: token.id }, { tokenName: input.name, scopes: token.scopes, expiresAt: token.expiresAt }, tx);
        return { token, secret };
      });
    },

    revoke(ctx: RequestContext, id: string) {
      return db.transaction(async (tx) => {
        const token = await tokensRepository.find(id, tx);
        if (!token) throw errors.notFound('The API token');
        if (token.personId !== ctx.principal!.personId) throw errors.forbidden('That API token belongs to someone else.');
        if (!token.revokedAt) {
          await tokensRepository.revoke(id, tx);
          await auditService.record(ctx, 'token.revoked', { type: 'api-token', id }, { tokenName: token.name }, tx);
        }
      });
    },

    /** Resolve a bearer secret into a principal, or say exactly why it cannot be used. */
    async authenticate(secret: string): Promise<Principal> {
      const record = await tokensRepository.findByHash(hashToken(secret));
      if (!record) throw errors.tokenInvalid('This API token is not known. Check that it was copied whole, or create a new one on your profile page.');
      if (record.revokedAt) throw errors.tokenInvalid(`This API token was revoked on ${record.revokedAt.toISOString()}. Create a new one on your profile page.`);
      if (record.expiresAt.getTime() <= Date.now()) throw errors.tokenInvalid(`This API token expired on ${record.expiresAt.toISOString()}. Create a new one on your profile page.`);
      const person = await peopleRepository.findRecord({ id: record.personId });
      if (!person || !person.active) throw errors.tokenInvalid('The account of this API token is deactivated. Ask the consortium office.');
      if (!record.lastUsedAt || Date.now() - record.lastUsedAt.getTime() > TOUCH_INTERVAL_MS) await tokensRepository.touch(record.id);
      const allowed = scopesAllowedFor(person.roles as Role[]);
      return {
        personId: person.id,
        name: person.name,
        email: person.email,
        institutionId: person.institutionId,
        roles: person.roles,
        scopes: record.scopes.filter((s) => allowed.includes(s)),
        via: 'token',
        tokenId: record.id,
      };
    },
  };
}
export type TokensService = ReturnType<typeof createTokensService>;
