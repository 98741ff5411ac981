import { Op, literal, type Transaction, type WhereOptions } from 'sequelize';
import { parseSort, type Page, type Person as PersonDto, type PersonListQuery, type Role } from '@localis/shared';
import { Institution, Person, RoleGrant } from '../db/models';

function toDto(p: Person, roles: Role[]): PersonDto {
  return {
    id: p.id,
    name: p.name,
    email: p.email,
    institutionId: p.institutionId,
    institutionName: p.institution?.name ?? null,
    active: p.active,
    linked: p.oidcSubject !== null,
    roles,
    lastSignInAt: p.lastSignInAt?.toISOString() ?? null,
    createdAt: p.createdAt.toISOString(),
  };
}

const includeInstitution = [{ model: Institution, as: 'institution', attributes: ['name'] }];

/**
 * The person's roles as one array column of the same query, so reading a person (which every
 * authenticated request does) is one round trip, not two.
 */
const withRoles = {
  include: [[literal(`ARRAY(SELECT rg.role FROM role_grants rg WHERE rg.person_id = "Person"."id" ORDER BY rg.role)`), 'roleList']] as [ReturnType<typeof literal>, string][],
};
const rolesIn = (p: Person): Role[] => (p.get('roleList') as Role[] | undefined) ?? [];

export interface PersonRecord {
  id: string;
  name: string;
  email: string;
  oidcSubject: string | null;
  institutionId: string | null;
  active: boolean;
  roles: Role[];
}

export const peopleRepository = {
  async findDto(id: string, tx?: Transaction): Promise<PersonDto | null> {
    const p = await Person.findByPk(id, { attributes: withRoles, include: includeInstitution, transaction: tx });
    return p ? toDto(p, rolesIn(p)) : null;
  },

  /** The fields sign-in and authorization need, roles included. */
  async findRecord(where: { id?: string; email?: string; oidcSubject?: string }, tx?: Transaction): Promise<PersonRecord | null> {
    const p = await Person.findOne({ where, attributes: withRoles, transaction: tx, lock: tx ? tx.LOCK.UPDATE : undefined });
    if (!p) return null;
    return {
      id: p.id,
      name: p.name,
      email: p.email,
      oidcSubject: p.oidcSubject,
      institutionId: p.institutionId,
      active: p.active,
      roles: rolesIn(p),
    };
  },

  async list(q: PersonListQuery): Promise<Page<PersonDto>> {
    const where: WhereOptions<Person> = {};
    const and: WhereOptions<any>[] = [];
    if (q.q) {
      const like = `%${q.q.replace(/[\\%_]/g, '\\$&')}%`;
      and.push({ [Op.or]: [{ name: { [Op.iLike]: like } }, { email: { [Op.iLike]: like } }] });
    }
    if (q.role) {
      // The role is one of the fixed enum values (validated by the shared schema).
      and.push({ id: { [Op.in]: literal(`(SELECT person_id FROM role_grants WHERE role = '${q.role}')`) } });
    }
    if (q.institutionId) and.push({ institutionId: q.institutionId });
    if (q.active !== undefined) and.push({ active: q.active });
    if (q.linked !== undefined) and.push({ oidcSubject: q.linked ? { [Op.ne]: null } : { [Op.is]: null } });
    if (and.length) Object.assign(where, { [Op.and]: and });
    const { field, direction } = parseSort(q.sort);
    const order: any[] =
      field === 'institutionName'
        ? [[{ model: Institution, as: 'institution' }, 'name', `${direction} NULLS LAST`]]
        : [[field, `${direction} NULLS LAST`]];
    order.push(['id', 'ASC']);
    const { rows, count } = await Person.findAndCountAll({ where, attributes: withRoles, include: includeInstitution, order, limit: q.limit, offset: q.offset });
    return { items: rows.map((r) => toDto(r, rolesIn(r))), total: count, limit: q.limit, offset: q.offset };
  },

  async create(input: { id?: string; name: string; email: string; institutionId: string | null }, tx?: Transaction): Promise<string> {
    const p = await Person.create({ ...input, oidcSubject: null, lastSignInAt: null }, { transaction: tx });
    return p.id;
  },

  async update(id: string, patch: Partial<{ name: string; institutionId: string | null; active: boolean }>, tx?: Transaction): Promise<void> {
    await Person.update(patch, { where: { id }, transaction: tx });
  },

  async linkSubject(id: string, oidcSubject: string, tx?: Transaction): Promise<void> {
    await Person.update({ oidcSubject }, { where: { id }, transaction: tx });
  },

  async touchSignIn(id: string, tx?: Transaction): Promise<void> {
    await Person.update({ lastSignInAt: new Date() }, { where: { id }, transaction: tx });
  },

  async grantRole(personId: string, role: Role, grantedByPersonId: string | null, tx?: Transaction): Promise<boolean> {
    const [, created] = await RoleGrant.findOrCreate({ where: { personId, role }, defaults: { personId, role, grantedByPersonId }, transaction: tx });
    return created;
  },

  async revokeRole(personId: string, role: Role, tx?: Transaction): Promise<boolean> {
    return (await RoleGrant.destroy({ where: { personId, role }, transaction: tx })) > 0;
  },

  /** One lock for every change that can remove admin rights (see the people service). */
  async lockAdminRights(tx: Transaction): Promise<void> {
    await Person.sequelize!.query(`SELECT pg_advisory_xact_lock(hashtext('localis:admin-role'))`, { transaction: tx });
  },

  async countWithRole(role: Role, tx?: Transaction): Promise<number> {
    return RoleGrant.count({
      where: { role },
      include: [{ model: Person, as: 'person', where: { active: true }, attributes: [] }],
      transaction: tx,
    });
  },
};
