import type { CustomerRecord, FakeState, InvoiceItemRecord, InvoiceRecord, PaymentIntentRecord } from './fake-state';

/**
 * Stripe's JSON shapes for the fake's records, as of the SDK's API version (Invoices carry their
 * payment intent under `payments.data[].payment.payment_intent`, not at the top level). Every
 * field the SDK's types declare is present; features the fake lacks (tax, discounts, shipping)
 * answer with their empty values.
 */
export type StripeObject = Record<string, unknown> & { id: string; object: string };

export interface StripeList {
  object: 'list';
  data: StripeObject[];
  has_more: boolean;
  url: string;
  total_count?: number;
}

/** The customer's invoice-number prefix: eight letters or digits derived from its id. */
export function invoicePrefix(customerId: string): string {
  return customerId.slice(4, 12).toUpperCase();
}

export function invoiceTotals(state: FakeState, invoiceId: string): { subtotal: number; total: number; amountDue: number } {
  const subtotal = state.itemsOf(invoiceId).reduce((sum, item) => sum + item.amount, 0);
  // A negative total is a credit to the customer; nothing is due.
  return { subtotal, total: subtotal, amountDue: Math.max(0, subtotal) };
}

export class StripeObjects {
  constructor(
    private readonly state: FakeState,
    /** Where browsers reach the fake: the hosted payment pages live there. */
    private readonly publicUrl: string,
  ) {}

  hostedInvoiceUrl(invoiceId: string): string {
    return `${this.publicUrl}/pay/${invoiceId}`;
  }

  customer(c: CustomerRecord): StripeObject {
    const count = this.state.invoiceCounts.get(c.id) ?? 0;
    return {
      id: c.id,
      object: 'customer',
      address: null,
      balance: 0,
      created: c.created,
      currency: null,
      customer_account: null,
      default_source: null,
      delinquent: false,
      description: c.description,
      discount: null,
      email: c.email,
      invoice_prefix: invoicePrefix(c.id),
      invoice_settings: { custom_fields: null, default_payment_method: null, footer: null, rendering_options: null },
      livemode: false,
      metadata: { ...c.metadata },
      name: c.name,
      next_invoice_sequence: count + 1,
      phone: c.phone,
      preferred_locales: [],
      shipping: null,
      tax_exempt: 'none',
      test_clock: null,
    };
  }

  invoiceItem(i: InvoiceItemRecord): StripeObject {
    return {
      id: i.id,
      object: 'invoiceitem',
      amount: i.amount,
      currency: i.currency,
      customer: i.customer,
      customer_account: null,
      date: i.created,
      description: i.description,
      discountable: true,
      discounts: [],
      invoice: i.invoice,
      livemode: false,
      metadata: { ...i.metadata },
      net_amount: i.amount,
      parent: null,
      period: { start: i.created, end: i.created },
      pricing: null,
      proration: false,
      quantity: 1,
      tax_rates: [],
      test_clock: null,
    };
  }

  /** The invoice's line for one invoice item (Stripe gives lines their own `il_` ids). */
  lineItem(i: InvoiceItemRecord): StripeObject {
    return {
      id: `il_${i.id.slice(3)}`,
      object: 'line_item',
      amount: i.amount,
      currency: i.currency,
      description: i.description,
      discount_amounts: [],
      discountable: true,
      discounts: [],
      invoice: i.invoice,
      livemode: false,
      metadata: { ...i.metadata },
      parent: {
        type: 'invoice_item_details',
        invoice_item_details: { invoice: i.invoice, invoice_item: i.id, proration: false, proration_details: { credited_items: null }, subscription: null },
        subscription_item_details: null,
      },
      period: { start: i.created, end: i.created },
      pretax_credit_amounts: [],
      pricing: null,
      quantity: 1,
      quantity_decimal: '1',
      subscription: null,
      subtotal: i.amount,
      taxes: [],
    };
  }

  lines(invoiceId: string): StripeList {
    const data = this.state.itemsOf(invoiceId).map((i) => this.lineItem(i));
    return { object: 'list', data, has_more: false, total_count: data.length, url: `/v1/invoices/${invoiceId}/lines` };
  }

  invoicePayment(inv: InvoiceRecord, pi: PaymentIntentRecord): StripeObject {
    const status = pi.status === 'succeeded' ? 'paid' : pi.status === 'canceled' ? 'canceled' : 'open';
    return {
      id: inv.invoice_payment!,
      object: 'invoice_payment',
      amount_paid: status === 'paid' ? pi.amount : null,
      amount_requested: pi.amount,
      created: pi.created,
      currency: pi.currency,
      invoice: inv.id,
      is_default: true,
      livemode: false,
      payment: { type: 'payment_intent', payment_intent: pi.id },
      status,
      status_transitions: { canceled_at: pi.canceled_at, paid_at: status === 'paid' ? inv.paid_at : null },
    };
  }

