import type { CustomerRecord, FakeState, InvoiceItemRecord, InvoiceRecord, PaymentIntentRecord } from './fake-state';
import { newId, nowSeconds } from './ids';
import { invalidRequest, noSuch, StripeFakeError } from './stripe-errors';
import { invoicePrefix, invoiceTotals, type StripeObjects } from './stripe-objects';
import type { CardOutcome } from './test-cards';
import type { StripeEvent, WebhookSender } from './webhook-sender';

export type RequestContext = StripeEvent['request'];

/** Account-wide default payment terms for `send_invoice` invoices without their own. */
const DEFAULT_DAYS_UNTIL_DUE = 30;
const DAY = 86_400;

/** The previous values of changed fields, as `*.updated` events carry them (metadata per key). */
function previousAttributes(before: Record<string, unknown>, after: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const key of Object.keys(after)) {
    if (key === 'metadata') {
      const old = before.metadata as Record<string, string>;
      const now = after.metadata as Record<string, string>;
      const changed: Record<string, string | null> = {};
      for (const k of new Set([...Object.keys(old), ...Object.keys(now)])) if (old[k] !== now[k]) changed[k] = old[k] ?? null;
      if (Object.keys(changed).length) out.metadata = changed;
    } else if (JSON.stringify(before[key]) !== JSON.stringify(after[key])) {
      out[key] = before[key];
    }
  }
  return out;
}

/**
 * The invoice life cycle: draft → open (finalize) → paid or void, with its payment intent and the
 * events Stripe sends on the way. Shared by the API routes and the hosted payment page.
 */
export class Billing {
  constructor(
    private readonly state: FakeState,
    private readonly objects: StripeObjects,
    private readonly webhooks: WebhookSender,
  ) {}

  customer(id: string, param?: string): CustomerRecord {
    const c = this.state.customers.get(id);
    if (!c) throw noSuch('customer', id, param);
    return c;
  }

  invoice(id: string, param?: string): InvoiceRecord {
    const inv = this.state.invoices.get(id);
    if (!inv) throw noSuch('invoice', id, param);
    return inv;
  }

  invoiceItem(id: string): InvoiceItemRecord {
    const item = this.state.invoiceItems.get(id);
    if (!item) throw noSuch('invoiceitem', id);
    return item;
  }

  paymentIntent(id: string): PaymentIntentRecord {
    const pi = this.state.paymentIntents.get(id);
    if (!pi) throw noSuch('payment_intent', id);
    return pi;
  }

  createCustomer(fields: Omit<CustomerRecord, 'id' | 'created'>, ctx: RequestContext): CustomerRecord {
    const c: CustomerRecord = { id: newId('cus'), created: nowSeconds(), ...fields };
    this.state.customers.set(c.id, c);
    this.webhooks.publish('customer.created', this.objects.customer(c), { request: ctx });
    return c;
  }

  updateCustomer(id: string, changes: Partial<Omit<CustomerRecord, 'id' | 'created'>>, ctx: RequestContext): CustomerRecord {
    const c = this.customer(id);
    const before = { ...c };
    Object.assign(c, changes);
    const previous = previousAttributes(before, changes as Record<string, unknown>);
    if (Object.keys(previous).length) this.webhooks.publish('customer.updated', this.objects.customer(c), { previous_attributes: previous, request: ctx });
    return c;
  }

  createInvoiceItem(fields: { customer: string; amount: number; currency?: string; description: string | null; invoice?: string; metadata: Record<string, string> }, ctx: RequestContext): InvoiceItemRecord {
    this.customer(fields.customer, 'customer');
    let currency = fields.currency;
    if (fields.invoice !== undefined) {
      const inv = this.invoice(fields.invoice, 'invoice');
      if (inv.customer !== fields.customer) throw invalidRequest(`Invoice ${inv.id} belongs to another customer than ${fields.customer}.`, { param: 'invoice' });
      if (inv.status !== 'draft') throw invalidRequest('You can only add invoice items to draft invoices.', { code: 'invoice_not_editable', param: 'invoice' });
      currency ??= inv.currency;
      if (currency !== inv.currency) {
        throw invalidRequest(`The currency of the invoice item (${currency}) does not match the invoice's currency (${inv.currency}).`, { param: 'currency' });
      }
    }
    if (currency === undefined) throw invalidRequest('Missing required param: currency.', { code: 'parameter_missing', param: 'currency' });
    const item: InvoiceItemRecord = {
      id: newId('ii'),
      created: nowSeconds(),
      customer: fields.customer,
      amount: fields.amount,
      currency,
      description: fields.description,
      invoice: fields.invoice ?? null,
      metadata: fields.metadata,
    };
    this.state.invoiceItems.set(item.id, item);
    this.webhooks.publish('invoiceitem.created', this.objects.invoiceItem(item), { request: ctx });
    return item;
  }

