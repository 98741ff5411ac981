import { Op, type Transaction } from 'sequelize';
import { OutboxMessage } from '../db/models';

/** After this many failed hand-overs a message is parked (kept, with its last error) for a person to look at. */
export const MAX_DISPATCH_ATTEMPTS = 10;

export interface PendingMessage {
  id: string;
  kind: string;
  payload: Record<string, unknown>;
  attempts: number;
}

export const outboxRepository = {
  /** Call inside the transaction of the change that causes the message. */
  async enqueue(kind: string, payload: Record<string, unknown>, tx?: Transaction): Promise<string> {
    const row = await OutboxMessage.create({ kind, payload, dispatchedAt: null, lastError: null }, { transaction: tx });
    return String(row.id);
  },

  /**
   * Claim up to `limit` undispatched messages for one dispatcher. SKIP LOCKED lets several
   * dispatchers (on several machines) share the outbox without handing a message out twice.
   */
  async claimPending(limit: number, tx: Transaction): Promise<PendingMessage[]> {
    const rows = await OutboxMessage.findAll({
      where: { dispatchedAt: { [Op.is]: null }, attempts: { [Op.lt]: MAX_DISPATCH_ATTEMPTS } },
      order: [['id', 'ASC']],
      limit,
      lock: tx.LOCK.UPDATE,
      skipLocked: true,
      transaction: tx,
    });
    return rows.map((r) => ({ id: String(r.id), kind: r.kind, payload: r.payload, attempts: r.attempts }));
  },

  async markDispatched(ids: string[], tx: Transaction): Promise<void> {
    if (ids.length) await OutboxMessage.update({ dispatchedAt: new Date() }, { where: { id: ids }, transaction: tx });
  },

  /** `permanent` parks the message at once (it can never succeed, e.g. an unknown kind). */
  async markFailed(id: string, error: string, tx: Transaction, permanent = false): Promise<void> {
    if (permanent) await OutboxMessage.update({ attempts: MAX_DISPATCH_ATTEMPTS }, { where: { id }, transaction: tx });
    else await OutboxMessage.increment('attempts', { where: { id }, transaction: tx });
    await OutboxMessage.update({ lastError: error.slice(0, 1000) }, { where: { id }, transaction: tx });
  },
};
