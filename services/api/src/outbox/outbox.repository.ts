import { Op, type Transaction } from 'sequelize';
import { OutboxMessage } from '../db/models';

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
      where: { dispatchedAt: { [Op.is]: null } },
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

  async markFailed(id: string, error: string, tx: Transaction): Promise<void> {
    await OutboxMessage.increment('attempts', { where: { id }, transaction: tx });
    await OutboxMessage.update({ lastError: error.slice(0, 1000) }, { where: { id }, transaction: tx });
  },

  async pendingCount(): Promise<number> {
    return OutboxMessage.count({ where: { dispatchedAt: { [Op.is]: null } } });
  },
};