  invoice(inv: InvoiceRecord): StripeObject {
    const customer = this.state.customers.get(inv.customer);
    const { subtotal, total, amountDue } = invoiceTotals(this.state, inv.id);
    const amountPaid = inv.status === 'paid' ? amountDue : 0;
    const pi = inv.payment_intent ? this.state.paymentIntents.get(inv.payment_intent) : undefined;
    const payments = pi ? [this.invoicePayment(inv, pi)] : [];
    const finalized = inv.status !== 'draft';
    return {
      id: inv.id,
      object: 'invoice',
      account_country: null,
      account_name: null,
      account_tax_ids: null,
      amount_due: amountDue,
      amount_overpaid: 0,
      amount_paid: amountPaid,
      amount_remaining: inv.status === 'void' ? 0 : amountDue - amountPaid,
      amount_shipping: 0,
      application: null,
      attempt_count: inv.attempt_count,
      attempted: inv.attempt_count > 0,
      auto_advance: inv.auto_advance,
      automatic_tax: { disabled_reason: null, enabled: false, liability: null, provider: null, status: null },
      automatically_finalizes_at: null,
      billing_reason: 'manual',
      collection_method: inv.collection_method,
      confirmation_secret: pi && inv.status === 'open' ? { client_secret: pi.client_secret, type: 'payment_intent' } : null,
      created: inv.created,
      currency: inv.currency,
      custom_fields: null,
      customer: inv.customer,
      customer_account: null,
      customer_address: null,
      customer_email: customer?.email ?? null,
      customer_name: customer?.name ?? null,
      customer_phone: customer?.phone ?? null,
      customer_shipping: null,
      customer_tax_exempt: 'none',
      customer_tax_ids: [],
      default_payment_method: null,
      default_source: null,
      default_tax_rates: [],
      description: inv.description,
      discounts: [],
      due_date: inv.due_date,
      effective_at: inv.finalized_at,
      ending_balance: finalized ? 0 : null,
      footer: null,
      from_invoice: null,
      hosted_invoice_url: finalized ? this.hostedInvoiceUrl(inv.id) : null,
      invoice_pdf: null,
      issuer: { type: 'self' },
      last_finalization_error: null,
      latest_revision: null,
      lines: this.lines(inv.id),
      livemode: false,
      metadata: { ...inv.metadata },
      next_payment_attempt: null,
      number: inv.number,
      on_behalf_of: null,
      parent: null,
      payment_settings: { default_mandate: null, payment_method_options: null, payment_method_types: null },
      payments: { object: 'list', data: payments, has_more: false, total_count: payments.length, url: `/v1/invoice_payments?invoice=${inv.id}` },
      period_end: inv.created,
      period_start: inv.created,
      post_payment_credit_notes_amount: 0,
      pre_payment_credit_notes_amount: 0,
      receipt_number: null,
      rendering: null,
      shipping_cost: null,
      shipping_details: null,
      starting_balance: 0,
      statement_descriptor: null,
      status: inv.status,
      status_transitions: { finalized_at: inv.finalized_at, marked_uncollectible_at: null, paid_at: inv.paid_at, voided_at: inv.voided_at },
      subtotal,
      subtotal_excluding_tax: subtotal,
      test_clock: null,
      total,
      total_discount_amounts: [],
      total_excluding_tax: total,
      total_pretax_credit_amounts: [],
      total_taxes: [],
      webhooks_delivered_at: inv.finalized_at,
    };
  }

  paymentIntent(pi: PaymentIntentRecord): StripeObject {
    return {
      id: pi.id,
      object: 'payment_intent',
      allowed_payment_method_types: null,
      amount: pi.amount,
      amount_capturable: 0,
      amount_received: pi.status === 'succeeded' ? pi.amount : 0,
      application: null,
      application_fee_amount: null,
      automatic_payment_methods: null,
      canceled_at: pi.canceled_at,
      cancellation_reason: pi.status === 'canceled' ? 'void_invoice' : null,
      capture_method: 'automatic',
      client_secret: pi.client_secret,
      confirmation_method: 'automatic',
      created: pi.created,
      currency: pi.currency,
      customer: pi.customer,
      customer_account: null,
      description: 'Payment for Invoice',
      excluded_payment_method_types: null,
      last_payment_error: pi.last_payment_error,
      latest_charge: pi.latest_charge,
      livemode: false,
      managed_payments: null,
      metadata: {},
      next_action: null,
      on_behalf_of: null,
      payment_method: pi.payment_method,
      payment_method_configuration_details: null,
      payment_method_options: null,
      payment_method_types: ['card'],
      payment_record: null,
      processing: null,
      receipt_email: null,
      review: null,
      setup_future_usage: null,
      shipping: null,
      source: null,
      statement_descriptor: null,
      statement_descriptor_suffix: null,
      status: pi.status,
      transfer_data: null,
      transfer_group: null,
    };
  }

  /** Any object the fake keeps, by id (for `expand`). */
  byId(id: string): StripeObject | undefined {
    const customer = this.state.customers.get(id);
    if (customer) return this.customer(customer);
    const invoice = this.state.invoices.get(id);
    if (invoice) return this.invoice(invoice);
    const pi = this.state.paymentIntents.get(id);
    if (pi) return this.paymentIntent(pi);
    const item = this.state.invoiceItems.get(id);
    if (item) return this.invoiceItem(item);
    return undefined;
  }
}
