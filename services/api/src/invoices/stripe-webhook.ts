import type Stripe from 'stripe';
import { UniqueConstraintError } from 'sequelize';
import { errors } from '@localis/shared';
import type { Database } from '../db';
import { InvoiceRow, StripeEventRow } from '../db/models';
import { auditService, SYSTEM_CONTEXT } from '../audit/audit.service';

/** Events that change an invoice; every other type is accepted and ignored. */
const HANDLED = new Set(['invoice.paid', 'invoice.payment_failed', 'invoice.voided']);

/**
 * Stripe's webhook: the signature is checked on the raw body with the SDK's own helper (a bad or
 * missing one is refused with nothing changed), each event id is processed once (a duplicate is
 * answered as done), and events act on the invoice's state, never against it: a late
 * `payment_failed` after `paid` changes nothing, so the order of delivery does not matter.
 */
export function createStripeWebhook(db: Database, stripe: Stripe, webhookSecret: string) {
  return async function receive(rawBody: Buffer, signature: string | undefined): Promise<{ received: true; duplicate?: true; ignored?: true }> {
    let event: Stripe.Event;
    try {
      if (!signature) throw new Error('there is no Stripe-Signature header');
      event = stripe.webhooks.constructEvent(rawBody, signature, webhookSecret);
    } catch (e) {
      throw errors.malformed(`The webhook's signature does not verify (${(e as Error).message}).`);
    }
    return db.transaction(async (tx) => {
      try {
        await StripeEventRow.create({ id: event.id, type: event.type, createdAt: new Date(event.created * 1000) }, { transaction: tx });
      } catch (e) {
        if (e instanceof UniqueConstraintError) return { received: true as const, duplicate: true as const };
        throw e;
      }
      if (!HANDLED.has(event.type)) return { received: true as const, ignored: true as const };
      const object = event.data.object as { id?: string; metadata?: Record<string, string> };
      const invoice = await InvoiceRow.findOne({ where: { stripeInvoiceId: object.id ?? '' }, transaction: tx, lock: tx.LOCK.UPDATE });
      if (!invoice) return { received: true as const, ignored: true as const };
      if (event.type === 'invoice.paid' && invoice.state === 'issued') {
        await invoice.update({ state: 'paid', paidAt: new Date(event.created * 1000), paymentState: 'succeeded' }, { transaction: tx });
        await auditService.record(SYSTEM_CONTEXT, 'invoice.paid', { type: 'invoice', id: invoice.id }, { number: invoice.number, stripeEvent: event.id }, tx);
      } else if (event.type === 'invoice.payment_failed' && invoice.state === 'issued') {
        await invoice.update({ paymentState: 'failed' }, { transaction: tx });
      }
      return { received: true as const };
    });
  };
}
export type StripeWebhook = ReturnType<typeof createStripeWebhook>;
