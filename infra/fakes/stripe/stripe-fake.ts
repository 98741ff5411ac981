/**
 * A small Stripe-compatible server for local runs and tests: customers, invoice items, invoices
 * (finalize, pay, void), payment intents, a hosted payment page and signed webhooks, in memory
 * and, given a `dataFile`, saved there after every change and read back at the next start.
 *
 * Why our own: no well-known package runs a stateful Stripe stand-in on Node 20 offline (Stripe's
 * own mock server answers canned, stateless responses and ships as a Go binary; the stateful
 * stand-ins that exist need other runtimes). This one covers what Localis invoicing uses and
 * answers like Stripe's API version of the installed SDK, checked by tests through that SDK.
 *
 * Routes: `/v1/...` (the API, `Authorization: Bearer <secretKey>`, form-encoded bodies),
 * `/pay/:invoiceId` (the hosted page), `/_fake/...` (test controls, loopback only).
 */
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import express, { type RequestHandler } from 'express';
import { apiRouter } from './api-routes';
import { Billing } from './billing';
import { controlRouter } from './control-routes';
import { FakeState } from './fake-state';
import { IdempotencyStore } from './idempotency';
import { payRouter } from './pay-routes';
import { loadStateFile, StateFileWriter } from './state-file';
import { STATE_FILE_VERSION } from './state-file-format';
import { StripeObjects } from './stripe-objects';
import { WebhookSender, type EventDeliveryView } from './webhook-sender';

export type { EventDeliveryView, DeliveryAttempt, StripeEvent } from './webhook-sender';
export { TEST_CARD_NUMBERS, TEST_PAYMENT_METHODS } from './test-cards';

export interface StripeFakeOptions {
  host: string;
  /** 0 picks a free port (tests). */
  port: number;
  /** The only key accepted (`sk_test_…`). */
  secretKey: string;
  /** Where events are posted (the app's `/api/v1/webhooks/stripe`); unset records them unsent. */
  webhookUrl?: string;
  /** Signs the events (`whsec_…`), as the app's STRIPE_WEBHOOK_SECRET. */
  webhookSecret: string;
  /** Where browsers reach this server (hosted_invoice_url starts with it); defaults to its own URL. */
  publicUrl?: string;
  /** Waits before each webhook retry (default 0.5 s, 2 s, 8 s: four attempts in all). */
  webhookRetryDelaysMs?: number[];
  /** How long one webhook attempt may take (default 10 s). */
  webhookTimeoutMs?: number;
  /**
   * Where the fake keeps what it knows (JSON), so ids the app stored survive a restart: read at
   * start (a file it cannot read stops the start), rewritten after every change, emptied by
   * `POST /_fake/reset`. Unset: memory only.
   */
  dataFile?: string;
}

export interface StripeFake {
  /** The API base, e.g. http://127.0.0.1:12111 */
  url: string;
  close(): Promise<void>;
  /** Every event so far with its delivery attempts (as `GET /_fake/events`). */
  events(): EventDeliveryView[];
}

export async function startStripeFake(opts: StripeFakeOptions): Promise<StripeFake> {
  if (!opts.secretKey.startsWith('sk_test_')) throw new Error('the Stripe fake takes test-mode keys only (sk_test_…)');
  const app = express();
  app.disable('x-powered-by');
  // `expand[]=…` and other nested parameters arrive in query strings too.
  app.set('query parser', 'extended');

  // Read before listening: a bad file must stop the start before anyone is answered.
  const saved = opts.dataFile ? await loadStateFile(opts.dataFile) : undefined;
  const state = new FakeState();
  let writer: StateFileWriter | undefined;
  const webhooks = new WebhookSender({
    url: opts.webhookUrl || undefined,
    secret: opts.webhookSecret,
    retryDelaysMs: opts.webhookRetryDelaysMs ?? [500, 2000, 8000],
    timeoutMs: opts.webhookTimeoutMs ?? 10_000,
    onChange: () => writer?.schedule(),
  });
  const idempotency = new IdempotencyStore();
  if (saved) {
    state.restore(saved);
    // Events the earlier run had not delivered stay undelivered (see WebhookSender.restore).
    webhooks.restore(saved.events);
    idempotency.restore(saved.idempotency);
  }
  if (opts.dataFile) {
    writer = new StateFileWriter(opts.dataFile, () => ({
      version: STATE_FILE_VERSION,
      ...state.snapshot(),
      events: webhooks.snapshot(),
      idempotency: idempotency.snapshot(),
    }));
  }
  /** Requests other than reads may change the state; it is saved once they are answered. */
  const saveAfterChange: RequestHandler = (req, res, next) => {
    if (writer && req.method !== 'GET' && req.method !== 'HEAD') res.on('close', () => writer?.schedule());
    next();
  };

  const server = await new Promise<Server>((resolve, reject) => {
    const s = app.listen(opts.port, opts.host, () => resolve(s));
    s.on('error', reject);
  });
  const { port } = server.address() as AddressInfo;
  const host = opts.host.includes(':') ? `[${opts.host}]` : opts.host;
  const url = `http://${host}:${port}`;

  const objects = new StripeObjects(state, (opts.publicUrl || url).replace(/\/+$/, ''));
  const billing = new Billing(state, objects, webhooks);
  /** Answers only once the emptied state is on disk, so a restart right after starts empty. */
  const reset = async () => {
    state.reset();
    webhooks.reset();
    idempotency.reset();
    writer?.schedule();
    await writer?.flush();
  };

  // Browsers ask every site for an icon; answering keeps their consoles free of 404s.
  app.get('/favicon.ico', (_req, res) => res.status(204).end());
  app.use(['/v1', '/pay'], saveAfterChange);
  app.use('/v1', apiRouter({ secretKey: opts.secretKey, state, objects, billing, idempotency }));
  app.use('/pay', payRouter(state, billing));
  app.use('/_fake', controlRouter(webhooks, reset, opts.webhookUrl || undefined));

  return {
    url,
    events: () => webhooks.list(),
    close: async () => {
      await webhooks.close();
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      // One last write: a change answered a moment ago may not have been scheduled yet.
      writer?.schedule();
      await writer?.flush();
    },
  };
}
