import Stripe from 'stripe';
import { QueryTypes } from 'sequelize';
import type { Settings } from '@localis/shared';
import type { Services } from '@localis/api/services';
import type { Database } from '@localis/api/db';
import { InvoiceRow, InvoiceRunRow, RateCardRow } from '@localis/api/db';
import { createInvoiceRunner } from '@localis/api/invoices/invoice-runner';
import { adminContext } from './seed-context';

export interface InvoiceCounts {
  invoices: number;
}

const ORRIN = '1a000000-0000-4000-8000-000000000003';
/** The partner's prices: EUR 0.06 a core-hour, 0.05 beyond 20 000 in a month; reverse charge (a business in another EU country). Invented. */
const ORRIN_CARD = { currency: 'EUR', unitPriceMinor: 6, tiers: [{ fromCoreHours: 20_000, unitPriceMinor: 5 }], discountBasisPoints: 0, taxRateBasisPoints: 0, reverseCharge: true, paymentTermsDays: 30 };

const ymd = (d: Date) => d.toISOString().slice(0, 10);
const monthStart = (d: Date, plus = 0) => new Date(Date.UTC(d.getUTCFullYear(), d.getUTCMonth() + plus, 1));

/**
 * The partner's invoices, through the same services as the office would use: a rate card from the
 * closed round's first month, one invoice run per whole month of its campaign's runs (up to last
 * month), each invoice issued on the 3rd of the month after, and all but the newest paid on the
 * payment provider's page (our Stripe fake), the payment reaching Localis as the provider's signed
 * event. The newest stays open for the demo (and the browser test) to pay. Loading again changes
 * nothing: cards, runs and invoices are looked up before anything is made.
 */
export async function loadInvoices(db: Database, services: Services, settings: Settings, report: InvoiceCounts, now = new Date()): Promise<void> {
  const admin = adminContext();
  if (!(await RateCardRow.findOne({ where: { institutionId: ORRIN } }))) {
    await services.rateCards.create(admin, ORRIN, { ...ORRIN_CARD, effectiveFrom: ymd(monthStart(now, -8)) });
  }
  const [first] = await db.sequelize.query<{ ended: Date | null }>(
    `SELECT min(r.ended_at) AS ended FROM runs r JOIN campaigns c ON c.id = r.campaign_id JOIN research_groups g ON g.id = c.group_id WHERE g.institution_id = :partner`,
    { type: QueryTypes.SELECT, replacements: { partner: ORRIN } },
  );
  if (!first?.ended) return;
  const runner = createInvoiceRunner(db);
  const periods: { from: string; to: string }[] = [];
  for (let m = monthStart(new Date(first.ended)); m < monthStart(now); m = monthStart(m, 1)) periods.push({ from: ymd(m), to: ymd(new Date(monthStart(m, 1).getTime() - 86_400_000)) });

  const invoices: InvoiceRow[] = [];
  for (const period of periods) {
    let invoice = await InvoiceRow.findOne({ where: { institutionId: ORRIN, periodFrom: period.from, periodTo: period.to } });
    if (!invoice) {
      const done = await InvoiceRunRow.findOne({ where: { periodFrom: period.from, periodTo: period.to, state: 'done' } });
      if (!done) {
        const run = await services.invoices.requestRun(admin, period);
        await runner.run(run.id);
      }
      invoice = await InvoiceRow.findOne({ where: { institutionId: ORRIN, periodFrom: period.from, periodTo: period.to } });
      if (!invoice) continue; // a month without usage
    }
    if (invoice.state === 'draft') {
      const issuedOn = ymd(new Date(monthStart(new Date(`${period.from}T00:00:00Z`), 1).getTime() + 2 * 86_400_000));
      await services.invoices.issue(admin, invoice.id, { issuedOn });
      report.invoices++;
    }
    invoices.push((await InvoiceRow.findByPk(invoice.id))!);
  }

  for (const invoice of invoices.slice(0, -1)) {
    if (invoice.state !== 'issued') continue;
    await payOnProviderPage(services, settings, invoice.id);
  }
}

/** Pay as the billing contact would, with the test card that succeeds, and hand Localis the provider's signed event. */
async function payOnProviderPage(services: Services, settings: Settings, invoiceId: string): Promise<void> {
  const url = await services.invoicePayments.paymentPage(invoiceId);
  const res = await fetch(url, { method: 'POST', body: new URLSearchParams({ card_number: '4242424242424242' }), redirect: 'manual' });
  if (res.status !== 303 && res.status !== 200) throw new Error(`the payment page of the demo invoice answered ${res.status}`);
  const stripeInvoiceId = (await InvoiceRow.findByPk(invoiceId))!.stripeInvoiceId;
  const fake = `http://127.0.0.1:${settings.STRIPE_PORT}`;
  const { data } = (await (await fetch(`${fake}/_fake/events?type=invoice.paid`)).json()) as { data: { object_id: string; event: unknown }[] };
  const sent = data.find((d) => d.object_id === stripeInvoiceId)?.event;
  if (!sent) throw new Error(`the payment provider sent no invoice.paid event for demo invoice ${invoiceId}`);
  // The app is not serving yet while the scenario loads: its webhook handler takes the event here, signature and all.
  const payload = JSON.stringify(sent);
  const signature = new Stripe(settings.STRIPE_SECRET_KEY).webhooks.generateTestHeaderString({ payload, secret: settings.STRIPE_WEBHOOK_SECRET });
  await services.stripeWebhook(Buffer.from(payload), signature);
}
