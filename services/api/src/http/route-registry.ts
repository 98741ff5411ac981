import type { NextFunction, Request, Response } from 'express';
import type { z } from 'zod';
import type { Role, TokenScope } from '@localis/shared';

export type HttpMethod = 'get' | 'post' | 'put' | 'patch' | 'delete';

/**
 * Who may call a route. `public` routes need nobody; the others need a signed-in, active person,
 * holding one of `roles` when given, and for token requests the token's `scope`.
 * Ownership ("your own group") is decided by the service, which knows the records.
 */
export type Access =
  | { kind: 'public' }
  | { kind: 'signed-in'; scope: TokenScope; roles?: Role[] };

export interface ResponseSpec {
  description: string;
  schema?: z.ZodType;
  contentType?: string;
}

export interface RouteSpec {
  method: HttpMethod;
  /** Express path relative to the mount point (`/api/v1` unless `root`). */
  path: string;
  /** Mounted at the site root instead of under /api/v1 (health checks). */
  root?: boolean;
  summary: string;
  tag: string;
  access: Access;
  request?: { params?: z.ZodObject; query?: z.ZodObject; body?: z.ZodType };
  responses: Record<number, ResponseSpec>;
  /** Sign-in and sign-out pages that redirect; their rate limit is stricter. */
  signIn?: boolean;
  /** `false` for answers that must never be stored or replayed (a new token's secret). */
  idempotency?: false;
  /** `false` for a server-to-server route that proves itself another way (a signed webhook): no session, no CSRF token. */
  csrf?: false;
  handler: (req: Request, res: Response, next: NextFunction) => Promise<unknown> | unknown;
}

/** Declare a feature's routes; `mountRoutes` wires validation, authorization and the handler. */
export function defineRoutes(routes: RouteSpec[]): RouteSpec[] {
  return routes;
}

export const API_PREFIX = '/api/v1';

export function fullPath(route: RouteSpec): string {
  return route.root ? route.path : `${API_PREFIX}${route.path}`;
}

/** Shorthands for the usual access rules. */
export const access = {
  public: { kind: 'public' } as Access,
  read: (roles?: Role[]): Access => ({ kind: 'signed-in', scope: 'read', roles }),
  write: (roles?: Role[]): Access => ({ kind: 'signed-in', scope: 'write', roles }),
  admin: (scope: TokenScope = 'admin'): Access => ({ kind: 'signed-in', scope, roles: ['admin'] }),
};
