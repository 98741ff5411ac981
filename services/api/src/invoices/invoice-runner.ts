import { computeInvoice, OUTBOX_KINDS } from '@localis/shared';
import { outboxRepository } from '../outbox/outbox.repository';
import { officeAddresses } from './billing-contacts';
import type { Database } from '../db';
import { Institution, InvoiceRow } from '../db/models';
import { rateCardsRepository, toRateCardDto } from '../rate-cards/rate-cards.repository';
import { unbilledUsage } from './invoice-usage';
import { invoicesRepository } from './invoices.repository';

export type InvoiceRunOutcome = 'done' | 'failed' | 'skipped';

/**
 * Run one queued invoice run: for each partner with usage in the period not yet on an invoice,
 * one draft priced with the rate card in force on the period's first day. A draft of the same
 * period is brought up to date (replaced, with what it billed plus what is new); issued invoices
 * are never touched, and their entries are never billed again. One transaction per partner.
 * Partners without a rate card are named in the run's error, the others drafted.
 */
export function createInvoiceRunner(db: Database, publicUrl = '') {
  return {
    async run(runId: string): Promise<InvoiceRunOutcome> {
      const run = await db.transaction(async (tx) => {
        const r = await invoicesRepository.findRunLocked(runId, tx);
        if (!r || (r.state !== 'queued' && r.state !== 'running')) return null;
        await r.update({ state: 'running' }, { transaction: tx });
        return r;
      });
      if (!run) return 'skipped';
      const period = { from: run.periodFrom, to: run.periodTo };
      const missingCards: string[] = [];
      let drafted = 0;
      const partners = await db.transaction((tx) => unbilledUsage(db, period, tx));
      for (const { institutionId } of partners) {
        const made = await db.transaction(async (tx) => {
          // Read again inside the transaction that writes: another run may have billed entries meanwhile.
          const usage = (await unbilledUsage(db, period, tx)).find((p) => p.institutionId === institutionId);
          const existing = await invoicesRepository.draftOf(institutionId, period, tx);
          if (existing) await existing.destroy({ transaction: tx });
          if (!usage || !usage.usage.some((u) => u.netMilli !== 0)) return false;
          const card = await rateCardsRepository.inForce(institutionId, period.from, tx);
          if (!card) {
            const institution = await Institution.findByPk(institutionId, { transaction: tx });
            missingCards.push(institution?.name ?? institutionId);
            return false;
          }
          const pricing = toRateCardDto(card);
          const computed = computeInvoice(pricing, usage.usage);
          const invoice = await InvoiceRow.create(
            {
              institutionId,
              runId,
              number: null,
              currency: computed.currency,
              periodFrom: period.from,
              periodTo: period.to,
              rateCard: pricing as unknown as Record<string, unknown>,
              lines: computed.lines as unknown as Record<string, unknown>[],
              subtotalMinor: computed.subtotalMinor,
              discountMinor: computed.discountMinor,
              taxMinor: computed.taxMinor,
              totalMinor: computed.totalMinor,
              issuedOn: null, dueOn: null, paidAt: null, voidedAt: null, voidReason: null, creditNoteNumber: null,
              paymentReference: null, paymentState: null, stripeInvoiceId: null, hostedPaymentUrl: null, pdfObjectKey: null, remindedAt: null,
            },
            { transaction: tx },
          );
          await invoicesRepository.billEntries(invoice.id, usage.entryIds, tx);
          return true;
        });
        if (made) drafted++;
      }
      await db.transaction(async (tx) => {
        const r = (await invoicesRepository.findRunLocked(runId, tx))!;
        const error = missingCards.length ? `No rate card in force on ${period.from} for ${missingCards.join(', ')}: add one and run the period again.` : null;
        await r.update({ state: 'done', drafted, error, finishedAt: new Date() }, { transaction: tx });
        // The monthly run was queued by nobody: the office hears that its drafts are ready.
        const office = r.startedByPersonId === null ? await officeAddresses(tx) : [];
        if (office.length && (drafted > 0 || error)) {
          await outboxRepository.enqueue(
            OUTBOX_KINDS.mail,
            {
              to: office,
              subject: `Invoices of ${period.from.slice(0, 7)}: ${drafted} draft${drafted === 1 ? '' : 's'} to check and issue`,
              text: [`The invoice run for ${period.from} to ${period.to} drafted ${drafted} invoice${drafted === 1 ? '' : 's'} from the ledger.`, ...(error ? [error] : []), `Check and issue them in Localis: ${publicUrl}/invoices?state=draft`].join('\n'),
              dedupeKey: `invoice-run-done-${runId}`,
            },
            tx,
          );
        }
      });
      return 'done';
    },
  };
}
export type InvoiceRunner = ReturnType<typeof createInvoiceRunner>;
