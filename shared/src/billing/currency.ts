import { code as currencyRecord } from 'currency-codes';
import { errors } from '../errors';

/**
 * Codes of ISO 4217 list one whose minor unit is "N.A.": precious metals, bond-market units, the
 * SDR, the test code XTS and XXX ("no currency"). currency-codes reports them with 0 digits, which
 * would let an invoice be written in gold or in "no currency"; `currency.test.ts` checks this list
 * against the copy of list one that currency-codes ships.
 */
export const NO_MINOR_UNIT_CODES: readonly string[] = ['XAG', 'XAU', 'XBA', 'XBB', 'XBC', 'XBD', 'XDR', 'XPD', 'XPT', 'XSU', 'XTS', 'XUA', 'XXX'];

/**
 * Codes list one marks as funds (IsFund="true"): units of account and settlement variants
 * (e.g. CLF, USN), not money a partner pays an invoice in. currency-codes' data does not mark
 * them, its copy of list one does; the same test keeps the two in step.
 */
export const FUND_CODES: readonly string[] = ['BOV', 'CHE', 'CHW', 'CLF', 'COU', 'MXV', 'USN', 'UYI'];

const NOT_FOR_INVOICES = new Set([...NO_MINOR_UNIT_CODES, ...FUND_CODES]);

/** An ISO 4217 currency a partner can be invoiced in: upper case, listed, with a real minor unit. */
export function isIsoCurrency(code: string): boolean {
  // currency-codes upper-cases what it is given; the contract is upper case only.
  return /^[A-Z]{3}$/.test(code) && !NOT_FOR_INVOICES.has(code) && currencyRecord(code) !== undefined;
}

/** How many decimals the currency's minor unit has (ISO 4217): 0 for JPY, 2 for EUR, 3 for BHD. */
export function minorUnitDigits(code: string): number {
  if (!isIsoCurrency(code)) throw errors.invalid(`${code} is not an ISO 4217 currency`);
  return currencyRecord(code)!.digits;
}

/** "12345" with 2 digits -> "123.45"; built from the digits, so no amount passes through a float. */
function decimalString(minor: bigint, digits: number): `${number}` {
  const negative = minor < 0n;
  const text = (negative ? -minor : minor).toString().padStart(digits + 1, '0');
  const whole = text.slice(0, text.length - digits);
  const fraction = digits > 0 ? `.${text.slice(text.length - digits)}` : '';
  return `${negative ? '-' : ''}${whole}${fraction}` as `${number}`;
}

const formatters = new Map<string, Intl.NumberFormat>();

function formatterFor(locale: string, currency: string, digits: number): Intl.NumberFormat {
  const key = `${locale}|${currency}`;
  let formatter = formatters.get(key);
  if (!formatter) {
    // The ISO digits, not the locale's habits: an invoice shows every minor unit it charges.
    formatter = new Intl.NumberFormat(locale, { style: 'currency', currency, minimumFractionDigits: digits, maximumFractionDigits: digits });
    formatters.set(key, formatter);
  }
  return formatter;
}

/**
 * An amount in minor units as a reader expects it: formatMinor(123456, 'EUR') -> "€1,234.56",
 * formatMinor(1235, 'JPY') -> "¥1,235". Intl receives an exact decimal string, so amounts beyond
 * 2^53 (as bigint) print every digit.
 */
export function formatMinor(amountMinor: number | bigint, currency: string, locale = 'en'): string {
  if (typeof amountMinor === 'number' && !Number.isSafeInteger(amountMinor)) {
    throw errors.invalid(`an amount in minor units must be a whole number, not ${amountMinor}`);
  }
  const digits = minorUnitDigits(currency);
  return formatterFor(locale, currency, digits).format(decimalString(BigInt(amountMinor), digits));
}
