import type { NextFunction, Request, Response } from 'express';
import { csrfSync } from 'csrf-sync';
import { errors } from '@localis/shared';

/**
 * Synchroniser-token CSRF protection (csrf-sync): the token lives in the server-side session and
 * the portal sends it back in `x-csrf-token`. Requests carrying an API token are exempt: they
 * cannot be forged by a browser, which never adds that header on its own.
 */
const csrf = csrfSync({ getTokenFromRequest: (req) => req.get('x-csrf-token') });

export const generateCsrfToken = (req: Request) => csrf.generateToken(req);

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

export function csrfProtection(req: Request, _res: Response, next: NextFunction) {
  if (SAFE.has(req.method) || req.principal?.via === 'token') return next();
  if (!csrf.isRequestValid(req)) return next(errors.csrfInvalid());
  next();
}
