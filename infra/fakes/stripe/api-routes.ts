import express, { type NextFunction, type Request, type Response } from 'express';
import type { Billing, RequestContext } from './billing';
import type { FakeState } from './fake-state';
import type { IdempotencyStore } from './idempotency';
import { newId } from './ids';
import { expandObject, listPage } from './list-and-expand';
import {
  expandPaths,
  mergedMetadata,
  optionalBoolean,
  optionalCurrency,
  optionalEnum,
  optionalInteger,
  optionalString,
  paramsOf,
  requiredInteger,
  requiredString,
  type Params,
} from './params';
import { authenticationError, invalidRequest, noSuch, StripeFakeError } from './stripe-errors';
import type { StripeObject, StripeObjects } from './stripe-objects';
import { TEST_PAYMENT_METHODS } from './test-cards';

export interface ApiDeps {
  secretKey: string;
  state: FakeState;
  objects: StripeObjects;
  billing: Billing;
  idempotency: IdempotencyStore;
}

/** Shown as Stripe shows keys in errors: the start and the last four characters. */
function redactKey(key: string): string {
  return key.length <= 12 ? '*'.repeat(key.length) : `${key.slice(0, 8)}${'*'.repeat(key.length - 12)}${key.slice(-4)}`;
}

/** The key from `Authorization: Bearer sk_…`, or from Basic auth (the key as user name, as curl -u sends it). */
function presentedKey(header: string): string | undefined {
  const bearer = /^Bearer\s+(\S+)\s*$/i.exec(header);
  if (bearer) return bearer[1];
  const basic = /^Basic\s+(\S+)\s*$/i.exec(header);
  if (basic) return Buffer.from(basic[1], 'base64').toString('utf8').split(':')[0] || undefined;
  return undefined;
}

function authenticate(secretKey: string) {
  return (req: Request, _res: Response, next: NextFunction): void => {
    const key = presentedKey(req.get('Authorization') ?? '');
    if (!key) {
      throw authenticationError("You did not provide an API key. You need to provide your API key in the Authorization header, using Bearer auth (e.g. 'Authorization: Bearer YOUR_SECRET_KEY').");
    }
    if (key !== secretKey) throw authenticationError(`Invalid API Key provided: ${redactKey(key)}`);
    next();
  };
}

/** Stripe-shaped answers for every failure under /v1, including unparsable bodies. */
export function stripeErrorHandler(err: unknown, _req: Request, res: Response, _next: NextFunction): void {
  if (err instanceof StripeFakeError) {
    res.status(err.status).json(err.toBody());
    return;
  }
  const status = (err as { status?: number }).status;
  if (typeof status === 'number' && status >= 400 && status < 500) {
    res.status(400).json(invalidRequest(`Invalid request: ${(err as Error).message}`).toBody());
    return;
  }
  console.error('stripe fake error:', err);
  res.status(500).json(new StripeFakeError(500, 'api_error', 'The local Stripe fake failed; see its log.').toBody());
}

