import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Stripe from 'stripe';
import fc from 'fast-check';
import { QueryTypes } from 'sequelize';
import { RunInput, type Invoice, type InvoiceList, type InvoiceRun, type PaymentLink } from '@localis/shared';
import { createPerson, startTestApp, tokenFor, type TestApp } from '../../test/harness';
import { actingAs, makeCampaignWorld, type CampaignWorld } from '../../test/campaign-world';
import { bearerCaller, settled, type ApiCall } from '../../test/archive-upload';
import { InvoiceRow, InvoiceRunRow, LedgerEntry, OutboxMessage } from '../db/models';
import { createInvoiceRunner } from './invoice-runner';
import { queueLastMonthsRun, remindOverdueInvoices } from './billing-chores';

let t: TestApp;
let w: CampaignWorld;
let campaignId: string;
let admin: ApiCall;
let billing: ApiCall;
let billingToken: string;
let researcher: ApiCall;
let stripeUrl: string;
const webhookSecret = () => t.settings.STRIPE_WEBHOOK_SECRET;

/** A run of `cores` for `hours`, ending on `day` (UTC noon). */
async function run(day: string, cores: number, hours: number) {
  const end = new Date(`${day}T12:00:00Z`);
  return t.services.runs.create(actingAs(w.researcher), campaignId, RunInput.parse({
    externalJobId: `billing-${Math.random().toString(36).slice(2)}`, machine: w.machine, startedAt: new Date(end.getTime() - hours * 3_600_000).toISOString(), endedAt: end.toISOString(), cores, codeName: 'tmm', codeVersion: '1',
  }));
}

/** Request a run over the API and run it here (the test stack's worker may take it first). */
async function invoiceRun(from: string, to: string): Promise<InvoiceRunRow> {
  const res = await admin('POST', '/invoice-runs', { from, to });
  expect(res.status, await res.clone().text()).toBe(202);
  const { id } = (await res.json()) as InvoiceRun;
  await createInvoiceRunner(t.db).run(id);
  return settled(() => InvoiceRunRow.findByPk(id), ['queued', 'running']);
}

const draftsOf = async (from: string) => ((await (await admin('GET', `/invoices?institutionId=${w.institutionId}`)).json()) as InvoiceList).items.filter((i) => i.periodFrom === from);

beforeAll(async () => {
  t = await startTestApp({ TOKEN_RATE_PER_MINUTE: '100000' });
  w = await makeCampaignWorld(t, { label: 'billing', institutionKind: 'partner' });
  campaignId = await w.granted(100_000);
  admin = bearerCaller(t.url, await tokenFor(t, w.admin));
  billingToken = await tokenFor(t, await createPerson(t, { roles: ['billing'], institutionId: w.institutionId, label: 'billing-contact' }));
  billing = bearerCaller(t.url, billingToken);
  researcher = bearerCaller(t.url, await tokenFor(t, w.researcher));
  stripeUrl = `http://127.0.0.1:${t.settings.STRIPE_PORT}`;
  // EUR 0.12 a core-hour, 0.09 beyond 500 core-hours in a month, 21 % VAT, 30 days.
  const card = await admin('POST', `/institutions/${w.institutionId}/rate-cards`, { currency: 'EUR', unitPriceMinor: 12, tiers: [{ fromCoreHours: 500, unitPriceMinor: 9 }], taxRateBasisPoints: 2100, paymentTermsDays: 30, effectiveFrom: '2026-01-01' });
  expect(card.status).toBe(201);
  // May 2027: 640 + 160 core-hours; June 2027: 10 core-hours.
  await run('2027-05-10', 64, 10);
  await run('2027-05-20', 32, 5);
  await run('2027-06-03', 2, 5);
}, 120_000);
afterAll(async () => t.close());

