import type Stripe from 'stripe';
import { errors, formatMinor, OUTBOX_KINDS, type InvoiceLine, type Settings } from '@localis/shared';
import type { Database } from '../db';
import { Institution, InvoiceRow } from '../db/models';
import { billingAddressesOf } from './billing-contacts';
import type { ObjectStore } from '../archives/object-store';
import { outboxRepository } from '../outbox/outbox.repository';
import { renderInvoicePdf } from './invoice-pdf';
import { invoicesRepository, toInvoiceDto } from './invoices.repository';

export const invoicePdfKey = (invoiceId: string, kind: 'invoice' | 'credit-note' = 'invoice') => `invoices/${invoiceId}/${kind}.pdf`;

/**
 * What follows the issue of an invoice, outside its transaction: the PDF in the object store, the
 * invoice at Stripe with its payment page, the e-mail to the partner's billing contacts. Each step
 * is idempotent (a stored PDF is kept, Stripe calls carry idempotency keys made from our ids, the
 * e-mail has a dedupe key), so it is simply done again where it did not finish: the payment page
 * and the PDF download ask for what they need.
 */
export function createInvoicePayments(db: Database, settings: Settings, store: ObjectStore, stripe: Stripe) {
  const issuer = () => ({
    name: settings.BILLING_ISSUER_NAME,
    address: settings.BILLING_ISSUER_ADDRESS ? settings.BILLING_ISSUER_ADDRESS.split('|').map((l) => l.trim()) : [],
    email: settings.MAIL_FROM.replace(/^.*<([^>]+)>.*$/, '$1'),
    ...(settings.BILLING_ISSUER_VAT_ID ? { vatId: settings.BILLING_ISSUER_VAT_ID } : {}),
  });

  async function ensurePdf(invoiceId: string, kind: 'invoice' | 'credit-note' = 'invoice'): Promise<string> {
    const invoice = (await invoicesRepository.find(invoiceId))!;
    const key = invoicePdfKey(invoiceId, kind);
    if (kind === 'invoice' && invoice.pdfObjectKey) return invoice.pdfObjectKey;
    const institution = (await Institution.findByPk(invoice.institutionId))!;
    const pdf = await renderInvoicePdf({ invoice: toInvoiceDto(invoice), issuer: issuer(), partner: { name: institution.name, country: institution.country, billingEmail: institution.billingEmail }, kind, creditNoteIssuedOn: invoice.voidedAt ? invoice.voidedAt.toISOString().slice(0, 10) : null });
    await store.putOnce(key, pdf, 'application/pdf');
    if (kind === 'invoice') await InvoiceRow.update({ pdfObjectKey: key }, { where: { id: invoiceId } });
    return key;
  }

  async function ensureCustomer(institution: Institution): Promise<string> {
    if (institution.stripeCustomerId) return institution.stripeCustomerId;
    const customer = await stripe.customers.create(
      { name: institution.name, ...(institution.billingEmail ? { email: institution.billingEmail } : {}), metadata: { institutionId: institution.id } },
      { idempotencyKey: `localis-customer-${institution.id}` },
    );
    await Institution.update({ stripeCustomerId: customer.id }, { where: { id: institution.id } });
    return customer.id;
  }

  /** The invoice at Stripe, one item per line (its amount after discount and tax), finalized: its payment page. */
  async function ensureStripeInvoice(invoiceId: string): Promise<string> {
    const invoice = (await invoicesRepository.find(invoiceId))!;
    if (invoice.hostedPaymentUrl) return invoice.hostedPaymentUrl;
    if (Number(invoice.totalMinor) <= 0) throw errors.conflict(`Invoice ${invoice.number} has nothing to pay (its total is ${formatMinor(Number(invoice.totalMinor), invoice.currency)}).`);
    const institution = (await Institution.findByPk(invoice.institutionId))!;
    const customer = await ensureCustomer(institution);
    const key = (step: string) => `localis-invoice-${invoice.id}-${step}`;
    const created = await stripe.invoices.create(
      {
        customer,
        currency: invoice.currency.toLowerCase(),
        collection_method: 'send_invoice',
        days_until_due: Math.max(1, Math.round((Date.parse(invoice.dueOn!) - Date.parse(invoice.issuedOn!)) / 86_400_000)),
        metadata: { invoiceId: invoice.id, number: invoice.number!, return_url: `${settings.PUBLIC_URL}/invoices/${invoice.id}?paid=1` },
        auto_advance: false,
      },
      { idempotencyKey: key('create') },
    );
    for (const [i, line] of (invoice.lines as unknown as InvoiceLine[]).entries()) {
      await stripe.invoiceItems.create(
        { customer, invoice: created.id, currency: invoice.currency.toLowerCase(), amount: line.amountMinor - line.discountMinor + line.taxMinor, description: `${line.description} (${line.month})` },
        { idempotencyKey: key(`item-${i}`) },
      );
    }
    const finalized = await stripe.invoices.finalizeInvoice(created.id!, {}, { idempotencyKey: key('finalize') });
    if (finalized.total !== Number(invoice.totalMinor)) {
      throw errors.unavailable(`Stripe (its invoice totals ${finalized.total}, ours ${invoice.totalMinor})`);
    }
    await InvoiceRow.update({ stripeInvoiceId: finalized.id, hostedPaymentUrl: finalized.hosted_invoice_url ?? null, paymentState: 'pending' }, { where: { id: invoice.id } });
    return finalized.hosted_invoice_url!;
  }

  return {
    ensurePdf,
    paymentPage: ensureStripeInvoice,
    downloadUrl: (key: string, fileName: string) => store.downloadUrl(key, fileName),

    async afterIssue(invoiceId: string): Promise<void> {
      const pdfKey = await ensurePdf(invoiceId);
      const invoice = (await invoicesRepository.find(invoiceId))!;
      if (Number(invoice.totalMinor) > 0) await ensureStripeInvoice(invoiceId).catch(() => undefined); // the pay route asks again
      const to = await billingAddressesOf(invoice.institutionId);
      if (!to.length) return;
      const total = formatMinor(Number(invoice.totalMinor), invoice.currency);
      await db.transaction((tx) =>
        outboxRepository.enqueue(
          OUTBOX_KINDS.mail,
          {
            to,
            subject: `Invoice ${invoice.number}: ${total}, due ${invoice.dueOn}`,
            text: [
              `Invoice ${invoice.number} for the compute time your institution's campaigns used from ${invoice.periodFrom} to ${invoice.periodTo} is attached.`,
              `Total: ${total}, due on ${invoice.dueOn}. Payment reference: ${invoice.paymentReference}.`,
              `See and pay it in Localis: ${settings.PUBLIC_URL}/invoices/${invoice.id}`,
              '',
              'Amounts are computed from the consortium\u2019s core-hour ledger; this is not tax advice. The finance office and local law decide the tax treatment.',
            ].join('\n'),
            attachments: [{ filename: `${invoice.number}.pdf`, objectKey: pdfKey, contentType: 'application/pdf' }],
            dedupeKey: `invoice-issued-${invoice.id}`,
          },
          tx,
        ),
      );
    },

    async afterVoid(invoiceId: string): Promise<void> {
      const invoice = (await invoicesRepository.find(invoiceId))!;
      await ensurePdf(invoiceId, 'credit-note');
      if (invoice.stripeInvoiceId) await stripe.invoices.voidInvoice(invoice.stripeInvoiceId, {}, { idempotencyKey: `localis-invoice-${invoice.id}-void` });
    },
  };
}
export type InvoicePayments = ReturnType<typeof createInvoicePayments>;
