import { SYSTEM_CONTEXT } from '@localis/api/services';
import { TOKEN_SCOPES } from '@localis/shared';
import { PEOPLE, type ScenarioPerson } from './scenario';

/** How the seed shows up in the audit log: as the system, with its own user agent. */
export const SEED_CONTEXT = { ...SYSTEM_CONTEXT, userAgent: 'localis-demo-scenario' };

/** A demo person by id; the scenario's own data names them, so a miss is a mistake in it. */
export function scenarioPerson(id: string): ScenarioPerson {
  const p = PEOPLE.find((x) => x.id === id);
  if (!p) throw new Error(`the demo scenario names person ${id}, who is not in PEOPLE`);
  return p;
}

/** A demo person acting in their own name, as the system (the audit log names no actor). */
export function personContext(p: ScenarioPerson) {
  return { ...SEED_CONTEXT, principal: { personId: p.id, name: p.name, email: p.email, institutionId: p.institutionId, roles: p.roles, scopes: [...TOKEN_SCOPES], via: 'system' as const } };
}

/** Where a rule needs a person (group membership), the seed acts with the office's rights, as the system. */
export function adminContext() {
  return personContext(PEOPLE.find((p) => p.roles.includes('admin'))!);
}
