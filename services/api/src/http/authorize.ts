import type { NextFunction, Request, Response } from 'express';
import { errors, TOKEN_SCOPES, type Role, type TokenScope } from '@localis/shared';
import type { Access } from './route-registry';
import type { Principal } from './principal';

/** The scopes a person's roles allow; a token never gets more than its owner could do. */
export function scopesAllowedFor(roles: Role[]): TokenScope[] {
  return TOKEN_SCOPES.filter((s) => s !== 'admin' || roles.includes('admin'));
}

/**
 * The one authorization decision for every route. Returns null when allowed, or the error.
 * Kept pure so the authorization matrix can be reasoned about and tested directly.
 */
export function decideAccess(rule: Access, principal: Principal | null | undefined) {
  if (rule.kind === 'public') return null;
  if (!principal) return errors.notSignedIn();
  if (rule.roles && !rule.roles.some((r) => principal.roles.includes(r))) {
    const names = rule.roles.join(' or ');
    return errors.forbidden(`This needs the ${names} role; your roles are: ${principal.roles.join(', ') || 'none'}.`);
  }
  if (principal.via === 'token' && !principal.scopes.includes(rule.scope)) {
    return errors.forbidden(`This API token lacks the "${rule.scope}" scope. Create a token with that scope on your profile page.`);
  }
  return null;
}

export function authorize(rule: Access) {
  return (req: Request, _res: Response, next: NextFunction) => next(decideAccess(rule, req.principal) ?? undefined);
}
