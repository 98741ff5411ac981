import { errors, type Invoice, type InvoiceLine } from '@localis/shared';
import { printable } from './invoice-pdf-fonts';
import { formatAmount, formatBasisPoints, formatCoreHours, formatDay, formatMonth } from './invoice-pdf-format';

export interface InvoicePdfInput {
  invoice: Invoice;
  /** The consortium office that bills, e.g. "Coldwater Localization Network — consortium office". */
  issuer: { name: string; address: string[]; email: string; vatId?: string };
  partner: { name: string; country: string; billingEmail: string | null };
  kind?: 'invoice' | 'credit-note';
  /**
   * The day the credit note was issued (the invoice's voiding day, YYYY-MM-DD). The invoice
   * contract does not carry it; without it the credit note shows no date of its own.
   */
  creditNoteIssuedOn?: string | null;
}

export interface LabelledValue {
  label: string;
  value: string;
}

export interface TableRow {
  campaign: string;
  month: string;
  description: string;
  coreHours: string;
  unitPrice: string;
  amount: string;
}

/** Everything the PDF prints, as text, already formatted; the layout only places it. */
export interface InvoicePdfView {
  title: string;
  subtitle: string | null;
  /** The day the document speaks for (YYYY-MM-DD); the PDF's dates come from it, so a re-render is identical. */
  documentDay: string;
  issuer: { name: string; lines: string[] };
  partner: { name: string; lines: string[] };
  meta: LabelledValue[];
  rows: TableRow[];
  totals: LabelledValue[];
  grandTotal: LabelledValue;
  notes: string[];
  footer: string[];
}

export const ROUNDING_RULE =
  'Rounding: amounts per line rounded half away from zero to the minor unit; the totals are sums of the rounded lines.';
export const TAX_CAUTION =
  "Amounts are computed from the consortium's core-hour ledger; this document is not tax advice. The finance office and local law decide the tax treatment.";

const dash = '—';

/** The description without the "Campaign, 2027-03: " that the table already shows in its own columns. */
function describe(line: InvoiceLine): string {
  const prefix = `${line.campaignTitle}, ${line.month}: `;
  const text = line.description.startsWith(prefix) ? line.description.slice(prefix.length) : line.description;
  const tier = line.tier === null || /\btier\b/i.test(text) ? '' : ` (tier ${line.tier + 1})`;
  return `${text.charAt(0).toUpperCase()}${text.slice(1)}${tier}`;
}

function countryName(code: string): string {
  try {
    const name = new Intl.DisplayNames('en', { type: 'region' }).of(code.toUpperCase());
    return name && name !== code.toUpperCase() ? `${name} (${code.toUpperCase()})` : code;
  } catch {
    return code; // not a region code: print what the institution record says
  }
}

function invoiceNumberOrDraft(invoice: Invoice): string {
  return invoice.number ?? 'draft';
}

/**
 * The text of the invoice, or of the credit note that cancels it. A credit note repeats the
 * invoice's lines and figures as they were issued, so each can be matched to the invoice line by
 * line; its title and "Total credited" say which way the money goes.
 */
