import type { Invoice, Role } from '@localis/shared';

/** What a reader may do with one invoice. The api decides again; this only hides what would fail. */
export interface InvoiceActions {
  /** Give a draft its number and send it (the office). */
  issue: boolean;
  /** Cancel an issued invoice with a credit note (the office). */
  void: boolean;
  /** Pay an issued invoice through the payment provider (its billing contacts and the office). */
  pay: boolean;
  /** Download the stored PDF (whoever sees the invoice). */
  pdf: boolean;
}

export function invoiceActions(roles: readonly Role[], invoice: Pick<Invoice, 'state' | 'hasPdf' | 'paymentState'>): InvoiceActions {
  const office = roles.includes('admin');
  const payer = office || roles.includes('billing');
  return {
    issue: office && invoice.state === 'draft',
    void: office && invoice.state === 'issued',
    // A payment the provider reported as made is waiting for its confirmation: not paid twice.
    pay: payer && invoice.state === 'issued' && invoice.paymentState !== 'succeeded',
    pdf: invoice.hasPdf,
  };
}