  createInvoice(
    fields: Pick<InvoiceRecord, 'customer' | 'currency' | 'collection_method' | 'auto_advance' | 'description' | 'metadata'> & {
      days_until_due?: number;
      due_date?: number;
      includePendingItems: boolean;
    },
    ctx: RequestContext,
  ): InvoiceRecord {
    this.customer(fields.customer, 'customer');
    const sendInvoice = fields.collection_method === 'send_invoice';
    if (!sendInvoice && (fields.days_until_due !== undefined || fields.due_date !== undefined)) {
      const param = fields.days_until_due !== undefined ? 'days_until_due' : 'due_date';
      throw invalidRequest(`You can only set \`${param}\` if \`collection_method\` is \`send_invoice\`.`, { param });
    }
    if (fields.days_until_due !== undefined && fields.due_date !== undefined) {
      throw invalidRequest('You cannot set both `days_until_due` and `due_date`.', { param: 'due_date' });
    }
    const created = nowSeconds();
    const daysUntilDue = sendInvoice && fields.due_date === undefined ? (fields.days_until_due ?? DEFAULT_DAYS_UNTIL_DUE) : null;
    const inv: InvoiceRecord = {
      id: newId('in'),
      created,
      customer: fields.customer,
      currency: fields.currency,
      collection_method: fields.collection_method,
      auto_advance: fields.auto_advance,
      days_until_due: daysUntilDue,
      due_date: fields.due_date ?? (daysUntilDue !== null ? created + daysUntilDue * DAY : null),
      description: fields.description,
      metadata: fields.metadata,
      status: 'draft',
      number: null,
      finalized_at: null,
      paid_at: null,
      voided_at: null,
      attempt_count: 0,
      payment_intent: null,
      invoice_payment: null,
    };
    this.state.invoices.set(inv.id, inv);
    if (fields.includePendingItems) {
      for (const item of this.state.invoiceItems.values()) {
        if (item.customer === inv.customer && item.invoice === null && item.currency === inv.currency) item.invoice = inv.id;
      }
    }
    this.webhooks.publish('invoice.created', this.objects.invoice(inv), { request: ctx });
    return inv;
  }

  updateInvoice(id: string, changes: Partial<Pick<InvoiceRecord, 'metadata' | 'description' | 'auto_advance'>>, ctx: RequestContext): InvoiceRecord {
    const inv = this.invoice(id);
    const before = { ...inv };
    Object.assign(inv, changes);
    const previous = previousAttributes(before, changes as Record<string, unknown>);
    if (Object.keys(previous).length) this.webhooks.publish('invoice.updated', this.objects.invoice(inv), { previous_attributes: previous, request: ctx });
    return inv;
  }

  /** Draft → open: a number, the hosted page and a payment intent; nothing due → paid at once. */
  finalize(id: string, ctx: RequestContext, autoAdvance?: boolean): InvoiceRecord {
    const inv = this.invoice(id);
    if (inv.status !== 'draft') {
      throw invalidRequest("This invoice is already finalized, you can't re-finalize a non-draft invoice.", { code: 'status_transition_invalid' });
    }
    const now = nowSeconds();
    const sequence = (this.state.invoiceCounts.get(inv.customer) ?? 0) + 1;
    this.state.invoiceCounts.set(inv.customer, sequence);
    inv.number = `${invoicePrefix(inv.customer)}-${String(sequence).padStart(4, '0')}`;
    inv.status = 'open';
    inv.finalized_at = now;
    if (autoAdvance !== undefined) inv.auto_advance = autoAdvance;
    if (inv.days_until_due !== null) inv.due_date = now + inv.days_until_due * DAY;
    const { amountDue } = invoiceTotals(this.state, inv.id);
    if (amountDue === 0) {
      inv.status = 'paid';
      inv.paid_at = now;
      this.webhooks.publish('invoice.finalized', this.objects.invoice(inv), { request: ctx });
      this.publishPaid(inv, ctx);
      return inv;
    }
    const pi: PaymentIntentRecord = {
      id: newId('pi'),
      created: now,
      amount: amountDue,
      currency: inv.currency,
      customer: inv.customer,
      invoice: inv.id,
      status: 'requires_payment_method',
      client_secret: '',
      payment_method: null,
      latest_charge: null,
      last_payment_error: null,
      canceled_at: null,
    };
    pi.client_secret = `${pi.id}_secret_${newId('x').slice(2)}`;
    this.state.paymentIntents.set(pi.id, pi);
    inv.payment_intent = pi.id;
    inv.invoice_payment = newId('inpay');
    this.webhooks.publish('payment_intent.created', this.objects.paymentIntent(pi), { request: ctx });
    this.webhooks.publish('invoice.finalized', this.objects.invoice(inv), { request: ctx });
    return inv;
  }

