/**
 * What the fake remembers: in memory, saved to its data file when it has one (`state-file.ts`),
 * forgotten on `POST /_fake/reset`. Records hold the fake's own facts; `stripe-objects.ts` renders them in Stripe's shapes, so
 * derived values (totals, line items) are always computed from the current items.
 */
export interface CustomerRecord {
  id: string;
  created: number;
  email: string | null;
  name: string | null;
  description: string | null;
  phone: string | null;
  metadata: Record<string, string>;
}

export interface InvoiceItemRecord {
  id: string;
  created: number;
  customer: string;
  amount: number;
  currency: string;
  description: string | null;
  /** null while pending (not yet on an invoice). */
  invoice: string | null;
  metadata: Record<string, string>;
}

export type InvoiceStatus = 'draft' | 'open' | 'paid' | 'void';

export interface InvoiceRecord {
  id: string;
  created: number;
  customer: string;
  currency: string;
  collection_method: 'charge_automatically' | 'send_invoice';
  auto_advance: boolean;
  days_until_due: number | null;
  due_date: number | null;
  description: string | null;
  metadata: Record<string, string>;
  status: InvoiceStatus;
  number: string | null;
  finalized_at: number | null;
  paid_at: number | null;
  voided_at: number | null;
  attempt_count: number;
  /** Set when the invoice is finalized with something to pay. */
  payment_intent: string | null;
  /** The invoice payment that ties the payment intent to the invoice (Stripe's `inpay_…`). */
  invoice_payment: string | null;
}

export type PaymentIntentStatus = 'requires_payment_method' | 'succeeded' | 'canceled';

export interface PaymentIntentRecord {
  id: string;
  created: number;
  amount: number;
  currency: string;
  customer: string;
  invoice: string;
  status: PaymentIntentStatus;
  client_secret: string;
  payment_method: string | null;
  latest_charge: string | null;
  last_payment_error: Record<string, unknown> | null;
  canceled_at: number | null;
}

/** The records as plain lists, oldest first (list pages rely on that order). */
export interface StateRecords {
  customers: CustomerRecord[];
  invoiceItems: InvoiceItemRecord[];
  invoices: InvoiceRecord[];
  paymentIntents: PaymentIntentRecord[];
  /** Per customer id: how many of its invoices were numbered. */
  invoiceCounts: Record<string, number>;
}

export class FakeState {
  readonly customers = new Map<string, CustomerRecord>();
  readonly invoiceItems = new Map<string, InvoiceItemRecord>();
  readonly invoices = new Map<string, InvoiceRecord>();
  readonly paymentIntents = new Map<string, PaymentIntentRecord>();
  /** Invoice numbers run per customer, as Stripe's do. */
  readonly invoiceCounts = new Map<string, number>();

  itemsOf(invoiceId: string): InvoiceItemRecord[] {
    return [...this.invoiceItems.values()].filter((i) => i.invoice === invoiceId);
  }

  /** The live records, not copies: serialize them at once. */
  snapshot(): StateRecords {
    return {
      customers: [...this.customers.values()],
      invoiceItems: [...this.invoiceItems.values()],
      invoices: [...this.invoices.values()],
      paymentIntents: [...this.paymentIntents.values()],
      invoiceCounts: Object.fromEntries(this.invoiceCounts),
    };
  }

  restore(records: StateRecords): void {
    this.reset();
    for (const c of records.customers) this.customers.set(c.id, c);
    for (const i of records.invoiceItems) this.invoiceItems.set(i.id, i);
    for (const inv of records.invoices) this.invoices.set(inv.id, inv);
    for (const pi of records.paymentIntents) this.paymentIntents.set(pi.id, pi);
    for (const [customer, count] of Object.entries(records.invoiceCounts)) this.invoiceCounts.set(customer, count);
  }

  reset(): void {
    this.customers.clear();
    this.invoiceItems.clear();
    this.invoices.clear();
    this.paymentIntents.clear();
    this.invoiceCounts.clear();
  }
}