describe('invoices of a partner', () => {
  let may: Invoice;

  it('should draft the month from the ledger, the tiers and tax worked out by hand', async () => {
    const r = await invoiceRun('2027-05-01', '2027-05-31');
    expect(r.state).toBe('done');
    const [draft] = await draftsOf('2027-05-01');
    may = draft!;
    // 800 core-hours: 500 at 0.12 = 60.00 and 300 at 0.09 = 27.00; VAT 21 % per line: 12.60 + 5.67.
    expect(may.lines.map((l) => [l.tier, l.coreHoursMilli, l.unitPriceMinor, l.amountMinor, l.taxMinor])).toEqual([
      [null, 500_000, 12, 6000, 1260],
      [0, 300_000, 9, 2700, 567],
    ]);
    expect([may.subtotalMinor, may.discountMinor, may.taxMinor, may.totalMinor]).toEqual([8700, 0, 1827, 10527]);
    expect(may).toMatchObject({ state: 'draft', number: null, currency: 'EUR', hasPdf: false });
  });

  it('should reconcile exactly with the ledger debits of the month', async () => {
    const debits = await LedgerEntry.findAll({ where: { campaignId, kind: 'debit' } });
    const mayMilli = -debits.map((d) => Number(d.milli)).filter((m) => m !== -10_000).reduce((a, b) => a + b, 0);
    expect(may.lines.reduce((a, l) => a + l.coreHoursMilli, 0)).toBe(mayMilli);
  });

  it('should change nothing when the same period is run again, and add only what is new', async () => {
    await invoiceRun('2027-05-01', '2027-05-31');
    const again = await draftsOf('2027-05-01');
    expect(again).toHaveLength(1);
    expect(again[0]!.totalMinor).toBe(may.totalMinor);
    await run('2027-05-25', 1, 10);
    await invoiceRun('2027-05-01', '2027-05-31');
    const grown = await draftsOf('2027-05-01');
    expect(grown).toHaveLength(1);
    // 10 more core-hours at the tier price: 0.90, VAT 0.19.
    expect(grown[0]!.totalMinor).toBe(may.totalMinor + 90 + 19);
    may = grown[0]!;
  });

  it('should refuse a run while another is open, and a period that cuts a month', async () => {
    const open = await InvoiceRunRow.create({ periodFrom: '2027-01-01', periodTo: '2027-01-31', state: 'queued', error: null, startedByPersonId: null, finishedAt: null });
    try {
      const res = await admin('POST', '/invoice-runs', { from: '2027-02-01', to: '2027-02-28' });
      expect(res.status).toBe(409);
      expect(((await res.json()) as { error: { message: string } }).error.message).toMatch(/2027-01-01 to 2027-01-31 is still queued/);
    } finally {
      await open.update({ state: 'failed', error: 'test', finishedAt: new Date() });
    }
    expect((await admin('POST', '/invoice-runs', { from: '2027-02-03', to: '2027-02-28' })).status).toBe(422);
  });

  it('should issue with numbers that have no gaps, the due date from the terms, a PDF, the payment page and an e-mail with the PDF', async () => {
    await invoiceRun('2027-06-01', '2027-06-30');
    const [june] = await draftsOf('2027-06-01');
    const first = (await (await admin('POST', `/invoices/${may.id}/issue`)).json()) as Invoice;
    const second = (await (await admin('POST', `/invoices/${june!.id}/issue`)).json()) as Invoice;
    const [, year, n1] = first.number!.match(/^LCS-(\d{4})-(\d{4})$/)!;
    expect(second.number).toBe(`LCS-${year}-${String(Number(n1) + 1).padStart(4, '0')}`);
    expect(first).toMatchObject({ state: 'issued', paymentReference: first.number, hasPdf: true, paymentState: 'pending' });
    expect(Date.parse(first.dueOn!) - Date.parse(first.issuedOn!)).toBe(30 * 86_400_000);
    const pdf = await fetch(`${t.url}/api/v1/invoices/${first.id}/pdf`, { headers: { authorization: `Bearer ${billingToken}` }, redirect: 'manual' });
    expect(pdf.status).toBe(302);
    const bytes = Buffer.from(await (await fetch(pdf.headers.get('location')!)).arrayBuffer());
    expect(bytes.subarray(0, 5).toString()).toBe('%PDF-');
    const mails = await OutboxMessage.findAll({ where: { kind: 'mail' }, order: [['id', 'DESC']], limit: 20 });
    const mail = mails.find((m) => (m.payload as { dedupeKey: string }).dedupeKey === `invoice-issued-${first.id}`);
    expect(mail?.payload).toMatchObject({ to: [expect.stringMatching(/^billing-contact/)], attachments: [{ filename: `${first.number}.pdf`, contentType: 'application/pdf' }] });
    // Issued invoices are immutable: even a direct update of their figures is refused by the database.
    await expect(InvoiceRow.update({ totalMinor: 1 }, { where: { id: first.id } })).rejects.toThrow(/cannot be changed/);
    may = first;
  });

  it('should be paid on the payment page and marked paid by the signed webhook', async () => {
    expect((await researcher('POST', `/invoices/${may.id}/pay`)).status).toBe(403);
    const { url } = (await (await billing('POST', `/invoices/${may.id}/pay`)).json()) as PaymentLink;
    expect(url.startsWith(stripeUrl)).toBe(true);
    const declined = await fetch(url, { method: 'POST', body: new URLSearchParams({ card_number: '4000000000000002' }), redirect: 'manual' });
    expect(declined.status).toBe(402);
    const paid = await fetch(url, { method: 'POST', body: new URLSearchParams({ card_number: '4242424242424242' }), redirect: 'manual' });
    expect(paid.status).toBe(303);
    // The fake delivers to the test stack's api, which shares this database.
    const row = await settled(() => InvoiceRow.findByPk(may.id), ['issued'], 30);
    expect(row.state).toBe('paid');
    expect((await billing('POST', `/invoices/${may.id}/pay`)).status).toBe(409);
    expect((await admin('POST', `/invoices/${may.id}/void`, { reason: 'test' })).status).toBe(409);
  });

  it('should refuse a webhook whose signature does not verify, change nothing, and take each event once whatever the order', async () => {
    const stripe = new Stripe(t.settings.STRIPE_SECRET_KEY);
    const june = (await draftsOf('2027-06-01'))[0]!;
    const stripeInvoiceId = (await InvoiceRow.findByPk(june.id))!.stripeInvoiceId!;
    const event = (id: string, type: string) => JSON.stringify({ id, object: 'event', type, created: Math.floor(Date.now() / 1000), data: { object: { id: stripeInvoiceId, object: 'invoice' } }, livemode: false, api_version: '2026-10-28.endive' });
    const send = (payload: string, signature?: string) =>
      fetch(`${t.url}/api/v1/webhooks/stripe`, { method: 'POST', headers: { 'content-type': 'application/json', ...(signature ? { 'stripe-signature': signature } : {}) }, body: payload });

    const paidEvent = event(`evt_test_${Date.now()}_paid`, 'invoice.paid');
    expect((await send(paidEvent)).status).toBe(400);
    expect((await send(paidEvent, stripe.webhooks.generateTestHeaderString({ payload: paidEvent, secret: 'whsec_wrong' }))).status).toBe(400);
    expect((await InvoiceRow.findByPk(june.id))!.state).toBe('issued');

    const signed = (payload: string) => stripe.webhooks.generateTestHeaderString({ payload, secret: webhookSecret() });
    const first = await send(paidEvent, signed(paidEvent));
    expect(await first.json()).toEqual({ received: true });
    expect(await (await send(paidEvent, signed(paidEvent))).json()).toEqual({ received: true, duplicate: true });
    // A failure reported after the payment (out of order) changes nothing.
    const failed = event(`evt_test_${Date.now()}_failed`, 'invoice.payment_failed');
    expect((await send(failed, signed(failed))).status).toBe(200);
    expect((await InvoiceRow.findByPk(june.id))!).toMatchObject({ state: 'paid', paymentState: 'succeeded' });
    const unknown = event(`evt_test_${Date.now()}_unknown`, 'customer.tax_id.created');
    expect(await (await send(unknown, signed(unknown))).json()).toEqual({ received: true, ignored: true });
  });

  it('should void an issued invoice with a credit note and let its usage be billed again', async () => {
    await run('2027-07-02', 1, 10);
    await invoiceRun('2027-07-01', '2027-07-31');
    const [july] = await draftsOf('2027-07-01');
    const issued = (await (await admin('POST', `/invoices/${july!.id}/issue`)).json()) as Invoice;
    expect((await admin('POST', `/invoices/${issued.id}/void`, {})).status).toBe(422);
    const voided = (await (await admin('POST', `/invoices/${issued.id}/void`, { reason: 'Billed at the wrong rate.' })).json()) as Invoice;
    expect(voided).toMatchObject({ state: 'void', voidReason: 'Billed at the wrong rate.', creditNoteNumber: `CN-${issued.number}` });
    expect((await billing('POST', `/invoices/${issued.id}/pay`)).status).toBe(409);
    await invoiceRun('2027-07-01', '2027-07-31');
    const again = (await draftsOf('2027-07-01')).filter((i) => i.state === 'draft');
    expect(again).toHaveLength(1);
    expect(again[0]!.totalMinor).toBe(issued.totalMinor);
  });

  it('should show billing contacts only their own invoices', async () => {
    const own = ((await (await billing('GET', '/invoices')).json()) as InvoiceList).items;
    expect(own.length).toBeGreaterThan(0);
    expect(own.every((i) => i.institutionId === w.institutionId)).toBe(true);
    expect((await researcher('GET', '/invoices')).status).toBe(403);
  });
});

