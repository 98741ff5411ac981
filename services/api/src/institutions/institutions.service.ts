import { errors, type InstitutionInput, type InstitutionListQuery, type InstitutionPatch } from '@localis/shared';
import type { Database } from '../db';
import type { RequestContext } from '../http/principal';
import { auditService } from '../audit/audit.service';
import { institutionsRepository } from './institutions.repository';

export function createInstitutionsService(db: Database) {
  return {
    list: (q: InstitutionListQuery) => institutionsRepository.list(q),

    async get(id: string) {
      const found = await institutionsRepository.find(id);
      if (!found) throw errors.notFound('The institution');
      return found;
    },

    create(ctx: RequestContext, input: InstitutionInput, fixedId?: string) {
      return db.transaction(async (tx) => {
        const created = await institutionsRepository.create({ ...input, id: fixedId }, tx);
        await auditService.record(ctx, 'institution.created', { type: 'institution', id: created.id }, { ...input }, tx);
        return created;
      });
    },

    update(ctx: RequestContext, id: string, patch: InstitutionPatch) {
      return db.transaction(async (tx) => {
        const before = await institutionsRepository.find(id, tx);
        if (!before) throw errors.notFound('The institution');
        await institutionsRepository.update(id, patch, tx);
        const changes = Object.fromEntries(
          Object.entries(patch).filter(([k, v]) => (before as Record<string, unknown>)[k] !== v).map(([k, v]) => [k, { from: (before as Record<string, unknown>)[k], to: v }]),
        );
        await auditService.record(ctx, 'institution.updated', { type: 'institution', id }, changes, tx);
        return (await institutionsRepository.find(id, tx))!;
      });
    },
  };
}
export type InstitutionsService = ReturnType<typeof createInstitutionsService>;
