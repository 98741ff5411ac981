import { existsSync, readFileSync } from 'node:fs';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Stripe from 'stripe';
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { formatAmount } from './pay-page-html';
import { startStripeFake, type EventDeliveryView, type StripeFake } from './stripe-fake';

const SECRET_KEY = 'sk_test_stripe_fake_suite';
const WEBHOOK_SECRET = 'whsec_stripe_fake_suite';
const RETURN_URL = 'http://127.0.0.1:4100/billing/invoices/7';

/** What the webhook receiver got: the raw body and signature, as the app's route sees them. */
interface Delivery {
  raw: string;
  signature: string;
}

let fake: StripeFake;
let stripe: Stripe;
let receiver: Server;
let receiverUrl: string;
let received: Delivery[] = [];
/** Statuses the receiver answers with next (then 200): to make deliveries fail. */
let failNext: number[] = [];

function startReceiver(): Promise<string> {
  receiver = createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      received.push({ raw: Buffer.concat(chunks).toString('utf8'), signature: String(req.headers['stripe-signature'] ?? '') });
      res.statusCode = failNext.shift() ?? 200;
      res.end();
    });
  });
  return new Promise((resolve) => receiver.listen(0, '127.0.0.1', () => resolve(`http://127.0.0.1:${(receiver.address() as AddressInfo).port}/api/v1/webhooks/stripe`)));
}

/** Verified as the app verifies them; throws on a bad signature. */
function verifiedEvents(): Stripe.Event[] {
  return received.map((d) => stripe.webhooks.constructEvent(d.raw, d.signature, WEBHOOK_SECRET));
}

async function eventually<T>(probe: () => T | undefined, timeoutMs = 5000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = probe();
    if (value !== undefined) return value;
    if (Date.now() > deadline) throw new Error('timed out waiting');
    await new Promise((r) => setTimeout(r, 20));
  }
}

const receivedOf = (type: string, objectId: string) => verifiedEvents().filter((e) => e.type === type && (e.data.object as { id: string }).id === objectId);

async function openInvoice(amounts: number[], metadata: Record<string, string> = {}): Promise<Stripe.Invoice> {
  const customer = await stripe.customers.create({ name: 'Institute of Disorder Studies', email: 'billing@ids.example', metadata: { institution: '42' } });
  const invoice = await stripe.invoices.create({
    customer: customer.id,
    collection_method: 'send_invoice',
    days_until_due: 30,
    currency: 'eur',
    auto_advance: false,
    description: 'Beam time, spring allocation',
    metadata,
  });
  for (const [i, amount] of amounts.entries()) {
    await stripe.invoiceItems.create({ customer: customer.id, invoice: invoice.id, amount, currency: 'eur', description: `Shift block ${i + 1}` });
  }
  return stripe.invoices.finalizeInvoice(invoice.id);
}

function paymentIntentOf(invoice: Stripe.Invoice): string {
  return invoice.payments!.data[0].payment.payment_intent as string;
}

function payOnPage(invoice: Stripe.Invoice, cardNumber: string): Promise<Response> {
  return fetch(invoice.hosted_invoice_url!, { method: 'POST', body: new URLSearchParams({ card_number: cardNumber }) });
}

beforeAll(async () => {
  receiverUrl = await startReceiver();
  fake = await startStripeFake({ host: '127.0.0.1', port: 0, secretKey: SECRET_KEY, webhookUrl: receiverUrl, webhookSecret: WEBHOOK_SECRET, webhookRetryDelaysMs: [20, 40, 80] });
  const port = Number(new URL(fake.url).port);
  stripe = new Stripe(SECRET_KEY, { host: '127.0.0.1', port, protocol: 'http', maxNetworkRetries: 0, telemetry: false });
});

afterAll(async () => {
  await fake?.close();
  await new Promise((r) => receiver?.close(r));
});

beforeEach(async () => {
  await fetch(`${fake.url}/_fake/reset`, { method: 'POST' });
  received = [];
  failNext = [];
});

