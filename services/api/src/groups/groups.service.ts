import { UniqueConstraintError } from 'sequelize';
import { errors, type ResearchGroupInput, type ResearchGroupListQuery } from '@localis/shared';
import type { Database } from '../db';
import type { RequestContext } from '../http/principal';
import { auditService } from '../audit/audit.service';
import { actsAsAdmin } from '../http/acts-as-admin';
import { institutionsRepository } from '../institutions/institutions.repository';
import { peopleRepository } from '../people/people.repository';
import { groupsRepository } from './groups.repository';

export function createGroupsService(db: Database) {
  /** Admins manage every group; a PI manages their own group's members. */
  function assertCanManage(ctx: RequestContext, group: { piPersonId: string }) {
    const p = ctx.principal!;
    if (actsAsAdmin(p)) return;
    if (group.piPersonId === p.personId && p.roles.includes('pi')) return;
    throw errors.forbidden("Only the group's PI or the consortium office can change its members.");
  }

  return {
    list: (ctx: RequestContext, q: ResearchGroupListQuery) => groupsRepository.list(q, ctx.principal!.personId),

    /** Members are visible to the group itself, its PI, and the office. */
    async get(ctx: RequestContext, id: string) {
      const group = await groupsRepository.find(id);
      if (!group) throw errors.notFound('The research group');
      const p = ctx.principal!;
      const inside = p.roles.includes('admin') || group.piPersonId === p.personId || group.members.some((m) => m.personId === p.personId);
      if (!inside) throw errors.forbidden('You are not a member of this research group.');
      return group;
    },

    create(ctx: RequestContext, input: ResearchGroupInput, fixedId?: string) {
      return db.transaction(async (tx) => {
        if (!(await institutionsRepository.find(input.institutionId, tx))) {
          throw errors.invalid('That institution does not exist.', [{ path: ['institutionId'], message: 'choose an existing institution' }]);
        }
        const pi = await peopleRepository.findRecord({ id: input.piPersonId }, tx);
        if (!pi) throw errors.invalid('That PI does not exist.', [{ path: ['piPersonId'], message: 'choose an existing person' }]);
        if (!pi.roles.includes('pi')) {
          throw errors.invalid(`${pi.name} does not hold the PI role; grant it first.`, [{ path: ['piPersonId'], message: 'this person is not a PI' }]);
        }
        let id: string;
        try {
          id = await groupsRepository.create({ ...input, id: fixedId }, tx);
        } catch (e) {
          if (e instanceof UniqueConstraintError) throw errors.conflict(`The institution already has a group named "${input.name}".`);
          throw e;
        }
        await groupsRepository.addMember(id, input.piPersonId, tx);
        await auditService.record(ctx, 'group.created', { type: 'research-group', id }, { ...input }, tx);
        return (await groupsRepository.find(id, tx))!;
      });
    },

    addMember(ctx: RequestContext, id: string, personId: string) {
      return db.transaction(async (tx) => {
        const group = await groupsRepository.find(id, tx);
        if (!group) throw errors.notFound('The research group');
        assertCanManage(ctx, group);
        const person = await peopleRepository.findRecord({ id: personId }, tx);
        if (!person) throw errors.invalid('That person does not exist.', [{ path: ['personId'], message: 'choose an existing person' }]);
        if (!person.active) throw errors.conflict(`${person.name}'s account is deactivated.`);
        if (await groupsRepository.addMember(id, personId, tx)) {
          await auditService.record(ctx, 'group.member-added', { type: 'research-group', id }, { personId, email: person.email }, tx);
        }
        return (await groupsRepository.find(id, tx))!;
      });
    },

    removeMember(ctx: RequestContext, id: string, personId: string) {
      return db.transaction(async (tx) => {
        const group = await groupsRepository.find(id, tx);
        if (!group) throw errors.notFound('The research group');
        assertCanManage(ctx, group);
        if (personId === group.piPersonId) throw errors.conflict('The PI cannot be removed from their own group.');
        if (!(await groupsRepository.removeMember(id, personId, tx))) throw errors.notFound('That member');
        await auditService.record(ctx, 'group.member-removed', { type: 'research-group', id }, { personId }, tx);
        return (await groupsRepository.find(id, tx))!;
      });
    },
  };
}
export type GroupsService = ReturnType<typeof createGroupsService>;
