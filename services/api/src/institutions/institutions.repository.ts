import { Op, type Transaction, type WhereOptions } from 'sequelize';
import { parseSort, type Institution as InstitutionDto, type InstitutionInput, type InstitutionListQuery, type InstitutionPatch, type Page } from '@localis/shared';
import { Institution } from '../db/models';

function toDto(i: Institution): InstitutionDto {
  return { id: i.id, name: i.name, kind: i.kind, country: i.country, billingEmail: i.billingEmail, createdAt: i.createdAt.toISOString() };
}

export const institutionsRepository = {
  async find(id: string, tx?: Transaction): Promise<InstitutionDto | null> {
    const i = await Institution.findByPk(id, { transaction: tx });
    return i ? toDto(i) : null;
  },

  async list(q: InstitutionListQuery): Promise<Page<InstitutionDto>> {
    const where: WhereOptions<Institution> = {};
    if (q.q) Object.assign(where, { name: { [Op.iLike]: `%${q.q.replace(/[\\%_]/g, '\\$&')}%` } });
    if (q.kind) Object.assign(where, { kind: q.kind });
    const { field, direction } = parseSort(q.sort);
    const { rows, count } = await Institution.findAndCountAll({ where, order: [[field, direction], ['id', 'ASC']], limit: q.limit, offset: q.offset });
    return { items: rows.map(toDto), total: count, limit: q.limit, offset: q.offset };
  },

  async create(input: InstitutionInput & { id?: string }, tx?: Transaction): Promise<InstitutionDto> {
    return toDto(await Institution.create(input, { transaction: tx }));
  },

  async update(id: string, patch: InstitutionPatch, tx?: Transaction): Promise<void> {
    await Institution.update(patch, { where: { id }, transaction: tx });
  },
};
