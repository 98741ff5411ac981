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
    createdAt: z.iso.datetime(),
  })
  .meta({ id: 'Invoice' });
export type Invoice = z.infer<typeof Invoice>;

/** The longest period one invoice run covers, in days counted inclusively. */
export const MAX_INVOICE_RUN_DAYS = 366;

const MS_PER_DAY = 86_400_000;
const daysFromTo = (from: string, to: string) => (Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / MS_PER_DAY + 1;

export const InvoiceRunInput = z
  .object({
    from: z.iso.date({ message: 'from must be a date, e.g. 2027-01-01' }),
    to: z.iso.date({ message: 'to must be a date, e.g. 2027-03-31' }),
  })
  .strict()
  .superRefine(({ from, to }, ctx) => {
    // Dates as YYYY-MM-DD compare correctly as text.
    if (to < from) {
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
