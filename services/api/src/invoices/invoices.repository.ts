import { Op, type Transaction, type WhereOptions } from 'sequelize';
import { invoiceNotes, type Invoice, type InvoiceLine, type InvoiceRun } from '@localis/shared';
import { Institution, InvoiceEntryRow, InvoiceNumberRow, InvoiceRow, InvoiceRunRow } from '../db/models';

const include = [{ model: Institution, as: 'institution', attributes: ['name'] }];
const iso = (d: Date | null) => (d ? d.toISOString() : null);
const today = () => new Date().toISOString().slice(0, 10);

export function toInvoiceDto(r: InvoiceRow): Invoice {
  const card = r.rateCard as { reverseCharge: boolean; taxRateBasisPoints: number; discountBasisPoints: number };
  const lines = r.lines as unknown as InvoiceLine[];
  return {
    id: r.id,
    number: r.number,
    institutionId: r.institutionId,
    institutionName: (r as unknown as { institution?: { name: string } }).institution?.name ?? '',
    state: r.state,
    currency: r.currency,
    periodFrom: r.periodFrom,
    periodTo: r.periodTo,
    lines,
    subtotalMinor: Number(r.subtotalMinor),
    discountMinor: Number(r.discountMinor),
    taxMinor: Number(r.taxMinor),
    totalMinor: Number(r.totalMinor),
    reverseCharge: card.reverseCharge,
    taxRateBasisPoints: card.taxRateBasisPoints,
    discountBasisPoints: card.discountBasisPoints,
    notes: invoiceNotes({ reverseCharge: card.reverseCharge, lines }),
    issuedOn: r.issuedOn,
    dueOn: r.dueOn,
    paidAt: iso(r.paidAt),
    voidReason: r.voidReason,
    paymentReference: r.paymentReference,
    paymentState: r.paymentState,
    overdue: r.state === 'issued' && r.dueOn !== null && r.dueOn < today(),
    creditNoteNumber: r.creditNoteNumber,
    hasPdf: r.pdfObjectKey !== null,
    createdAt: r.createdAt.toISOString(),
  };
}

export function toInvoiceRunDto(r: InvoiceRunRow): InvoiceRun {
  return { id: r.id, periodFrom: r.periodFrom, periodTo: r.periodTo, state: r.state, drafted: r.drafted, error: r.error, createdAt: r.createdAt.toISOString(), finishedAt: iso(r.finishedAt) };
}

export const invoicesRepository = {
  find: (id: string, tx?: Transaction) => InvoiceRow.findByPk(id, { include, transaction: tx }),
  findLocked: (id: string, tx: Transaction) => InvoiceRow.findByPk(id, { transaction: tx, lock: tx.LOCK.UPDATE }),
  list(filter: { institutionId?: string; state?: Invoice['state']; overdue?: boolean }) {
    const where: WhereOptions<InvoiceRow> = {
      ...(filter.institutionId ? { institutionId: filter.institutionId } : {}),
      ...(filter.state ? { state: filter.state } : {}),
      ...(filter.overdue ? { state: 'issued', dueOn: { [Op.lt]: today() } } : {}),
    };
    return InvoiceRow.findAll({ where, include, order: [['createdAt', 'DESC']], limit: 500 });
  },
  draftOf: (institutionId: string, period: { from: string; to: string }, tx: Transaction) =>
    InvoiceRow.findOne({ where: { institutionId, state: 'draft', periodFrom: period.from, periodTo: period.to }, transaction: tx, lock: tx.LOCK.UPDATE }),
  billEntries: (invoiceId: string, entryIds: string[], tx: Transaction) => InvoiceEntryRow.bulkCreate(entryIds.map((ledgerEntryId) => ({ ledgerEntryId, invoiceId })), { transaction: tx }),

  /** The next invoice number of a year: the year's counter row is locked, so numbers have no gaps. */
  async nextNumber(year: number, tx: Transaction): Promise<string> {
    await InvoiceNumberRow.findOrCreate({ where: { year }, defaults: { year, last: 0 }, transaction: tx });
    const counter = (await InvoiceNumberRow.findByPk(year, { transaction: tx, lock: tx.LOCK.UPDATE }))!;
    const next = counter.last + 1;
    await counter.update({ last: next }, { transaction: tx });
    return `LCS-${year}-${String(next).padStart(4, '0')}`;
  },

  runs: () => InvoiceRunRow.findAll({ order: [['createdAt', 'DESC']], limit: 100 }),
  findRun: (id: string, tx?: Transaction) => InvoiceRunRow.findByPk(id, { transaction: tx }),
  findRunLocked: (id: string, tx: Transaction) => InvoiceRunRow.findByPk(id, { transaction: tx, lock: tx.LOCK.UPDATE }),
  /** A run still queued or running: a second one would draft the same entries. */
  openRun: (tx: Transaction) => InvoiceRunRow.findOne({ where: { state: ['queued', 'running'] }, transaction: tx, lock: tx.LOCK.UPDATE }),
};