describe('Stripe fake: invoices through the real SDK', () => {
  it('finalizes an invoice with totals from its items, a number, a hosted page and a payment intent', async () => {
    const invoice = await openInvoice([12000, 3450], { return_url: RETURN_URL });
    expect(invoice).toMatchObject({ object: 'invoice', status: 'open', livemode: false, currency: 'eur', subtotal: 15450, total: 15450, amount_due: 15450, amount_paid: 0 });
    expect(invoice.id).toMatch(/^in_/);
    expect(invoice.number).toMatch(/^[A-Za-z0-9]{8}-0001$/);
    expect(invoice.hosted_invoice_url).toBe(`${fake.url}/pay/${invoice.id}`);
    expect(invoice.lines.data.map((l) => l.amount)).toEqual([12000, 3450]);
    expect(invoice.due_date).toBe(invoice.status_transitions.finalized_at! + 30 * 86400);

    const pi = await stripe.paymentIntents.retrieve(paymentIntentOf(invoice));
    expect(pi).toMatchObject({ object: 'payment_intent', status: 'requires_payment_method', amount: 15450, currency: 'eur', customer: invoice.customer });

    const listed = await stripe.invoices.list({ customer: invoice.customer as string });
    expect(listed.data.map((i) => i.id)).toEqual([invoice.id]);
  });

  it('takes a test card on the hosted page, marks the invoice paid and sends signed events', async () => {
    const invoice = await openInvoice([12000, 3450], { return_url: RETURN_URL });

    const form = await fetch(invoice.hosted_invoice_url!);
    const html = await form.text();
    expect(form.status).toBe(200);
    expect(html).toContain('<title>Pay invoice</title>');
    expect(html).toContain('€154.50');
    expect(html).toContain('Beam time, spring allocation');
    expect(html).toMatch(/<label for="card-number">Card number<\/label>\s*<input id="card-number"/);
    // Stripe's published test cards: 4242… pays, 4000 0000 0000 0002 is declined.
    expect(html).toContain('4242 4242 4242 4242');
    expect(html).toContain('test payment page');

    const paid = await payOnPage(invoice, '4242 4242 4242 4242');
    expect(paid.redirected).toBe(true);
    const paidHtml = await paid.text();
    expect(paidHtml).toContain('Invoice paid');
    expect(paidHtml).toContain(`<a href="${RETURN_URL}">`);

    const after = await stripe.invoices.retrieve(invoice.id);
    expect(after).toMatchObject({ status: 'paid', amount_paid: 15450, amount_remaining: 0, attempt_count: 1 });
    expect((await stripe.paymentIntents.retrieve(paymentIntentOf(invoice))).status).toBe('succeeded');

    const [event] = await eventually(() => (receivedOf('invoice.paid', invoice.id).length ? receivedOf('invoice.paid', invoice.id) : undefined));
    expect(event).toMatchObject({ object: 'event', livemode: false, api_version: Stripe.API_VERSION, data: { object: { status: 'paid', amount_paid: 15450 } } });
    expect(event.id).toMatch(/^evt_/);
    await eventually(() => receivedOf('payment_intent.succeeded', paymentIntentOf(invoice))[0]);
    // The signature means something: another secret does not verify.
    const delivery = received.find((d) => d.raw.includes(`"id": "${event.id}"`))!;
    expect(() => stripe.webhooks.constructEvent(delivery.raw, delivery.signature, 'whsec_someone_else')).toThrow();
  });

  it('declines the declining test card, says so, and lets one try again', async () => {
    const invoice = await openInvoice([5000]);

    const declined = await payOnPage(invoice, '4000000000000002');
    expect(declined.status).toBe(402);
    const html = await declined.text();
    expect(html).toMatch(/role="alert">Your card was declined/);
    expect(html).toContain('name="card_number"');

    const afterDecline = await stripe.invoices.retrieve(invoice.id);
    expect(afterDecline).toMatchObject({ status: 'open', attempt_count: 1, attempted: true, amount_paid: 0 });
    const pi = await stripe.paymentIntents.retrieve(paymentIntentOf(invoice));
    expect(pi.status).toBe('requires_payment_method');
    expect(pi.last_payment_error).toMatchObject({ code: 'card_declined', decline_code: 'generic_decline' });
    await eventually(() => receivedOf('payment_intent.payment_failed', pi.id)[0]);
    await eventually(() => receivedOf('invoice.payment_failed', invoice.id)[0]);

    const other = await payOnPage(invoice, '1234 5678 9012 3456');
    expect(other.status).toBe(422);
    expect(await other.text()).toContain('test cards only');

    const retried = await payOnPage(invoice, '4242424242424242');
    expect(await retried.text()).toContain('Invoice paid');
    expect((await stripe.invoices.retrieve(invoice.id)).status).toBe('paid');
  });

  it('pays through the API with test payment methods, declines as a card error', async () => {
    const invoice = await openInvoice([2500]);
    const declined = await stripe.invoices.pay(invoice.id, { payment_method: 'pm_card_chargeDeclined' }).catch((e: unknown) => e);
    expect(declined).toBeInstanceOf(Stripe.errors.StripeCardError);
    expect(declined).toMatchObject({ statusCode: 402, code: 'card_declined', decline_code: 'generic_decline' });

    const paid = await stripe.invoices.pay(invoice.id, { payment_method: 'pm_card_visa' });
    expect(paid).toMatchObject({ status: 'paid', amount_paid: 2500 });

    const again = await stripe.invoices.pay(invoice.id, { payment_method: 'pm_card_visa' }).catch((e: unknown) => e);
    expect(again).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(again).toMatchObject({ statusCode: 400, code: 'invoice_not_open', message: 'Invoice is already paid' });
  });

  it('refuses to pay a void invoice, by API and on the page', async () => {
    const invoice = await openInvoice([9900]);
    const voided = await stripe.invoices.voidInvoice(invoice.id);
    expect(voided.status).toBe('void');
    expect(voided.status_transitions.voided_at).toEqual(expect.any(Number));
    expect((await stripe.paymentIntents.retrieve(paymentIntentOf(invoice))).status).toBe('canceled');
    await eventually(() => receivedOf('invoice.voided', invoice.id)[0]);

    const paying = await stripe.invoices.pay(invoice.id, { payment_method: 'pm_card_visa' }).catch((e: unknown) => e);
    expect(paying).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(paying).toMatchObject({ statusCode: 400, code: 'invoice_not_open', type: 'StripeInvalidRequestError' });

    const page = await payOnPage(invoice, '4242424242424242');
    expect(page.status).toBe(409);
    expect(await page.text()).toContain('can no longer be paid');
    expect((await stripe.invoices.retrieve(invoice.id)).status).toBe('void');
  });

  it('settles an invoice with nothing due when it is finalized, as Stripe does', async () => {
    const invoice = await openInvoice([]);
    expect(invoice).toMatchObject({ status: 'paid', amount_due: 0 });
    expect(invoice.payments!.data).toEqual([]);
  });
});

