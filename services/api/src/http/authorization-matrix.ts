import { randomUUID } from 'node:crypto';

/**
 * The authorization matrix: every route x every kind of caller -> the status it must get.
 * `authorization-matrix.test.ts` runs it against the real app and fails when a route exists
 * that this table does not list. Later features add their rows here.
 */
export const ACTORS = ['anonymous', 'researcher', 'pi', 'committee', 'admin', 'billing', 'otherGroupPi'] as const;
export type Actor = (typeof ACTORS)[number];

/** The records the rows point at, made fresh for each run. */
export interface Fixtures {
  institutionA: string;
  groupA: string;
  researcherId: string;
  piId: string;
  /** A person the rows change (roles, membership); never an actor. */
  extraId: string;
  tokenIdOf(actor: Actor): Promise<string>;
  addExtraToGroupA(): Promise<void>;
}

export interface MatrixRow {
  method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  /** The route as registered (Express syntax). */
  route: string;
  /** The concrete request path for an actor. */
  path: (f: Fixtures, actor: Actor) => string | Promise<string>;
  body?: (f: Fixtures) => unknown;
  before?: (f: Fixtures) => Promise<void>;
  /** Signs in afresh for this row (sign-out would end the shared session). */
  freshSession?: boolean;
  expect: Record<Actor, number>;
}

const all = (status: number): Record<Actor, number> => Object.fromEntries(ACTORS.map((a) => [a, status])) as Record<Actor, number>;
const signedIn = (status: number) => ({ ...all(status), anonymous: 401 });
const only = (status: number, allowed: Actor[], others = 403) => ({
  ...signedIn(others),
  ...Object.fromEntries(allowed.map((a) => [a, status])),
});

const fixed = (p: string) => () => p;

export const MATRIX: MatrixRow[] = [
  { method: 'GET', route: '/healthz', path: fixed('/healthz'), expect: all(200) },
  { method: 'GET', route: '/readyz', path: fixed('/readyz'), expect: all(200) },
  { method: 'GET', route: '/api/v1/openapi.json', path: fixed('/api/v1/openapi.json'), expect: all(200) },
  { method: 'GET', route: '/api/v1/session', path: fixed('/api/v1/session'), expect: all(200) },
  { method: 'GET', route: '/api/v1/auth/login', path: fixed('/api/v1/auth/login?redirect=/'), expect: all(302) },
  { method: 'GET', route: '/api/v1/auth/callback', path: fixed('/api/v1/auth/callback'), expect: all(302) },
  { method: 'POST', route: '/api/v1/auth/logout', path: fixed('/api/v1/auth/logout'), freshSession: true, expect: signedIn(200) },

  { method: 'GET', route: '/api/v1/me', path: fixed('/api/v1/me'), expect: signedIn(200) },
  { method: 'GET', route: '/api/v1/me/tokens', path: fixed('/api/v1/me/tokens'), expect: signedIn(200) },
  {
    method: 'POST', route: '/api/v1/me/tokens', path: fixed('/api/v1/me/tokens'),
    body: () => ({ name: 'matrix', scopes: ['read'], expiresInDays: 1 }), expect: signedIn(201),
  },
  {
    method: 'DELETE', route: '/api/v1/me/tokens/:id',
    path: async (f, actor) => `/api/v1/me/tokens/${actor === 'anonymous' ? randomUUID() : await f.tokenIdOf(actor)}`,
    expect: signedIn(204),
  },

  { method: 'GET', route: '/api/v1/people', path: fixed('/api/v1/people'), expect: only(200, ['admin']) },
  {
    method: 'POST', route: '/api/v1/people', path: fixed('/api/v1/people'),
    body: () => ({ name: 'Matrix Person', email: `matrix-${randomUUID().slice(0, 8)}@test.example`, roles: [] }), expect: only(201, ['admin']),
  },
  { method: 'GET', route: '/api/v1/people/:id', path: (f) => `/api/v1/people/${f.researcherId}`, expect: only(200, ['admin', 'researcher']) },
  { method: 'PATCH', route: '/api/v1/people/:id', path: (f) => `/api/v1/people/${f.extraId}`, body: () => ({ name: 'Matrix Extra' }), expect: only(200, ['admin']) },
  { method: 'PUT', route: '/api/v1/people/:id/roles/:role', path: (f) => `/api/v1/people/${f.extraId}/roles/billing`, expect: only(200, ['admin']) },
  { method: 'DELETE', route: '/api/v1/people/:id/roles/:role', path: (f) => `/api/v1/people/${f.extraId}/roles/billing`, expect: only(200, ['admin']) },

  { method: 'GET', route: '/api/v1/institutions', path: fixed('/api/v1/institutions'), expect: signedIn(200) },
  { method: 'GET', route: '/api/v1/institutions/:id', path: (f) => `/api/v1/institutions/${f.institutionA}`, expect: signedIn(200) },
  {
    method: 'POST', route: '/api/v1/institutions', path: fixed('/api/v1/institutions'),
    body: () => ({ name: `Matrix Institute ${randomUUID().slice(0, 8)}`, kind: 'partner', country: 'fr', billingEmail: 'billing@matrix.example' }),
    expect: only(201, ['admin']),
  },
  { method: 'PATCH', route: '/api/v1/institutions/:id', path: (f) => `/api/v1/institutions/${f.institutionA}`, body: () => ({ country: 'DE' }), expect: only(200, ['admin']) },

  { method: 'GET', route: '/api/v1/groups', path: fixed('/api/v1/groups'), expect: signedIn(200) },
  { method: 'GET', route: '/api/v1/groups/:id', path: (f) => `/api/v1/groups/${f.groupA}`, expect: only(200, ['admin', 'pi', 'researcher']) },
  {
    method: 'POST', route: '/api/v1/groups', path: fixed('/api/v1/groups'),
    body: (f) => ({ name: `Matrix Group ${randomUUID().slice(0, 8)}`, institutionId: f.institutionA, piPersonId: f.piId }), expect: only(201, ['admin']),
  },
  {
    method: 'POST', route: '/api/v1/groups/:id/members', path: (f) => `/api/v1/groups/${f.groupA}/members`,
    body: (f) => ({ personId: f.extraId }), expect: only(200, ['admin', 'pi']),
  },
  {
    method: 'DELETE', route: '/api/v1/groups/:id/members/:personId', path: (f) => `/api/v1/groups/${f.groupA}/members/${f.extraId}`,
    before: (f) => f.addExtraToGroupA(), expect: only(200, ['admin', 'pi']),
  },

  { method: 'GET', route: '/api/v1/audit', path: fixed('/api/v1/audit'), expect: only(200, ['admin']) },
];
