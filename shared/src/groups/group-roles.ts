import type { Role } from '../auth/roles';

/** Research groups are for the people who run campaigns; committee, office and billing need none. */
export function worksInGroups(roles: readonly Role[]): boolean {
  return roles.includes('researcher') || roles.includes('pi');
}
