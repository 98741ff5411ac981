import { UniqueConstraintError } from 'sequelize';
import { errors, ROLE_LABELS, type PersonInput, type PersonListQuery, type PersonPatch, type Role } from '@localis/shared';
import type { Database } from '../db';
import type { RequestContext } from '../http/principal';
import { auditService } from '../audit/audit.service';
import { enqueueMail } from '../outbox/mail-outbox';
import { institutionsRepository } from '../institutions/institutions.repository';
import { peopleRepository } from './people.repository';

export function createPeopleService(db: Database, publicUrl: string) {
  async function requireInstitution(id: string | null | undefined, tx: Parameters<typeof institutionsRepository.find>[1]) {
    if (id && !(await institutionsRepository.find(id, tx))) {
      throw errors.invalid('That institution does not exist.', [{ path: ['institutionId'], message: 'choose an existing institution' }]);
    }
  }

  /**
   * The consortium must always keep one active admin, or nobody could grant roles again.
   * Callers take `lockAdminRights` first, before any row lock, so two admins removing each
   * other are serialised (and cannot deadlock).
   */
  async function keepAnAdmin(personId: string, tx: Parameters<typeof peopleRepository.countWithRole>[1]) {
    const person = await peopleRepository.findRecord({ id: personId }, tx);
    if (person?.active && person.roles.includes('admin') && (await peopleRepository.countWithRole('admin', tx)) <= 1) {
      throw errors.conflict('This is the last active admin. Grant the admin role to someone else first.');
    }
  }

  function accessMail(to: string, name: string, change: string, dedupeKey: string) {
    return {
      to: [to],
      subject: 'Your Localis access changed',
      text: `Hello ${name},\n\n${change}\n\nSign in at ${publicUrl} to see what you can do now.\n\nThe consortium office`,
      dedupeKey,
    };
  }

  return {
    list: (q: PersonListQuery) => peopleRepository.list(q),

    /** Admins see anyone; others only themselves. */
    async get(ctx: RequestContext, id: string) {
      const p = ctx.principal!;
      if (p.personId !== id && !p.roles.includes('admin')) throw errors.forbidden('You can only see your own record.');
      const found = await peopleRepository.findDto(id);
      if (!found) throw errors.notFound('The person');
      return found;
    },

    /** `fixedId` is for the demo scenario, whose ids never change. */
    create(ctx: RequestContext, input: PersonInput, fixedId?: string) {
      return db.transaction(async (tx) => {
        await requireInstitution(input.institutionId, tx);
        let id: string;
        try {
          id = await peopleRepository.create({ id: fixedId, name: input.name, email: input.email, institutionId: input.institutionId }, tx);
        } catch (e) {
          if (e instanceof UniqueConstraintError) throw errors.conflict(`Someone with the e-mail ${input.email} is already in Localis.`);
          throw e;
        }
        for (const role of new Set(input.roles)) await peopleRepository.grantRole(id, role, ctx.principal?.personId ?? null, tx);
        await auditService.record(ctx, 'person.created', { type: 'person', id }, { email: input.email, name: input.name, roles: input.roles }, tx);
        return (await peopleRepository.findDto(id, tx))!;
      });
    },

    update(ctx: RequestContext, id: string, patch: PersonPatch) {
      return db.transaction(async (tx) => {
        if (patch.active === false) await peopleRepository.lockAdminRights(tx);
        const before = await peopleRepository.findDto(id, tx);
        if (!before) throw errors.notFound('The person');
        await requireInstitution(patch.institutionId, tx);
        if (patch.active === false && before.active) await keepAnAdmin(id, tx);
        await peopleRepository.update(id, patch, tx);
        const changes = Object.fromEntries(
          Object.entries(patch)
            .filter(([k, v]) => (before as Record<string, unknown>)[k] !== v)
            .map(([k, v]) => [k, { from: (before as Record<string, unknown>)[k], to: v }]),
        );
        if (Object.keys(changes).length) await auditService.record(ctx, 'person.updated', { type: 'person', id }, changes, tx);
        return (await peopleRepository.findDto(id, tx))!;
      });
    },

    grantRole(ctx: RequestContext, id: string, role: Role) {
      return db.transaction(async (tx) => {
        const person = await peopleRepository.findRecord({ id }, tx);
        if (!person) throw errors.notFound('The person');
        const created = await peopleRepository.grantRole(id, role, ctx.principal?.personId ?? null, tx);
        if (created) {
          await auditService.record(ctx, 'role.granted', { type: 'person', id }, { role, email: person.email }, tx);
          await enqueueMail(
            accessMail(person.email, person.name, `You now hold the ${ROLE_LABELS[role].label} role in Localis: ${ROLE_LABELS[role].description}`, `role-granted:${id}:${role}:${Date.now()}`),
            tx,
          );
        }
        return (await peopleRepository.findDto(id, tx))!;
      });
    },

    revokeRole(ctx: RequestContext, id: string, role: Role) {
      return db.transaction(async (tx) => {
        if (role === 'admin') await peopleRepository.lockAdminRights(tx);
        const person = await peopleRepository.findRecord({ id }, tx);
        if (!person) throw errors.notFound('The person');
        if (role === 'admin') await keepAnAdmin(id, tx);
        const removed = await peopleRepository.revokeRole(id, role, tx);
        if (removed) {
          await auditService.record(ctx, 'role.revoked', { type: 'person', id }, { role, email: person.email }, tx);
          await enqueueMail(
            accessMail(person.email, person.name, `The ${ROLE_LABELS[role].label} role was removed from your Localis account.`, `role-revoked:${id}:${role}:${Date.now()}`),
            tx,
          );
        }
        return (await peopleRepository.findDto(id, tx))!;
      });
    },
  };
}
export type PeopleService = ReturnType<typeof createPeopleService>;
