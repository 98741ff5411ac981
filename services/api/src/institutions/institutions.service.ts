import { UniqueConstraintError } from 'sequelize';
import { errors, type Institution, type InstitutionInput, type InstitutionListQuery, type InstitutionPatch } from '@localis/shared';
import type { Database } from '../db';
import type { RequestContext } from '../http/principal';
import { auditService } from '../audit/audit.service';
import { institutionsRepository } from './institutions.repository';

/** Billing addresses are for the office and the institution's own billing contacts. */
function visibleTo(ctx: RequestContext, i: Institution): Institution {
  const p = ctx.principal;
  const may = p && (p.roles.includes('admin') || (p.roles.includes('billing') && p.institutionId === i.id));
  return may ? i : { ...i, billingEmail: null };
}

async function uniqueName<T>(name: string | undefined, work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (e) {
    if (e instanceof UniqueConstraintError) throw errors.conflict(`An institution named "${name}" already exists.`);
    throw e;
  }
}

export function createInstitutionsService(db: Database) {
  return {
    async list(ctx: RequestContext, q: InstitutionListQuery) {
      const page = await institutionsRepository.list(q);
      return { ...page, items: page.items.map((i) => visibleTo(ctx, i)) };
    },

    async get(ctx: RequestContext, id: string) {
      const found = await institutionsRepository.find(id);
      if (!found) throw errors.notFound('The institution');
      return visibleTo(ctx, found);
    },

    /** `fixedId` is for the demo scenario, whose ids never change. */
    create(ctx: RequestContext, input: InstitutionInput, fixedId?: string) {
      return uniqueName(input.name, () =>
        db.transaction(async (tx) => {
          const created = await institutionsRepository.create({ ...input, id: fixedId }, tx);
          await auditService.record(ctx, 'institution.created', { type: 'institution', id: created.id }, { ...input }, tx);
          return created;
        }),
      );
    },

    update(ctx: RequestContext, id: string, patch: InstitutionPatch) {
      return uniqueName(patch.name, () =>
        db.transaction(async (tx) => {
          const before = await institutionsRepository.find(id, tx);
          if (!before) throw errors.notFound('The institution');
          await institutionsRepository.update(id, patch, tx);
          const changes = Object.fromEntries(
            Object.entries(patch)
              .filter(([k, v]) => (before as Record<string, unknown>)[k] !== v)
              .map(([k, v]) => [k, { from: (before as Record<string, unknown>)[k], to: v }]),
          );
          if (Object.keys(changes).length) await auditService.record(ctx, 'institution.updated', { type: 'institution', id }, changes, tx);
          return (await institutionsRepository.find(id, tx))!;
        }),
      );
    },
  };
}
export type InstitutionsService = ReturnType<typeof createInstitutionsService>;
