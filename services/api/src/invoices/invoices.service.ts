import { dueOn, errors, OUTBOX_KINDS, type Invoice, type InvoiceList, type InvoiceListQuery, type InvoiceRun, type InvoiceRunInput, type InvoiceRunList, type PaymentLink } from '@localis/shared';
import type { Database } from '../db';
import { InvoiceEntryRow, InvoiceRunRow, type InvoiceRow } from '../db/models';
import type { RequestContext } from '../http/principal';
import { auditService } from '../audit/audit.service';
import { outboxRepository } from '../outbox/outbox.repository';
import { invoicesRepository, toInvoiceDto, toInvoiceRunDto } from './invoices.repository';
import type { InvoicePayments } from './invoice-payments';

const today = () => new Date().toISOString().slice(0, 10);

/**
 * Invoices of partner institutions. The office runs periods into drafts, issues them (a number
 * without gaps, the due date from the rate card's terms, a PDF, the payment page) and voids them
 * with a reason (an issued invoice gets a credit note). Billing contacts see and pay their own.
 */
export function createInvoicesService(db: Database, payments: InvoicePayments) {
  /** Admins see every invoice; a billing contact only their institution's (others are not found). */
  function visible(ctx: RequestContext, invoice: InvoiceRow | null): InvoiceRow {
    const p = ctx.principal!;
    if (!invoice || !(p.roles.includes('admin') || (p.roles.includes('billing') && p.institutionId === invoice.institutionId))) throw errors.notFound('The invoice');
    return invoice;
  }

  async function dto(id: string): Promise<Invoice> {
    return toInvoiceDto((await invoicesRepository.find(id))!);
  }

  return {
    async list(ctx: RequestContext, q: InvoiceListQuery): Promise<InvoiceList> {
      const p = ctx.principal!;
      const institutionId = p.roles.includes('admin') ? q.institutionId : p.institutionId;
      if (!institutionId && !p.roles.includes('admin')) return { items: [] };
      if (!p.roles.includes('admin') && q.institutionId && q.institutionId !== p.institutionId) throw errors.forbidden('Billing contacts see the invoices of their own institution.');
      return { items: (await invoicesRepository.list({ institutionId: institutionId ?? undefined, state: q.state, overdue: q.overdue })).map(toInvoiceDto) };
    },

    async get(ctx: RequestContext, id: string): Promise<Invoice> {
      return toInvoiceDto(visible(ctx, await invoicesRepository.find(id)));
    },

    async runs(): Promise<InvoiceRunList> {
      return { items: (await invoicesRepository.runs()).map(toInvoiceRunDto) };
    },

    async requestRun(ctx: RequestContext, input: InvoiceRunInput): Promise<InvoiceRun> {
      return db.transaction(async (tx) => {
        const open = await invoicesRepository.openRun(tx);
        if (open) throw errors.conflict(`The invoice run for ${open.periodFrom} to ${open.periodTo} is still ${open.state}; wait until it has finished.`);
        const p = ctx.principal!;
        const run = await InvoiceRunRow.create({ periodFrom: input.from, periodTo: input.to, error: null, startedByPersonId: p.via === 'system' ? null : p.personId, finishedAt: null }, { transaction: tx });
        await outboxRepository.enqueue(OUTBOX_KINDS.invoiceRun, { runId: run.id }, tx);
        await auditService.record(ctx, 'invoice-run.requested', { type: 'invoice-run', id: run.id }, { ...input }, tx);
        return toInvoiceRunDto(run);
      });
    },

    /** `issuedOn` is for the demo scenario, whose invoices were issued in past months; the api issues today. */
    async issue(ctx: RequestContext, id: string, options: { issuedOn?: string } = {}): Promise<Invoice> {
      await db.transaction(async (tx) => {
        const invoice = await invoicesRepository.findLocked(id, tx);
        if (!invoice) throw errors.notFound('The invoice');
        if (invoice.state !== 'draft') throw errors.conflict(`Invoice ${invoice.number} is ${invoice.state} already.`);
        const issuedOn = options.issuedOn ?? today();
        const number = await invoicesRepository.nextNumber(Number(issuedOn.slice(0, 4)), tx);
        const terms = (invoice.rateCard as { paymentTermsDays: number }).paymentTermsDays;
        await invoice.update({ state: 'issued', number, issuedOn, dueOn: dueOn(issuedOn, terms), paymentReference: number }, { transaction: tx });
        await auditService.record(ctx, 'invoice.issued', { type: 'invoice', id }, { number, totalMinor: Number(invoice.totalMinor), currency: invoice.currency }, tx);
        // The worker makes sure the PDF, the payment page and the e-mail follow, retrying until done.
        await outboxRepository.enqueue(OUTBOX_KINDS.invoiceIssued, { invoiceId: id }, tx);
      });
      // Done here at once too, so the answer has them; every step is idempotent, and a failure is left to the worker.
      await payments.afterIssue(id).catch(() => undefined);
      return dto(id);
    },

    async void(ctx: RequestContext, id: string, reason: string): Promise<Invoice> {
      const wasIssued = await db.transaction(async (tx) => {
        const invoice = await invoicesRepository.findLocked(id, tx);
        if (!invoice) throw errors.notFound('The invoice');
        if (invoice.state === 'void') throw errors.conflict(`The invoice is void already.`);
        if (invoice.state === 'paid') throw errors.conflict(`Invoice ${invoice.number} is paid; a paid invoice is settled with a credit, not voided.`);
        const issued = invoice.state === 'issued';
        await invoice.update({ state: 'void', voidReason: reason, voidedAt: new Date(), creditNoteNumber: issued ? `CN-${invoice.number}` : null }, { transaction: tx });
        // Its usage may be billed again, on a corrected invoice.
        await InvoiceEntryRow.destroy({ where: { invoiceId: id }, transaction: tx });
        await auditService.record(ctx, 'invoice.voided', { type: 'invoice', id }, { number: invoice.number, reason }, tx);
        return issued;
      });
      if (wasIssued) await payments.afterVoid(id);
      return dto(id);
    },

    /** A short-lived download link: the invoice's PDF, or a voided invoice's credit note. */
    async pdfUrl(ctx: RequestContext, id: string): Promise<string> {
      const invoice = visible(ctx, await invoicesRepository.find(id));
      if (invoice.state === 'draft') throw errors.conflict('A draft has no PDF yet; it is made when the invoice is issued.');
      const kind = invoice.state === 'void' && invoice.creditNoteNumber ? 'credit-note' : 'invoice';
      const key = await payments.ensurePdf(id, kind);
      return payments.downloadUrl(key, `${kind === 'credit-note' ? invoice.creditNoteNumber : invoice.number}.pdf`);
    },

    async pay(ctx: RequestContext, id: string): Promise<PaymentLink> {
      const invoice = visible(ctx, await invoicesRepository.find(id));
      if (invoice.state !== 'issued') throw errors.conflict(invoice.state === 'paid' ? `Invoice ${invoice.number} is paid already.` : invoice.state === 'void' ? 'The invoice is void; it cannot be paid.' : 'A draft cannot be paid; it is issued first.');
      return { url: await payments.paymentPage(id) };
    },
  };
}
export type InvoicesService = ReturnType<typeof createInvoicesService>;
