import type { NextFunction, Request, Response } from 'express';
import { errors, TOKEN_SCOPES } from '@localis/shared';
import type { TokensService } from '../tokens/tokens.service';
import { peopleRepository } from '../people/people.repository';
import type { Principal } from './principal';

/**
 * Work out who is calling: an `Authorization: Bearer` API token, else the signed-in session.
 * Roles are read from the database on every request, so a change applies at once.
 */
export function authenticate(tokens: TokensService) {
  return async (req: Request, _res: Response, next: NextFunction) => {
    try {
      const header = req.get('authorization');
      if (header !== undefined) {
        const match = /^Bearer\s+(\S+)\s*$/i.exec(header);
        if (!match) throw errors.tokenInvalid('Send the API token as "Authorization: Bearer <token>".');
        req.principal = await tokens.authenticate(match[1]);
        return next();
      }
      const personId = req.user?.personId;
      if (!personId) {
        req.principal = null;
        return next();
      }
      const person = await peopleRepository.findRecord({ id: personId });
      if (!person || !person.active) {
        // The account was removed or deactivated since sign-in: the session no longer counts.
        req.principal = null;
        if (req.session) delete (req.session as unknown as { passport?: unknown }).passport;
        return next();
      }
      const principal: Principal = {
        personId: person.id,
        name: person.name,
        email: person.email,
        institutionId: person.institutionId,
        roles: person.roles,
        scopes: [...TOKEN_SCOPES],
        via: 'session',
      };
      req.principal = principal;
      next();
    } catch (e) {
      next(e);
    }
  };
}
