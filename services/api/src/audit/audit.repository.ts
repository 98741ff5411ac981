import { Op, type Transaction, type WhereOptions } from 'sequelize';
import { parseSort, type AuditEntry, type AuditListQuery, type Page } from '@localis/shared';
import { AuditLog, Person } from '../db/models';

export interface NewAuditEntry {
  actorPersonId: string | null;
  via: 'session' | 'token' | 'system';
  action: string;
  targetType: string;
  targetId: string | null;
  details: Record<string, unknown>;
  ip: string | null;
  userAgent: string | null;
}

function toEntry(row: AuditLog): AuditEntry {
  return {
    id: String(row.id),
    actorPersonId: row.actorPersonId,
    actorName: row.actor?.name ?? null,
    via: row.via,
    action: row.action,
    targetType: row.targetType,
    targetId: row.targetId,
    details: row.details ?? {},
    ip: row.ip,
    userAgent: row.userAgent,
    createdAt: row.createdAt.toISOString(),
  };
}

const SORT_COLUMNS: Record<string, string> = { createdAt: 'createdAt', action: 'action', targetType: 'targetType' };

export const auditRepository = {
  async append(entry: NewAuditEntry, tx?: Transaction): Promise<void> {
    await AuditLog.create(entry, { transaction: tx });
  },

  async list(q: AuditListQuery): Promise<Page<AuditEntry>> {
    const where: WhereOptions<AuditLog> = {};
    if (q.action) Object.assign(where, { action: { [Op.iLike]: `${q.action.replace(/[%_]/g, '\\$&')}%` } });
    if (q.targetType) Object.assign(where, { targetType: q.targetType });
    if (q.targetId) Object.assign(where, { targetId: q.targetId });
    if (q.actorPersonId) Object.assign(where, { actorPersonId: q.actorPersonId });
    if (q.from || q.to) {
      Object.assign(where, { createdAt: { ...(q.from ? { [Op.gte]: new Date(q.from) } : {}), ...(q.to ? { [Op.lt]: new Date(q.to) } : {}) } });
    }
    const { field, direction } = parseSort(q.sort);
    const { rows, count } = await AuditLog.findAndCountAll({
      where,
      include: [{ model: Person, as: 'actor', attributes: ['name'] }],
      order: [[SORT_COLUMNS[field] ?? 'createdAt', direction], ['id', direction]],
      limit: q.limit,
      offset: q.offset,
    });
    return { items: rows.map(toEntry), total: count, limit: q.limit, offset: q.offset };
  },
};
