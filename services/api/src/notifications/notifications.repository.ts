import { Op, QueryTypes, type Transaction, type WhereOptions } from 'sequelize';
import type { Notification as NotificationDto, NotificationKind, NotificationListQuery, NotificationPage } from '@localis/shared';
import { Notification, Person, Round } from '../db/models';

export interface NewNotification {
  personId: string;
  kind: NotificationKind;
  title: string;
  body: string;
  link: string | null;
  dedupeKey: string;
}

function toDto(n: Notification): NotificationDto {
  return {
    id: String(n.id),
    kind: n.kind,
    title: n.title,
    body: n.body,
    link: n.link,
    readAt: n.readAt?.toISOString() ?? null,
    createdAt: n.createdAt.toISOString(),
  };
}

/** In-app notifications, people's mail preferences, and which rounds had their closing notice. */
export const notificationsRepository = {
  /**
   * Insert the rows a person has not had yet (same dedupe key = same event) and answer the
   * people whose row is new, so their mail is queued once too. One statement for every
   * recipient: a round closing reaches every PI.
   */
  async insertNew(rows: NewNotification[], tx: Transaction): Promise<Set<string>> {
    if (!rows.length) return new Set();
    const inserted = await Notification.sequelize!.query<{ person_id: string }>(
      `INSERT INTO notifications (person_id, kind, title, body, link, dedupe_key)
       SELECT * FROM unnest($1::uuid[], $2::text[], $3::text[], $4::text[], $5::text[], $6::text[])
       ON CONFLICT (person_id, dedupe_key) DO NOTHING
       RETURNING person_id`,
      {
        bind: [
          rows.map((r) => r.personId),
          rows.map((r) => r.kind),
          rows.map((r) => r.title),
          rows.map((r) => r.body),
          rows.map((r) => r.link),
          rows.map((r) => r.dedupeKey),
        ],
        type: QueryTypes.SELECT,
        transaction: tx,
      },
    );
    return new Set(inserted.map((r) => r.person_id));
  },

  async list(personId: string, q: NotificationListQuery): Promise<NotificationPage> {
    const where: WhereOptions<Notification> = { personId, ...(q.unread ? { readAt: { [Op.is]: null } } : {}) };
    const [{ rows, count }, unread] = await Promise.all([
      Notification.findAndCountAll({ where, order: [['id', 'DESC']], limit: q.limit, offset: q.offset }),
      notificationsRepository.countUnread(personId),
    ]);
    return { items: rows.map(toDto), total: count, unread, limit: q.limit, offset: q.offset };
  },

  countUnread(personId: string, tx?: Transaction): Promise<number> {
    return Notification.count({ where: { personId, readAt: { [Op.is]: null } }, transaction: tx });
  },

  /** Only the person's own rows change: another person's ids simply match nothing. */
  async markRead(personId: string, which: { ids: string[] } | 'all', tx?: Transaction): Promise<number> {
    if (which !== 'all' && !which.ids.length) return 0;
    const [changed] = await Notification.update(
      { readAt: new Date() },
      { where: { personId, readAt: { [Op.is]: null }, ...(which === 'all' ? {} : { id: { [Op.in]: which.ids } }) }, transaction: tx },
    );
    return changed;
  },

  /** The stored preferences; `lock` holds the person's row until the transaction ends. */
  async mailPreferencesOf(personId: string, tx?: Transaction, lock = false): Promise<Record<string, boolean> | null> {
    const p = await Person.findByPk(personId, { attributes: ['id', 'mailPreferences'], transaction: tx, lock: lock && tx ? tx.LOCK.UPDATE : undefined });
    return p ? (p.mailPreferences ?? {}) : null;
  },

  async setMailPreferences(personId: string, preferences: Record<string, boolean>, tx: Transaction): Promise<void> {
    await Person.update({ mailPreferences: preferences }, { where: { id: personId }, transaction: tx });
  },

  /** Rounds closing in (from, to] whose closing notice has not gone out. */
  async roundsDueForClosingNotice(from: Date, to: Date): Promise<string[]> {
    const rounds = await Round.findAll({
      where: { closingNoticeSentAt: { [Op.is]: null }, closesAt: { [Op.gt]: from, [Op.lte]: to } },
      attributes: ['id'],
      order: [['closesAt', 'ASC']],
    });
    return rounds.map((r) => r.id);
  },

  /**
   * Lock a round whose notice is still due, or answer false: another sweep holds it or sent it.
   * SKIP LOCKED lets two workers sweep at once without waiting on each other.
   */
  async claimClosingNotice(id: string, from: Date, to: Date, tx: Transaction): Promise<boolean> {
    const round = await Round.findOne({
      where: { id, closingNoticeSentAt: { [Op.is]: null }, closesAt: { [Op.gt]: from, [Op.lte]: to } },
      attributes: ['id'],
      lock: tx.LOCK.UPDATE,
      skipLocked: true,
      transaction: tx,
    });
    return round !== null;
  },

  async markClosingNoticeSent(id: string, at: Date, tx: Transaction): Promise<void> {
    await Round.update({ closingNoticeSentAt: at }, { where: { id }, transaction: tx });
  },
};