export function invoicePdfView(input: InvoicePdfInput): InvoicePdfView {
  const { invoice, issuer, partner } = input;
  const credit = input.kind === 'credit-note';
  if (credit && (!invoice.creditNoteNumber || !invoice.number)) {
    throw errors.conflict(`invoice ${invoiceNumberOrDraft(invoice)} has no credit note: only an issued invoice that was voided has one`);
  }
  const money = (minor: number) => formatAmount(minor, invoice.currency);
  const invoiceDay = invoice.issuedOn ?? invoice.createdAt.slice(0, 10);
  const period = `${formatDay(invoice.periodFrom)} – ${formatDay(invoice.periodTo)}`;

  const meta: LabelledValue[] = credit
    ? [
        ...(input.creditNoteIssuedOn ? [{ label: 'Credit note date', value: formatDay(input.creditNoteIssuedOn) }] : []),
        { label: 'Invoice date', value: invoice.issuedOn ? formatDay(invoice.issuedOn) : dash },
        { label: 'Period', value: period },
        { label: 'Payment reference', value: invoice.paymentReference ?? dash },
      ]
    : [
        { label: 'Issue date', value: invoice.issuedOn ? formatDay(invoice.issuedOn) : 'not issued yet' },
        { label: 'Due date', value: invoice.dueOn ? formatDay(invoice.dueOn) : dash },
        { label: 'Period', value: period },
        { label: 'Payment reference', value: invoice.paymentReference ?? dash },
      ];

  const totals: LabelledValue[] = [{ label: 'Subtotal', value: money(invoice.subtotalMinor) }];
  if (invoice.discountBasisPoints !== 0 || invoice.discountMinor !== 0) {
    totals.push({ label: `Discount (${formatBasisPoints(invoice.discountBasisPoints)})`, value: money(-invoice.discountMinor) });
  }
  totals.push({
    label: invoice.reverseCharge ? 'Tax: reverse charge, see notes' : `Tax (${formatBasisPoints(invoice.taxRateBasisPoints)})`,
    value: money(invoice.taxMinor),
  });

  const notes = [
    ...(credit ? [`This credit note cancels invoice ${invoice.number} in full; the total credited is ${money(invoice.totalMinor)}.`] : []),
    ...(credit && invoice.voidReason ? [`Reason: ${invoice.voidReason}`] : []),
    ...invoice.notes,
  ];

  const view: InvoicePdfView = {
    title: credit ? `Credit note ${invoice.creditNoteNumber}` : invoice.number ? `Invoice ${invoice.number}` : 'Invoice (draft)',
    subtitle: credit ? `Cancels invoice ${invoice.number}${invoice.issuedOn ? ` of ${formatDay(invoice.issuedOn)}` : ''}` : invoice.number ? null : 'Draft: not issued, not payable',
    documentDay: credit ? (input.creditNoteIssuedOn ?? invoiceDay) : invoiceDay,
    issuer: {
      name: issuer.name,
      lines: [...issuer.address, issuer.email, ...(issuer.vatId ? [`VAT ID ${issuer.vatId}`] : [])],
    },
    partner: { name: partner.name, lines: [countryName(partner.country), ...(partner.billingEmail ? [partner.billingEmail] : [])] },
    meta,
    rows: invoice.lines.map((line) => ({
      campaign: line.campaignTitle,
      month: formatMonth(line.month),
      description: describe(line),
      coreHours: formatCoreHours(line.coreHoursMilli),
      unitPrice: formatAmount(line.unitPriceMinor, invoice.currency),
      amount: money(line.amountMinor),
    })),
    totals,
    grandTotal: { label: credit ? `Total credited (${invoice.currency})` : `Total (${invoice.currency})`, value: money(invoice.totalMinor) },
    notes,
    footer: [ROUNDING_RULE, TAX_CAUTION],
  };
  return printableView(view);
}

/** Every string the PDF prints, in characters the embedded fonts can draw. */
function printableView(view: InvoicePdfView): InvoicePdfView {
  const p = printable;
  const pairs = (list: LabelledValue[]) => list.map(({ label, value }) => ({ label: p(label), value: p(value) }));
  return {
    ...view,
    title: p(view.title),
    subtitle: view.subtitle === null ? null : p(view.subtitle),
    issuer: { name: p(view.issuer.name), lines: view.issuer.lines.map(p) },
    partner: { name: p(view.partner.name), lines: view.partner.lines.map(p) },
    meta: pairs(view.meta),
    rows: view.rows.map((r) => ({
      campaign: p(r.campaign),
      month: r.month,
      description: p(r.description),
      coreHours: r.coreHours,
      unitPrice: r.unitPrice,
      amount: r.amount,
    })),
    totals: pairs(view.totals),
    grandTotal: pairs([view.grandTotal])[0],
    notes: view.notes.map(p),
    footer: view.footer,
  };
}
