import { Op } from 'sequelize';
import { formatMinor, OUTBOX_KINDS } from '@localis/shared';
import type { Database } from '../db';
import { Institution, InvoiceRow, InvoiceRunRow } from '../db/models';
import { outboxRepository } from '../outbox/outbox.repository';
import { billingAddressesOf } from './billing-contacts';

/** Between two reminders of the same overdue invoice. */
export const REMINDER_EVERY_DAYS = 7;

const ymd = (d: Date) => d.toISOString().slice(0, 10);

/**
 * The monthly invoice run: once a month has ended, its run is queued (by nobody: the office is
 * mailed when its drafts are ready). Marked by the run itself, so the hourly sweep queues it once.
 */
export async function queueLastMonthsRun(db: Database, now: Date): Promise<string | null> {
  const from = ymd(new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - 1, 1)));
  const to = ymd(new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), 0)));
  return db.transaction(async (tx) => {
    const existing = await InvoiceRunRow.findOne({ where: { periodFrom: from, periodTo: to, state: { [Op.ne]: 'failed' } }, transaction: tx, lock: tx.LOCK.UPDATE });
    if (existing) return null;
    if (await InvoiceRunRow.findOne({ where: { state: ['queued', 'running'] }, transaction: tx })) return null; // the next sweep tries again
    const run = await InvoiceRunRow.create({ periodFrom: from, periodTo: to, error: null, startedByPersonId: null, finishedAt: null }, { transaction: tx });
    await outboxRepository.enqueue(OUTBOX_KINDS.invoiceRun, { runId: run.id }, tx);
    return run.id;
  });
}

/** Issued invoices past their due date: their billing contacts are reminded, then again every REMINDER_EVERY_DAYS. */
export async function remindOverdueInvoices(db: Database, now: Date, publicUrl: string): Promise<number> {
  const due = await InvoiceRow.findAll({
    where: { state: 'issued', dueOn: { [Op.lt]: ymd(now) }, [Op.or]: [{ remindedAt: null }, { remindedAt: { [Op.lt]: new Date(now.getTime() - REMINDER_EVERY_DAYS * 86_400_000) } }] },
    attributes: ['id'],
  });
  let reminded = 0;
  for (const { id } of due) {
    const sent = await db.transaction(async (tx) => {
      const invoice = await InvoiceRow.findByPk(id, { transaction: tx, lock: tx.LOCK.UPDATE });
      if (!invoice || invoice.state !== 'issued') return false;
      const to = await billingAddressesOf(invoice.institutionId, tx);
      const partner = await Institution.findByPk(invoice.institutionId, { transaction: tx });
      await invoice.update({ remindedAt: now }, { transaction: tx });
      if (!to.length) return false;
      const total = formatMinor(Number(invoice.totalMinor), invoice.currency);
      await outboxRepository.enqueue(
        OUTBOX_KINDS.mail,
        {
          to,
          subject: `Reminder: invoice ${invoice.number} (${total}) was due on ${invoice.dueOn}`,
          text: [
            `Invoice ${invoice.number} to ${partner?.name ?? 'your institution'} for ${total} was due on ${invoice.dueOn} and is not paid yet.`,
            `Pay it or download it in Localis: ${publicUrl}/invoices/${invoice.id}`,
            'If you have paid it in the last few days, thank you; please ignore this reminder.',
          ].join('\n'),
          dedupeKey: `invoice-reminder-${invoice.id}-${ymd(now)}`,
        },
        tx,
      );
      return true;
    });
    if (sent) reminded++;
  }
  return reminded;
}