describe('the monthly chores', () => {
  it('should queue the ended month’s run once, and mail the office when its drafts are ready', async () => {
    const now = new Date('2027-09-01T06:00:00Z');
    await InvoiceRunRow.update({ state: 'failed', error: 'closed by the test', finishedAt: new Date() }, { where: { state: ['queued', 'running'] } });
    await run('2027-08-14', 4, 10);
    const runId = await queueLastMonthsRun(t.db, now);
    expect(runId).not.toBeNull();
    expect(await queueLastMonthsRun(t.db, now)).toBeNull();
    const queued = (await InvoiceRunRow.findByPk(runId!))!;
    expect([queued.periodFrom, queued.periodTo, queued.startedByPersonId]).toEqual(['2027-08-01', '2027-08-31', null]);
    await createInvoiceRunner(t.db, t.url).run(runId!);
    await settled(() => InvoiceRunRow.findByPk(runId!), ['queued', 'running']);
    const mails = await OutboxMessage.findAll({ where: { kind: 'mail' }, order: [['id', 'DESC']], limit: 20 });
    const office = mails.find((m) => (m.payload as { dedupeKey: string }).dedupeKey === `invoice-run-done-${runId}`);
    expect(office?.payload).toMatchObject({ subject: expect.stringMatching(/^Invoices of 2027-08: \d+ drafts? to check and issue$/) });
  });

  it('should remind the billing contacts of an overdue invoice, then not again within a week', async () => {
    const draftId = (await draftsOf('2027-08-01'))[0]!.id;
    const issued = (await (await admin('POST', `/invoices/${draftId}/issue`)).json()) as Invoice;
    const later = new Date(Date.parse(`${issued.dueOn}T00:00:00Z`) + 2 * 86_400_000);
    expect(await remindOverdueInvoices(t.db, later, t.url)).toBeGreaterThanOrEqual(1);
    const row = (await InvoiceRow.findByPk(issued.id))!;
    expect(row.remindedAt?.getTime()).toBe(later.getTime());
    const reminder = (await OutboxMessage.findAll({ where: { kind: 'mail' }, order: [['id', 'DESC']], limit: 20 })).find((m) => (m.payload as { dedupeKey: string }).dedupeKey.startsWith(`invoice-reminder-${issued.id}`));
    expect(reminder?.payload).toMatchObject({ subject: `Reminder: invoice ${issued.number} (${'€'}${(issued.totalMinor / 100).toFixed(2)}) was due on ${issued.dueOn}` });
    await remindOverdueInvoices(t.db, new Date(later.getTime() + 3 * 86_400_000), t.url);
    expect((await InvoiceRow.findByPk(issued.id))!.remindedAt?.getTime()).toBe(later.getTime());
    expect((await (await billing('GET', `/invoices/${issued.id}`)).json()) as Invoice).toMatchObject({ overdue: false });
  });
});

