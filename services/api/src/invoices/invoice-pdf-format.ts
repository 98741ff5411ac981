import { formatMinor } from '@localis/shared';
import { isDrawable, printable } from './invoice-pdf-fonts';

const MONTHS = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'];

/** Digits grouped by thousands: "1234567" -> "1,234,567". */
const groupThousands = (digits: string) => digits.replace(/\B(?=(\d{3})+(?!\d))/g, ',');

/**
 * Milli-core-hours as core-hours with all three decimals, from the integer's digits (no float):
 * 1234567 -> "1,234.567", -2500 -> "-2.500".
 */
export function formatCoreHours(coreHoursMilli: number): string {
  const milli = BigInt(coreHoursMilli);
  const text = (milli < 0n ? -milli : milli).toString().padStart(4, '0');
  return `${milli < 0n ? '-' : ''}${groupThousands(text.slice(0, -3))}.${text.slice(-3)}`;
}

/** Basis points as a percentage without trailing zeros: 1900 -> "19%", 2050 -> "20.5%", 5 -> "0.05%". */
export function formatBasisPoints(basisPoints: number): string {
  const bp = BigInt(basisPoints);
  const text = (bp < 0n ? -bp : bp).toString().padStart(3, '0');
  const fraction = text.slice(-2).replace(/0+$/, '');
  return `${bp < 0n ? '-' : ''}${text.slice(0, -2)}${fraction ? `.${fraction}` : ''}%`;
}

/** "2027-04-05" -> "5 April 2027": day, month name and year cannot be read in the wrong order. */
export function formatDay(day: string): string {
  const [year, month, date] = day.split('-');
  return `${Number(date)} ${MONTHS[Number(month) - 1]} ${year}`;
}

/** "2027-03" -> "Mar 2027". */
export function formatMonth(yearMonth: string): string {
  const [year, month] = yearMonth.split('-');
  return `${MONTHS[Number(month) - 1].slice(0, 3)} ${year}`;
}

/**
 * An amount through `formatMinor`, the one formatter of money. Where the currency's sign is a
 * character Lato's latin files lack (₹, ₩, ₪ ...), the ISO code stands in for it: "INR 1,234.56".
 */
export function formatAmount(amountMinor: number, currency: string): string {
  const text = formatMinor(amountMinor, currency);
  if ([...text].every(isDrawable)) return text;
  const withCode = text.replace(/[^\d.,\-\s]+/gu, (symbol) => ([...symbol].every(isDrawable) ? symbol : `${currency}\u00a0`));
  return printable(withCode.trim());
}
