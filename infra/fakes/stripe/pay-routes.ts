import express, { type Response } from 'express';
import type { Billing } from './billing';
import type { FakeState, InvoiceRecord } from './fake-state';
import { notFoundPage, payFormPage, settledPage, type PayPageView } from './pay-page-html';
import { invoiceTotals } from './stripe-objects';
import { normalizeCardNumber, TEST_CARD_NUMBERS } from './test-cards';

/** Pages are self-contained: inline styles, no scripts, forms post only back here. */
const PAGE_HEADERS = {
  'Content-Security-Policy': "default-src 'none'; style-src 'unsafe-inline'; form-action 'self'; base-uri 'none'; frame-ancestors 'none'",
  'Cache-Control': 'no-store',
  'Referrer-Policy': 'no-referrer',
};

/**
 * The hosted payment page (`hosted_invoice_url`): no API key, the unguessable invoice id is the
 * access, as at Stripe. Paying redirects back to the page (303), so reloading never pays twice.
 */
export function payRouter(state: FakeState, billing: Billing): express.Router {
  const router = express.Router();

  const view = (invoice: InvoiceRecord, error?: string): PayPageView => ({
    invoice,
    customerName: state.customers.get(invoice.customer)?.name ?? null,
    lines: state.itemsOf(invoice.id).map((i) => ({ description: i.description, amount: i.amount })),
    amountDue: invoiceTotals(state, invoice.id).amountDue,
    error,
  });
  const html = (res: Response, status: number, body: string) => res.status(status).set(PAGE_HEADERS).type('html').send(body);
  /** Drafts have no hosted page yet at Stripe either. */
  const published = (id: string) => {
    const inv = state.invoices.get(id);
    return inv && inv.status !== 'draft' ? inv : undefined;
  };

  router.get('/:invoiceId', (req, res) => {
    const inv = published(req.params.invoiceId);
    if (!inv) return void html(res, 404, notFoundPage());
    html(res, 200, inv.status === 'open' ? payFormPage(view(inv)) : settledPage(view(inv)));
  });

  router.post('/:invoiceId', express.urlencoded({ extended: false, limit: '10kb' }), (req, res) => {
    const inv = published(req.params.invoiceId);
    if (!inv) return void html(res, 404, notFoundPage());
    if (inv.status !== 'open') return void html(res, 409, settledPage(view(inv)));
    const raw = typeof req.body?.card_number === 'string' ? req.body.card_number : '';
    const number = normalizeCardNumber(raw);
    if (!number) return void html(res, 422, payFormPage(view(inv, 'Enter a card number.')));
    const outcome = TEST_CARD_NUMBERS[number];
    if (!outcome) {
      return void html(res, 422, payFormPage(view(inv, 'This page takes test cards only. Use the test card 4242 4242 4242 4242.')));
    }
    billing.attemptPayment(inv.id, outcome, { id: null, idempotency_key: null }, { brand: 'visa', last4: number.slice(-4) });
    if (outcome === 'decline') {
      return void html(res, 402, payFormPage(view(inv, 'Your card was declined. Try again with another card.')));
    }
    res.redirect(303, req.originalUrl);
  });

  return router;
}