export function apiRouter(deps: ApiDeps): express.Router {
  const { billing, objects, state } = deps;
  const router = express.Router();

  router.use((_req, res, next) => {
    res.locals.requestId = newId('req');
    res.set('Request-Id', res.locals.requestId);
    next();
  });
  router.use(authenticate(deps.secretKey));
  router.use(express.urlencoded({ extended: true, limit: '1mb' }));
  router.use(deps.idempotency.middleware());

  const ctx = (req: Request, res: Response): RequestContext => ({ id: res.locals.requestId as string, idempotency_key: req.get('Idempotency-Key') ?? null });
  const input = (req: Request, allowed: readonly string[]): Params => paramsOf(req.method === 'GET' ? req.query : req.body, allowed);
  const send = (res: Response, obj: object, p: Params) => res.json(expandObject(obj, expandPaths(p), (id) => objects.byId(id)));
  const page = (all: StripeObject[], p: Params, url: string) => listPage(all, p, url);
  const LIST = ['limit', 'starting_after', 'ending_before'] as const;

  // Customers
  const CUSTOMER_FIELDS = ['email', 'name', 'description', 'phone', 'metadata'] as const;
  router.post('/customers', (req, res) => {
    const p = input(req, CUSTOMER_FIELDS);
    const c = billing.createCustomer(
      {
        email: optionalString(p, 'email') ?? null,
        name: optionalString(p, 'name') ?? null,
        description: optionalString(p, 'description') ?? null,
        phone: optionalString(p, 'phone') ?? null,
        metadata: mergedMetadata(p),
      },
      ctx(req, res),
    );
    send(res, objects.customer(c), p);
  });
  router.get('/customers', (req, res) => {
    const p = input(req, ['email', ...LIST]);
    const email = optionalString(p, 'email');
    const all = [...state.customers.values()].filter((c) => email === undefined || c.email === email).map((c) => objects.customer(c));
    send(res, page(all, p, '/v1/customers'), p);
  });
  router.get('/customers/:id', (req, res) => {
    const p = input(req, []);
    send(res, objects.customer(billing.customer(req.params.id)), p);
  });
  router.post('/customers/:id', (req, res) => {
    const p = input(req, CUSTOMER_FIELDS);
    const current = billing.customer(req.params.id);
    const changes: Record<string, unknown> = {};
    for (const field of ['email', 'name', 'description', 'phone'] as const) {
      const v = optionalString(p, field);
      if (v !== undefined) changes[field] = v === '' ? null : v;
    }
    if (p.metadata !== undefined) changes.metadata = mergedMetadata(p, current.metadata);
    send(res, objects.customer(billing.updateCustomer(current.id, changes, ctx(req, res))), p);
  });

  // Invoice items
  router.post('/invoiceitems', (req, res) => {
    const p = input(req, ['customer', 'amount', 'currency', 'description', 'invoice', 'metadata']);
    const item = billing.createInvoiceItem(
      {
        customer: requiredString(p, 'customer'),
        amount: requiredInteger(p, 'amount'),
        currency: optionalCurrency(p, 'currency'),
        description: optionalString(p, 'description') ?? null,
        invoice: optionalString(p, 'invoice'),
        metadata: mergedMetadata(p),
      },
      ctx(req, res),
    );
    send(res, objects.invoiceItem(item), p);
  });
  router.get('/invoiceitems', (req, res) => {
    const p = input(req, ['customer', 'invoice', 'pending', ...LIST]);
    const customer = optionalString(p, 'customer');
    const invoice = optionalString(p, 'invoice');
    const pending = optionalBoolean(p, 'pending');
    const all = [...state.invoiceItems.values()]
      .filter((i) => (customer === undefined || i.customer === customer) && (invoice === undefined || i.invoice === invoice))
      .filter((i) => pending === undefined || (i.invoice === null) === pending)
      .map((i) => objects.invoiceItem(i));
    send(res, page(all, p, '/v1/invoiceitems'), p);
  });
  router.get('/invoiceitems/:id', (req, res) => {
    const p = input(req, []);
    send(res, objects.invoiceItem(billing.invoiceItem(req.params.id)), p);
  });

  // Invoices
  router.post('/invoices', (req, res) => {
    const p = input(req, ['customer', 'collection_method', 'currency', 'metadata', 'auto_advance', 'days_until_due', 'due_date', 'description', 'pending_invoice_items_behavior']);
    const inv = billing.createInvoice(
      {
        customer: requiredString(p, 'customer'),
        collection_method: optionalEnum(p, 'collection_method', ['charge_automatically', 'send_invoice'] as const) ?? 'charge_automatically',
        // Stripe falls back to the account's currency; the fake's account is a US one.
        currency: optionalCurrency(p, 'currency') ?? 'usd',
        metadata: mergedMetadata(p),
        auto_advance: optionalBoolean(p, 'auto_advance') ?? false,
        days_until_due: optionalInteger(p, 'days_until_due'),
        due_date: optionalInteger(p, 'due_date'),
        description: optionalString(p, 'description') ?? null,
        includePendingItems: optionalEnum(p, 'pending_invoice_items_behavior', ['include', 'exclude'] as const) === 'include',
      },
      ctx(req, res),
    );
    send(res, objects.invoice(inv), p);
  });
  router.get('/invoices', (req, res) => {
    const p = input(req, ['customer', 'status', 'collection_method', ...LIST]);
    const customer = optionalString(p, 'customer');
    const status = optionalEnum(p, 'status', ['draft', 'open', 'paid', 'uncollectible', 'void'] as const);
    const method = optionalEnum(p, 'collection_method', ['charge_automatically', 'send_invoice'] as const);
    const all = [...state.invoices.values()]
      .filter((i) => (customer === undefined || i.customer === customer) && (status === undefined || i.status === status))
      .filter((i) => method === undefined || i.collection_method === method)
      .map((i) => objects.invoice(i));
    send(res, page(all, p, '/v1/invoices'), p);
  });
  router.get('/invoices/:id', (req, res) => {
    const p = input(req, []);
    send(res, objects.invoice(billing.invoice(req.params.id)), p);
  });
  router.post('/invoices/:id', (req, res) => {
    const p = input(req, ['metadata', 'description', 'auto_advance']);
    const current = billing.invoice(req.params.id);
    const changes: Record<string, unknown> = {};
    if (p.metadata !== undefined) changes.metadata = mergedMetadata(p, current.metadata);
    const description = optionalString(p, 'description');
    if (description !== undefined) changes.description = description === '' ? null : description;
    const autoAdvance = optionalBoolean(p, 'auto_advance');
    if (autoAdvance !== undefined) changes.auto_advance = autoAdvance;
    send(res, objects.invoice(billing.updateInvoice(current.id, changes, ctx(req, res))), p);
  });
  router.get('/invoices/:id/lines', (req, res) => {
    const p = input(req, [...LIST]);
    const inv = billing.invoice(req.params.id);
    // Lines list oldest first at Stripe; listPage lists newest first, so hand them over reversed.
    send(res, page(objects.lines(inv.id).data.reverse(), p, `/v1/invoices/${inv.id}/lines`), p);
  });
  router.post('/invoices/:id/finalize', (req, res) => {
    const p = input(req, ['auto_advance']);
    send(res, objects.invoice(billing.finalize(req.params.id, ctx(req, res), optionalBoolean(p, 'auto_advance'))), p);
  });
  router.post('/invoices/:id/pay', (req, res) => {
    const p = input(req, ['payment_method', 'source', 'off_session']);
    optionalBoolean(p, 'off_session');
    const inv = billing.invoice(req.params.id);
    if (inv.status !== 'draft') billing.assertPayable(inv);
    const param = p.payment_method !== undefined ? 'payment_method' : 'source';
    const method = optionalString(p, param);
    if (!method) {
      throw invalidRequest('This customer has no attached payment source or default payment method. Pass a test payment method such as pm_card_visa.', { param: 'payment_method' });
    }
    const outcome = TEST_PAYMENT_METHODS[method];
    if (!outcome) throw noSuch(param === 'source' || method.startsWith('tok_') ? 'source' : 'PaymentMethod', method, param);
    // Stripe finalizes a draft before it attempts payment; with nothing due that already pays it.
    if (inv.status === 'draft') billing.finalize(inv.id, ctx(req, res));
    if (inv.status === 'paid') {
      send(res, objects.invoice(inv), p);
      return;
    }
    const card = outcome === 'succeed' ? { brand: 'visa', last4: '4242' } : { brand: 'visa', last4: '0002' };
    const result = billing.attemptPayment(inv.id, outcome, ctx(req, res), card);
    if (outcome === 'decline') throw billing.declineError(result.paymentIntent);
    send(res, objects.invoice(result.invoice), p);
  });
  router.post('/invoices/:id/void', (req, res) => {
    const p = input(req, []);
    send(res, objects.invoice(billing.void(req.params.id, ctx(req, res))), p);
  });

  // Payment intents
  router.get('/payment_intents/:id', (req, res) => {
    const p = input(req, ['client_secret']);
    send(res, objects.paymentIntent(billing.paymentIntent(req.params.id)), p);
  });

  router.use((req) => {
    throw new StripeFakeError(404, 'invalid_request_error', `Unrecognized request URL (${req.method}: ${req.baseUrl}${req.path}). The local Stripe fake answers a small part of the API (see infra/fakes/stripe).`);
  });
  router.use(stripeErrorHandler);
  return router;
}
