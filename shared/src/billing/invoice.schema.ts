import { z } from 'zod';

export const INVOICE_STATES = ['draft', 'issued', 'paid', 'void'] as const;
export const InvoiceState = z.enum(INVOICE_STATES).meta({ id: 'InvoiceState' });
export type InvoiceState = z.infer<typeof InvoiceState>;

/** A calendar month, e.g. 2027-03. */
export const YearMonth = z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/, 'a month is written YYYY-MM, e.g. 2027-03');

const Minor = z.number().int();

/** One priced quantity of one campaign's usage in one month (see `invoice-math.ts` for the rules). */
export const InvoiceLine = z
  .object({
    campaignId: z.uuid(),
    campaignTitle: z.string(),
    month: YearMonth,
    /** Index into the rate card's tiers; null for the card's own price (and for credits). */
    tier: z.number().int().min(0).nullable(),
    description: z.string(),
    /** Negative on a credit line: core-hours returned after an earlier month was invoiced. */
    coreHoursMilli: z.number().int(),
    unitPriceMinor: Minor,
    amountMinor: Minor,
    discountMinor: Minor,
    taxMinor: Minor,
  })
  .meta({ id: 'InvoiceLine' });
export type InvoiceLine = z.infer<typeof InvoiceLine>;

export const Invoice = z
  .object({
    id: z.uuid(),
    /** Given when the invoice is issued, in sequence without gaps; null on a draft. */
    number: z.string().nullable(),
    institutionId: z.uuid(),
    institutionName: z.string(),
    state: InvoiceState,
    currency: z.string().length(3),
    periodFrom: z.iso.date(),
    periodTo: z.iso.date(),
    lines: z.array(InvoiceLine),
    subtotalMinor: Minor,
    discountMinor: Minor,
    taxMinor: Minor,
    /** subtotal - discount + tax. */
    totalMinor: Minor,
    reverseCharge: z.boolean(),
    taxRateBasisPoints: z.number().int(),
    discountBasisPoints: z.number().int(),
    /** What the invoice must say besides its lines (reverse charge, credits); see `invoiceNotes`. */
    notes: z.array(z.string()),
    issuedOn: z.iso.date().nullable(),
    dueOn: z.iso.date().nullable(),
    paidAt: z.iso.datetime().nullable(),
    voidReason: z.string().nullable(),
    paymentReference: z.string().nullable(),
    /** Of the latest payment attempt through Stripe; null before one. */
    paymentState: z.enum(['pending', 'failed', 'succeeded']).nullable(),
    /** Issued, unpaid and past its due date. */
    overdue: z.boolean(),
    /** The credit note's number when an issued invoice was voided. */
    creditNoteNumber: z.string().nullable(),
    /** Whether its PDF is stored (issued invoices): `GET /invoices/:id/pdf`. */
    hasPdf: z.boolean(),
    createdAt: z.iso.datetime(),
  })
  .meta({ id: 'Invoice' });
export type Invoice = z.infer<typeof Invoice>;

/** The longest period one invoice run covers, in days counted inclusively. */
export const MAX_INVOICE_RUN_DAYS = 366;

const MS_PER_DAY = 86_400_000;
const daysFromTo = (from: string, to: string) => (Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / MS_PER_DAY + 1;

const isCalendarDay = (day: string) => {
  const t = Date.parse(`${day}T00:00:00Z`);
  return Number.isFinite(t) && new Date(t).toISOString().slice(0, 10) === day;
};

const isLastDayOfMonth = (day: string) => {
  const next = new Date(Date.parse(`${day}T00:00:00Z`) + MS_PER_DAY);
  return Number.isFinite(next.getTime()) && next.getUTCDate() === 1;
};

export const InvoiceRunInput = z
  .object({
    from: z.iso.date({ message: 'from must be a date, e.g. 2027-01-01' }),
    to: z.iso.date({ message: 'to must be a date, e.g. 2027-03-31' }),
  })
  .strict()
  .superRefine(({ from, to }, ctx) => {
    // Dates as YYYY-MM-DD compare correctly as text.
    // A date the calendar lacks has its own message from the field.
    if (!isCalendarDay(from) || !isCalendarDay(to)) return;
    if (!/-01$/.test(from)) {
      ctx.addIssue({ code: 'custom', path: ['from'], message: 'an invoice run starts on the first day of a month (tiers count whole calendar months)' });
    } else if (!isLastDayOfMonth(to)) {
      ctx.addIssue({ code: 'custom', path: ['to'], message: 'an invoice run ends on the last day of a month (tiers count whole calendar months)' });
    } else if (to < from) {
      ctx.addIssue({ code: 'custom', path: ['to'], message: `the period must end on or after its first day (${from})` });
    } else if (daysFromTo(from, to) > MAX_INVOICE_RUN_DAYS) {
      ctx.addIssue({
        code: 'custom',
        path: ['to'],
        message: `an invoice run covers at most ${MAX_INVOICE_RUN_DAYS} days; this period has ${daysFromTo(from, to)}: run it in shorter periods`,
      });
    }
  })
  .meta({ id: 'InvoiceRunInput' });
export type InvoiceRunInput = z.infer<typeof InvoiceRunInput>;

export const VoidInvoiceInput = z
  .object({
    reason: z
      .string({ message: 'give the reason for voiding the invoice' })
      .trim()
      .min(1, 'give the reason for voiding the invoice')
      .max(500, 'a reason may have at most 500 characters'),
  })
  .strict()
  .meta({ id: 'VoidInvoiceInput' });
export type VoidInvoiceInput = z.infer<typeof VoidInvoiceInput>;

export const InvoiceList = z.object({ items: z.array(Invoice) }).meta({ id: 'InvoiceList' });
export type InvoiceList = z.infer<typeof InvoiceList>;

export const InvoiceListQuery = z
  .object({
    state: InvoiceState.optional(),
    institutionId: z.uuid('institutionId must be an institution id').optional(),
    /** Only issued invoices past their due date. */
    overdue: z.enum(['true', 'false']).transform((v) => v === 'true').optional(),
  })
  .strict();
export type InvoiceListQuery = z.infer<typeof InvoiceListQuery>;

export const INVOICE_RUN_STATES = ['queued', 'running', 'done', 'failed'] as const;
export const InvoiceRun = z
  .object({
    id: z.uuid(),
    periodFrom: z.iso.date(),
    periodTo: z.iso.date(),
    state: z.enum(INVOICE_RUN_STATES),
    /** Draft invoices made or brought up to date. */
    drafted: z.number().int(),
    error: z.string().nullable(),
    createdAt: z.iso.datetime(),
    finishedAt: z.iso.datetime().nullable(),
  })
  .meta({ id: 'InvoiceRun' });
export type InvoiceRun = z.infer<typeof InvoiceRun>;
export const InvoiceRunList = z.object({ items: z.array(InvoiceRun) }).meta({ id: 'InvoiceRunList' });
export type InvoiceRunList = z.infer<typeof InvoiceRunList>;

/** Where a billing contact pays an issued invoice (the payment provider's page). */
export const PaymentLink = z.object({ url: z.url() }).meta({ id: 'PaymentLink' });
export type PaymentLink = z.infer<typeof PaymentLink>;

export const InvoiceRunJob = z.object({ runId: z.uuid() });
export type InvoiceRunJob = z.infer<typeof InvoiceRunJob>;

export const InvoiceIssuedJob = z.object({ invoiceId: z.uuid() });
export type InvoiceIssuedJob = z.infer<typeof InvoiceIssuedJob>;
