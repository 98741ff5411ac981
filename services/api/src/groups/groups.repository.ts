import { Op, literal, type Transaction, type WhereOptions } from 'sequelize';
import { parseSort, type Page, type ResearchGroup as GroupDto, type ResearchGroupDetail, type ResearchGroupListQuery } from '@localis/shared';
import { GroupMembership, Institution, Person, ResearchGroup } from '../db/models';

const include = [
  { model: Institution, as: 'institution', attributes: ['name'] },
  { model: Person, as: 'pi', attributes: ['name'] },
];

async function memberCounts(ids: string[], tx?: Transaction): Promise<Map<string, number>> {
  const rows = ids.length
    ? ((await GroupMembership.count({ where: { groupId: ids }, group: ['groupId'], transaction: tx })) as unknown as { groupId: string; count: number }[])
    : [];
  return new Map(rows.map((r) => [r.groupId, Number(r.count)]));
}

function toDto(g: ResearchGroup, count: number): GroupDto {
  return {
    id: g.id,
    name: g.name,
    institutionId: g.institutionId,
    institutionName: g.institution?.name ?? '',
    piPersonId: g.piPersonId,
    piName: g.pi?.name ?? '',
    memberCount: count,
    createdAt: g.createdAt.toISOString(),
  };
}

export const groupsRepository = {
  async list(q: ResearchGroupListQuery, personId: string): Promise<Page<GroupDto>> {
    const and: WhereOptions<any>[] = [];
    if (q.q) and.push({ name: { [Op.iLike]: `%${q.q.replace(/[\\%_]/g, '\\$&')}%` } });
    if (q.institutionId) and.push({ institutionId: q.institutionId });
    if (q.mine) {
      // personId is a UUID from the authenticated principal, never user input.
      and.push({
        [Op.or]: [
          { piPersonId: personId },
          { id: { [Op.in]: literal(`(SELECT group_id FROM group_memberships WHERE person_id = '${personId}')`) } },
        ],
      });
    }
    const where: WhereOptions<ResearchGroup> = and.length ? { [Op.and]: and } : {};
    const { field, direction } = parseSort(q.sort);
    const order: any[] = field === 'institutionName' ? [[{ model: Institution, as: 'institution' }, 'name', direction]] : [[field, direction]];
    order.push(['id', 'ASC']);
    const { rows, count } = await ResearchGroup.findAndCountAll({ where, include, order, limit: q.limit, offset: q.offset });
    const counts = await memberCounts(rows.map((r) => r.id));
    return { items: rows.map((r) => toDto(r, counts.get(r.id) ?? 0)), total: count, limit: q.limit, offset: q.offset };
  },

  async find(id: string, tx?: Transaction): Promise<ResearchGroupDetail | null> {
    const g = await ResearchGroup.findByPk(id, { include, transaction: tx });
    if (!g) return null;
    const memberships = await GroupMembership.findAll({
      where: { groupId: id },
      include: [{ model: Person, as: 'person', attributes: ['name', 'email'] }],
      order: [['createdAt', 'ASC']],
      transaction: tx,
    });
    return {
      ...toDto(g, memberships.length),
      members: memberships.map((m) => ({ personId: m.personId, name: m.person?.name ?? '', email: m.person?.email ?? '', joinedAt: m.createdAt.toISOString() })),
    };
  },

  async isMember(groupId: string, personId: string, tx?: Transaction): Promise<boolean> {
    return (await GroupMembership.count({ where: { groupId, personId }, transaction: tx })) > 0;
  },

  async groupsOf(personId: string): Promise<{ id: string; name: string; isPi: boolean }[]> {
    const memberships = await GroupMembership.findAll({
      where: { personId },
      include: [{ model: ResearchGroup, as: 'group', attributes: ['id', 'name', 'piPersonId'] }],
    });
    return memberships
      .filter((m) => m.group)
      .map((m) => ({ id: m.group!.id, name: m.group!.name, isPi: m.group!.piPersonId === personId }))
      .sort((a, b) => a.name.localeCompare(b.name));
  },

  async create(input: { id?: string; name: string; institutionId: string; piPersonId: string }, tx?: Transaction): Promise<string> {
    return (await ResearchGroup.create(input, { transaction: tx })).id;
  },

  async addMember(groupId: string, personId: string, tx?: Transaction): Promise<boolean> {
    const [, created] = await GroupMembership.findOrCreate({ where: { groupId, personId }, defaults: { groupId, personId }, transaction: tx });
    return created;
  },

  async removeMember(groupId: string, personId: string, tx?: Transaction): Promise<boolean> {
    return (await GroupMembership.destroy({ where: { groupId, personId }, transaction: tx })) > 0;
  },
};
