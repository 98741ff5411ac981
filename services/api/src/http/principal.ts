import type { Request } from 'express';
import type { Role, TokenScope } from '@localis/shared';

/** Who is making a request, as every service sees it. */
export interface Principal {
  personId: string;
  name: string;
  email: string;
  institutionId: string | null;
  roles: Role[];
  /** What this request may do: all scopes for a session, the token's own for a token. */
  scopes: TokenScope[];
  /**
   * How the request arrived. `system` is Localis acting on someone's behalf (the demo
   * scenario, scheduled jobs): the audit log then names no actor, since the person did nothing.
   */
  via: 'session' | 'token' | 'system';
  tokenId?: string;
}

/** Where a request came from, written into the audit log with each change. */
export interface RequestContext {
  principal: Principal | null;
  ip: string | null;
  userAgent: string | null;
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      principal?: Principal | null;
      /** Inputs after validation by the route's zod schemas. */
      valid: { params: any; query: any; body: any };
    }
    interface User {
      personId: string;
      /** Kept for the provider's sign-out (id_token_hint); stays in the server-side session. */
      idToken?: string;
    }
  }
}

export function contextOf(req: Request): RequestContext {
  return {
    principal: req.principal ?? null,
    ip: req.ip ?? null,
    userAgent: req.get('user-agent')?.slice(0, 300) ?? null,
  };
}