  /** Only open invoices take payments; the message says why another one does not. */
  assertPayable(inv: InvoiceRecord): void {
    if (inv.status === 'open') return;
    const message =
      inv.status === 'paid' ? 'Invoice is already paid' : inv.status === 'void' ? 'This invoice is void and can no longer be paid.' : 'This invoice is a draft; finalize it before paying.';
    throw invalidRequest(message, { code: 'invoice_not_open' });
  }

  /** One payment attempt on an open invoice with a test card's outcome. */
  attemptPayment(id: string, outcome: CardOutcome, ctx: RequestContext, card: { brand: string; last4: string }): { invoice: InvoiceRecord; paymentIntent: PaymentIntentRecord } {
    const inv = this.invoice(id);
    this.assertPayable(inv);
    const pi = this.paymentIntent(inv.payment_intent!);
    const now = nowSeconds();
    const paymentMethod = newId('pm');
    inv.attempt_count += 1;
    if (outcome === 'succeed') {
      pi.status = 'succeeded';
      pi.payment_method = paymentMethod;
      pi.latest_charge = newId('ch');
      pi.last_payment_error = null;
      inv.status = 'paid';
      inv.paid_at = now;
      this.webhooks.publish('payment_intent.succeeded', this.objects.paymentIntent(pi), { request: ctx });
      this.publishPaid(inv, ctx);
    } else {
      // After a decline Stripe's payment intent waits for another payment method.
      pi.status = 'requires_payment_method';
      pi.payment_method = null;
      pi.last_payment_error = {
        type: 'card_error',
        code: 'card_declined',
        decline_code: 'generic_decline',
        message: 'Your card was declined.',
        charge: newId('ch'),
        payment_method: { id: paymentMethod, object: 'payment_method', type: 'card', card: { brand: card.brand, last4: card.last4 } },
      };
      this.webhooks.publish('payment_intent.payment_failed', this.objects.paymentIntent(pi), { request: ctx });
      this.webhooks.publish('invoice.payment_failed', this.objects.invoice(inv), { request: ctx });
    }
    return { invoice: inv, paymentIntent: pi };
  }

  /** The 402 Stripe answers a declined `invoices.pay` with. */
  declineError(pi: PaymentIntentRecord): StripeFakeError {
    return new StripeFakeError(402, 'card_error', 'Your card was declined.', {
      code: 'card_declined',
      decline_code: 'generic_decline',
      payment_intent: this.objects.paymentIntent(pi),
    });
  }

  void(id: string, ctx: RequestContext): InvoiceRecord {
    const inv = this.invoice(id);
    if (inv.status === 'draft') throw invalidRequest('You can only void a finalized invoice.', { code: 'status_transition_invalid' });
    if (inv.status !== 'open') throw invalidRequest(`You cannot void an invoice that is ${inv.status}.`, { code: 'status_transition_invalid' });
    const now = nowSeconds();
    inv.status = 'void';
    inv.voided_at = now;
    const pi = inv.payment_intent ? this.state.paymentIntents.get(inv.payment_intent) : undefined;
    if (pi) {
      pi.status = 'canceled';
      pi.canceled_at = now;
      this.webhooks.publish('payment_intent.canceled', this.objects.paymentIntent(pi), { request: ctx });
    }
    this.webhooks.publish('invoice.voided', this.objects.invoice(inv), { request: ctx });
    return inv;
  }

  private publishPaid(inv: InvoiceRecord, ctx: RequestContext): void {
    const snapshot = this.objects.invoice(inv);
    this.webhooks.publish('invoice.paid', snapshot, { request: ctx });
    this.webhooks.publish('invoice.payment_succeeded', snapshot, { request: ctx });
  }
}
