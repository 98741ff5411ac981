import { isIsoCurrency, minorUnitDigits } from '@localis/shared';

/** What a typed amount became: whole minor units, or why it cannot be read. */
export type MoneyInput = { ok: true; minor: number } | { ok: false; message: string };

/** An amount of 1234 minor units written in major units, as an example: "12.34", "1234", "1.234". */
export function minorToMajor(minor: number, currency: string): string {
  const digits = minorUnitDigits(currency);
  const negative = minor < 0;
  const text = String(Math.abs(minor)).padStart(digits + 1, '0');
  const whole = text.slice(0, text.length - digits);
  const fraction = digits > 0 ? `.${text.slice(text.length - digits)}` : '';
  return `${negative ? '-' : ''}${whole}${fraction}`;
}

const example = (currency: string) => minorToMajor(1234, currency);

/**
 * A price typed in major units (12.34 EUR) as the whole minor units the api keeps (1234 cents),
 * with the currency's own ISO 4217 digits: 2 for EUR, 0 for JPY, 3 for BHD. Read from the digits
 * alone, never through a float, so 0.29 stays 29. More decimals than the currency has is refused,
 * not rounded: a price is what the person typed or nothing.
 */
export function majorToMinor(text: string, currency: string): MoneyInput {
  if (!isIsoCurrency(currency)) return { ok: false, message: 'choose the currency first' };
  const typed = text.trim();
  if (typed === '') return { ok: false, message: `enter an amount, e.g. ${example(currency)}` };
  if (typed.startsWith('-')) return { ok: false, message: 'an amount cannot be negative' };
  if (/^\d+,\d+$/.test(typed)) return { ok: false, message: `write the decimals after a point, e.g. ${example(currency)}` };
  const match = /^(\d+)(?:\.(\d+))?$/.exec(typed);
  if (!match) return { ok: false, message: `write the amount in digits, e.g. ${example(currency)}` };
  const [, whole, fraction = ''] = match;
  const digits = minorUnitDigits(currency);
  if (fraction.length > digits) {
    return {
      ok: false,
      message: digits === 0 ? `${currency} has no minor unit: write whole amounts, e.g. ${example(currency)}` : `${currency} has ${digits} decimals: write at most ${digits} after the point, e.g. ${example(currency)}`,
    };
  }
  const minor = BigInt(whole) * 10n ** BigInt(digits) + BigInt(fraction.padEnd(digits, '0') || '0');
  if (minor > BigInt(Number.MAX_SAFE_INTEGER)) return { ok: false, message: 'this amount is too large' };
  return { ok: true, minor: Number(minor) };
}