describe('reconciliation with the ledger', () => {
  /** Months no other test of this file uses: one per property run. */
  let nextMonth = 0;
  const monthOf = (n: number) => new Date(Date.UTC(2045, n, 1));

  it('should bill every partner debit and refund of a period exactly once, each invoice summing its ledger entries (property)', async () => {
    const thisMonth = new Date(Date.UTC(new Date().getUTCFullYear(), new Date().getUTCMonth(), 1));
    await fc.assert(
      fc.asyncProperty(
        fc.array(fc.record({ day: fc.integer({ min: 1, max: 28 }), cores: fc.integer({ min: 1, max: 64 }), hours: fc.integer({ min: 1, max: 30 }), refund: fc.boolean() }), { minLength: 1, maxLength: 5 }),
        async (jobs) => {
          const month = monthOf(nextMonth++);
          const ids: string[] = [];
          for (const j of jobs) {
            const r = await run(`${month.toISOString().slice(0, 8)}${String(j.day).padStart(2, '0')}`, j.cores, j.hours);
            ids.push(r.id);
            // A refund counts in the month it is granted (this one), not the run's.
            if (j.refund) await t.services.ledger.refund(actingAs(w.admin), campaignId, { runId: r.id, reason: 'property test' });
          }
          for (const start of [month, thisMonth]) {
            const from = start.toISOString().slice(0, 10);
            const to = new Date(Date.UTC(start.getUTCFullYear(), start.getUTCMonth() + 1, 0)).toISOString().slice(0, 10);
            await InvoiceRunRow.update({ state: 'failed', error: 'closed by the test', finishedAt: new Date() }, { where: { state: ['queued', 'running'] } });
            expect((await invoiceRun(from, to)).state).toBe('done');
          }
          // Each of these runs' debits and refunds is on exactly one live invoice, whose lines sum its entries.
          const entries = await LedgerEntry.findAll({ where: { runId: ids } });
          const billed = await t.db.sequelize.query<{ ledger_entry_id: string; invoice_id: string }>(
            `SELECT b.ledger_entry_id, b.invoice_id FROM invoice_entries b JOIN invoices v ON v.id = b.invoice_id AND v.state <> 'void' WHERE b.ledger_entry_id IN (:ids)`,
            { type: QueryTypes.SELECT, replacements: { ids: entries.map((e) => e.id) } },
          );
          expect(billed.map((b) => String(b.ledger_entry_id)).sort()).toEqual(entries.map((e) => String(e.id)).sort());
          for (const invoiceId of new Set(billed.map((b) => b.invoice_id))) {
            const [sum] = await t.db.sequelize.query<{ milli: string }>(
              `SELECT -sum(e.milli) AS milli FROM invoice_entries b JOIN ledger_entries e ON e.id = b.ledger_entry_id WHERE b.invoice_id = :invoiceId`,
              { type: QueryTypes.SELECT, replacements: { invoiceId } },
            );
            const invoice = (await InvoiceRow.findByPk(invoiceId))!;
            const lines = invoice.lines as unknown as { coreHoursMilli: number; amountMinor: number; discountMinor: number; taxMinor: number }[];
            expect(lines.reduce((a, l) => a + l.coreHoursMilli, 0)).toBe(Number(sum!.milli));
            expect(Number(invoice.totalMinor)).toBe(lines.reduce((a, l) => a + l.amountMinor - l.discountMinor + l.taxMinor, 0));
          }
        },
      ),
      { numRuns: 6 },
    );
  }, 180_000);
});
