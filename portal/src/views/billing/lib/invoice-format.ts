import { formatMinor, type Invoice, type InvoiceState } from '@localis/shared';
import { formatLocalDate, type FormatOptions } from '../../../lib/formatters';

/**
 * A calendar day of an invoice (issued on, due on, a period's ends). It names a day, not an
 * instant, so it is written as that day in every zone: '2027-03-31' is 31 Mar 2027 in New York too.
 */
export function formatCalendarDay(day: string | null | undefined, options: FormatOptions = {}): string {
  return day ? formatLocalDate(`${day}T00:00:00Z`, { ...options, timeZone: 'UTC' }) : '';
}

/** "2027-03" as a reader says it: "Mar 2027". */
export function formatMonth(month: string, options: FormatOptions = {}): string {
  const date = new Date(`${month}-01T00:00:00Z`);
  if (Number.isNaN(date.getTime())) return month;
  return new Intl.DateTimeFormat(options.locale, { month: 'short', year: 'numeric', timeZone: 'UTC' }).format(date);
}

/** An invoice's period in months: "Mar 2027", or "Jan 2027 – Mar 2027" for several. */
export function formatPeriod(from: string, to: string, options: FormatOptions = {}): string {
  const first = formatMonth(from.slice(0, 7), options);
  const last = formatMonth(to.slice(0, 7), options);
  return first === last ? first : `${first} – ${last}`;
}

/**
 * Core-hours from the thousandths the invoice counts, every one of them shown: "1,234.500
 * core-hours". Written from the integer, so no float rounds a line away from what was billed.
 * Credit lines carry the typographic minus, as the ledger writes them.
 */
export function formatCoreHoursMilli(milli: number): string {
  const abs = Math.abs(milli);
  const whole = Math.trunc(abs / 1000).toLocaleString('en');
  const fraction = String(abs % 1000).padStart(3, '0');
  return `${milli < 0 ? '−' : ''}${whole}.${fraction} core-hours`;
}

/** A rate in basis points as a percentage: 2100 -> "21 %", 550 -> "5.5 %", 1 -> "0.01 %". */
export function formatBasisPoints(bp: number): string {
  return `${(bp / 100).toLocaleString('en', { maximumFractionDigits: 2 })} %`;
}

/** What heads an invoice: its number once issued, "Draft" before. */
export function invoiceNumberText(invoice: Pick<Invoice, 'number'>): string {
  return invoice.number ?? 'Draft';
}

/** The invoice's money, always through formatMinor in the invoice's own currency. */
export function invoiceMoney(invoice: Pick<Invoice, 'currency'>, amountMinor: number): string {
  return formatMinor(amountMinor, invoice.currency);
}

/** A unit price per core-hour: "€2.50 per core-hour". */
export function formatUnitPrice(amountMinor: number, currency: string): string {
  return `${formatMinor(amountMinor, currency)} per core-hour`;
}

type Severity = 'secondary' | 'info' | 'success' | 'warn' | 'danger' | 'contrast';

/** An invoice state as a tag: words and an icon, so it reads without its colour. */
export const INVOICE_STATE_LOOK: Record<InvoiceState, { label: string; severity: Severity; icon: string }> = {
  draft: { label: 'Draft', severity: 'secondary', icon: 'pi pi-pencil' },
  issued: { label: 'Issued', severity: 'info', icon: 'pi pi-send' },
  paid: { label: 'Paid', severity: 'success', icon: 'pi pi-check' },
  void: { label: 'Void', severity: 'contrast', icon: 'pi pi-ban' },
};
