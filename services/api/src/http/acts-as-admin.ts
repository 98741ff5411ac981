import type { Principal } from './principal';

/**
 * Whether a caller may make a change with admin rights: an admin in the browser, or an admin's
 * token that carries the `admin` scope. An admin's token without it changes only what an
 * ordinary member could. (Reading needs only the `read` scope, whatever the role.)
 */
export function actsAsAdmin(p: Principal): boolean {
  return p.roles.includes('admin') && (p.via !== 'token' || p.scopes.includes('admin'));
}