describe('Stripe fake: requests', () => {
  it('replays an idempotent request and refuses its key with other parameters', async () => {
    const first = await stripe.customers.create({ email: 'a@ids.example' }, { idempotencyKey: 'create-customer-1' });
    const second = await stripe.customers.create({ email: 'a@ids.example' }, { idempotencyKey: 'create-customer-1' });
    expect(second).toEqual(first);
    expect(second.lastResponse.headers['idempotent-replayed']).toBe('true');
    expect((await stripe.customers.list()).data).toHaveLength(1);
    expect(fake.events().filter((e) => e.type === 'customer.created')).toHaveLength(1);

    const clash = await stripe.customers.create({ email: 'b@ids.example' }, { idempotencyKey: 'create-customer-1' }).catch((e: unknown) => e);
    expect(clash).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
    expect(clash).toMatchObject({ statusCode: 400, rawType: 'idempotency_error' });
  });

  it('answers a wrong or missing key with 401 in Stripe’s error shape', async () => {
    const port = Number(new URL(fake.url).port);
    const wrong = new Stripe('sk_test_not_the_key', { host: '127.0.0.1', port, protocol: 'http', maxNetworkRetries: 0, telemetry: false });
    const err = await wrong.customers.create({ email: 'x@ids.example' }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
    expect(err).toMatchObject({ statusCode: 401 });

    const bare = await fetch(`${fake.url}/v1/customers`, { method: 'POST' });
    expect(bare.status).toBe(401);
    expect(await bare.json()).toEqual({ error: { type: 'invalid_request_error', message: expect.stringContaining('API key') } });
  });

  it('names missing objects and unknown parameters as Stripe does', async () => {
    const missing = await stripe.invoices.retrieve('in_missing').catch((e: unknown) => e);
    expect(missing).toMatchObject({ statusCode: 404, code: 'resource_missing', message: "No such invoice: 'in_missing'" });
    const unknown = await stripe.customers.create({ colour: 'red' } as Stripe.CustomerCreateParams).catch((e: unknown) => e);
    expect(unknown).toMatchObject({ statusCode: 400, code: 'parameter_unknown', param: 'colour' });
    const customer = await stripe.customers.create({ metadata: { institution: '42' } });
    const updated = await stripe.customers.update(customer.id, { metadata: { institution: '', tier: 'partner' } });
    expect(updated.metadata).toEqual({ tier: 'partner' });
    const expanded = await stripe.invoices.create({ customer: customer.id, currency: 'eur', expand: ['customer'] });
    expect((expanded.customer as Stripe.Customer).id).toBe(customer.id);
  });
});

describe('Stripe fake: webhook delivery', () => {
  it('retries a failing receiver with backoff and records every attempt', async () => {
    failNext = [500, 503];
    const customer = await stripe.customers.create({ email: 'retry@ids.example' });
    const record = await eventually(() => fake.events().find((e) => e.type === 'customer.created' && e.object_id === customer.id && e.delivered));
    expect(record.attempts.map((a) => a.status)).toEqual([500, 503, 200]);
    expect(record.last_status).toBe(200);
  });

  it('resends an event with the same id, signed again', async () => {
    const invoice = await openInvoice([1000]);
    await payOnPage(invoice, '4242424242424242');
    const [event] = await eventually(() => (receivedOf('invoice.paid', invoice.id).length ? receivedOf('invoice.paid', invoice.id) : undefined));

    const res = await fetch(`${fake.url}/_fake/events/${event.id}/resend`, { method: 'POST' });
    expect(res.status).toBe(200);
    expect(await res.json()).toMatchObject({ id: event.id, attempt: { delivery: 2, attempt: 1, status: 200 } });
    expect(verifiedEvents().filter((e) => e.id === event.id)).toHaveLength(2);

    const listed = (await (await fetch(`${fake.url}/_fake/events?type=invoice.paid`)).json()) as { data: EventDeliveryView[] };
    expect(listed.data.map((e) => e.id)).toEqual([event.id]);
    expect(listed.data[0].attempts.map((a) => a.delivery)).toEqual([1, 2]);
    expect((await fetch(`${fake.url}/_fake/events/evt_missing/resend`, { method: 'POST' })).status).toBe(404);
  });

  it('forgets everything on reset', async () => {
    const customer = await stripe.customers.create({ email: 'gone@ids.example' });
    await fetch(`${fake.url}/_fake/reset`, { method: 'POST' });
    expect(fake.events()).toEqual([]);
    await expect(stripe.customers.retrieve(customer.id)).rejects.toMatchObject({ statusCode: 404 });
  });
});

describe('Stripe fake: data file', () => {
  let dir: string;
  let dataFile: string;
  const running: StripeFake[] = [];

  const start = async (port = 0) => {
    const f = await startStripeFake({ host: '127.0.0.1', port, secretKey: SECRET_KEY, webhookUrl: receiverUrl, webhookSecret: WEBHOOK_SECRET, webhookRetryDelaysMs: [20], dataFile });
    running.push(f);
    const client = new Stripe(SECRET_KEY, { host: '127.0.0.1', port: Number(new URL(f.url).port), protocol: 'http', maxNetworkRetries: 0, telemetry: false });
    return { fake: f, stripe: client };
  };
  const stop = async (f: StripeFake) => {
    running.splice(running.indexOf(f), 1);
    await f.close();
  };
  const saved = () => JSON.parse(readFileSync(dataFile, 'utf8')) as { customers: Array<{ id: string }>; invoices: unknown[]; events: unknown[]; idempotency: Array<{ key: string }> };

  beforeEach(async () => {
    dir = await mkdtemp(join(tmpdir(), 'stripe-fake-'));
    dataFile = join(dir, 'stripe', 'state.json');
  });

  afterEach(async () => {
    for (const f of running.splice(0)) await f.close();
    await rm(dir, { recursive: true, force: true });
  });

  it('knows customers, invoices and their hosted pages after a restart', async () => {
    const first = await start();
    const customer = await first.stripe.customers.create({ name: 'Institute of Disorder Studies', metadata: { institution: '42' } }, { idempotencyKey: 'restart-customer' });
    const draft = await first.stripe.invoices.create({ customer: customer.id, collection_method: 'send_invoice', currency: 'eur' });
    await first.stripe.invoiceItems.create({ customer: customer.id, invoice: draft.id, amount: 4200, currency: 'eur', description: 'Shift block 1' });
    const invoice = await first.stripe.invoices.finalizeInvoice(draft.id);
    const paymentIntent = paymentIntentOf(invoice);
    await eventually(() => (first.fake.events().every((e) => e.delivered) ? true : undefined));
    const eventsBefore = first.fake.events();
    const port = Number(new URL(first.fake.url).port);
    await stop(first.fake);
    expect(existsSync(`${dataFile}.tmp`)).toBe(false);

    // The same port, so the hosted_invoice_url the app stored still leads to the page.
    const second = await start(port);
    expect(await second.stripe.customers.retrieve(customer.id)).toEqual(expect.objectContaining({ id: customer.id, name: 'Institute of Disorder Studies', metadata: { institution: '42' } }));
    const again = await second.stripe.invoices.retrieve(invoice.id);
    expect(again).toMatchObject({ status: 'open', number: invoice.number, amount_due: 4200, hosted_invoice_url: invoice.hosted_invoice_url });
    expect((await second.stripe.paymentIntents.retrieve(paymentIntent)).status).toBe('requires_payment_method');
    // The delivery log and idempotency keys come back too; old events are not sent again.
    expect(second.fake.events()).toEqual(eventsBefore);
    const replayed = await second.stripe.customers.create({ name: 'Institute of Disorder Studies', metadata: { institution: '42' } }, { idempotencyKey: 'restart-customer' });
    expect(replayed.id).toBe(customer.id);
    expect(replayed.lastResponse.headers['idempotent-replayed']).toBe('true');

    const paid = await payOnPage(invoice, '4242 4242 4242 4242');
    expect(await paid.text()).toContain('Invoice paid');
    expect(await second.stripe.invoices.retrieve(invoice.id)).toMatchObject({ status: 'paid', amount_paid: 4200 });
    // The next invoice of the customer continues its numbering.
    const next = await second.stripe.invoices.create({ customer: customer.id, collection_method: 'send_invoice', currency: 'eur' });
    await second.stripe.invoiceItems.create({ customer: customer.id, invoice: next.id, amount: 100, currency: 'eur' });
    expect((await second.stripe.invoices.finalizeInvoice(next.id)).number).toMatch(/-0002$/);

    await stop(second.fake);
    const third = await start();
    expect((await third.stripe.invoices.retrieve(invoice.id)).status).toBe('paid');
    expect(third.fake.events().filter((e) => e.type === 'invoice.paid' && e.object_id === invoice.id)).toHaveLength(1);
  });

  it('refuses to start on a file it cannot read, naming the file', async () => {
    await start().then((f) => stop(f.fake)); // creates the folder
    await writeFile(dataFile, '{"version":1,"customers":[');
    await expect(start()).rejects.toThrow(dataFile);
    await expect(start()).rejects.toThrow(/not valid JSON/);

    await writeFile(dataFile, JSON.stringify({ version: 1, customers: [{ id: 'cus_1', created: 'yesterday' }] }));
    await expect(start()).rejects.toThrow(/\$\.customers\[0\]\.created: expected an integer/);
    await writeFile(dataFile, JSON.stringify({ version: 2 }));
    await expect(start()).rejects.toThrow(/\$\.version: expected one of 1/);
    expect(running).toEqual([]);
  });

  it('empties the file on reset', async () => {
    const { fake: f, stripe: client } = await start();
    const customer = await client.customers.create({ email: 'kept@ids.example' }, { idempotencyKey: 'reset-customer' });
    await eventually(() => (existsSync(dataFile) && saved().customers.some((c) => c.id === customer.id) ? true : undefined));
    // A change without an event is saved too: Stripe keeps the 404 answered to an idempotent request.
    await client.invoices.finalizeInvoice('in_missing', {}, { idempotencyKey: 'finalize-missing' }).catch(() => undefined);
    await eventually(() => (saved().idempotency.length === 2 ? true : undefined));

    expect((await fetch(`${f.url}/_fake/reset`, { method: 'POST' })).status).toBe(200);
    expect(saved()).toMatchObject({ customers: [], invoices: [], events: [], idempotency: [] });

    await stop(f);
    const after = await start();
    await expect(after.stripe.customers.retrieve(customer.id)).rejects.toMatchObject({ statusCode: 404 });
    expect(after.fake.events()).toEqual([]);
  });
});

describe('hosted page amounts', () => {
  // ISO 4217 minor units: EUR and CHF have two decimals, JPY none. Intl separates "CHF" with a no-break space.
  it('formats minor units in the currency’s own digits', () => {
    expect(formatAmount(15450, 'eur')).toBe('€154.50');
    expect(formatAmount(5000, 'jpy')).toBe('¥5,000');
    expect(formatAmount(1000, 'chf')).toBe('CHF\u00a010.00');
  });
});
