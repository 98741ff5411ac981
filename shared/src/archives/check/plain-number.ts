/**
 * A plain decimal number read straight from the bytes of a CSV line, without making a string.
 *
 * Result tables can hold tens of millions of rows; a general CSV parser (csv-parse) builds a
 * string per cell and an array per row and runs about ten times slower than this on numeric
 * tables. The five columns the analysis reads are plain numbers, unquoted, so a byte scanner is
 * enough: `[+-]digits[.digits][(e|E)[+-]digits]` (or `.digits`), spaces or tabs around it.
 *
 * Exact: with at most 15 significant digits and a power of ten up to 10^22, one IEEE multiplication
 * or division of two exactly represented numbers gives the correctly rounded value (Clinger's fast
 * path, "How to read floating point numbers accurately", PLDI 1990). Anything else goes to
 * `Number()` on the text, so every value equals what `Number()` would give.
 */

export const NumberStatus = {
  Ok: 0,
  /** Not a plain number (letters, NaN, Infinity, two dots, …). */
  Invalid: 1,
  /** A quoted value: not accepted in the five checked columns. */
  Quoted: 2,
  Empty: 3,
} as const;
export type NumberStatus = (typeof NumberStatus)[keyof typeof NumberStatus];

const POWERS_OF_TEN = Array.from({ length: 23 }, (_, i) => Number(`1e${i}`));
const MAX_EXACT_DIGITS = 15;

/**
 * How the last read went (one shared object rather than a result object per cell): `end` is the
 * delimiter after the number (`,`, `\r`, `\n`) or the end of the bytes.
 */
export const lastRead: { end: number; status: NumberStatus } = { end: 0, status: NumberStatus.Ok };

const isDigit = (c: number) => c >= 48 && c <= 57;

/** Reads the number at `at` (before `end`); sets `lastRead`. */
export function readPlainNumber(bytes: Uint8Array, at: number, end: number): number {
  let p = at;
  let c = p < end ? bytes[p] : 10;
  while (c === 32 || c === 9) c = ++p < end ? bytes[p] : 10;
  if (c === 44 || c === 10 || c === 13) return stop(p, NumberStatus.Empty);
  if (c === 34) return stop(p, NumberStatus.Quoted);
  const start = p;
  let negative = false;
  if (c === 45 || c === 43) {
    negative = c === 45;
    c = ++p < end ? bytes[p] : 10;
  }
  let mantissa = 0;
  let digits = 0; // significant digits seen
  let exponent = 0;
  let sawDigit = false;
  while (isDigit(c)) {
    sawDigit = true;
    if (mantissa !== 0 || c !== 48) {
      digits++;
      if (digits <= MAX_EXACT_DIGITS) mantissa = mantissa * 10 + (c - 48);
    }
    c = ++p < end ? bytes[p] : 10;
  }
  if (c === 46) {
    c = ++p < end ? bytes[p] : 10;
    while (isDigit(c)) {
      sawDigit = true;
      if (mantissa !== 0 || c !== 48) {
        digits++;
        if (digits <= MAX_EXACT_DIGITS) {
          mantissa = mantissa * 10 + (c - 48);
          exponent--;
        }
      } else {
        exponent--;
      }
      c = ++p < end ? bytes[p] : 10;
    }
  }
  if (!sawDigit) return stopAtDelimiter(bytes, p, end, NumberStatus.Invalid);
  if (c === 101 || c === 69) {
    c = ++p < end ? bytes[p] : 10;
    let exponentNegative = false;
    if (c === 45 || c === 43) {
      exponentNegative = c === 45;
      c = ++p < end ? bytes[p] : 10;
    }
    if (!isDigit(c)) return stopAtDelimiter(bytes, p, end, NumberStatus.Invalid);
    let written = 0;
    while (isDigit(c)) {
      if (written < 100_000) written = written * 10 + (c - 48);
      c = ++p < end ? bytes[p] : 10;
    }
    exponent += exponentNegative ? -written : written;
  }
  const numberStop = p;
  while (c === 32 || c === 9) c = ++p < end ? bytes[p] : 10;
  if (c !== 44 && c !== 10 && c !== 13) return stopAtDelimiter(bytes, p, end, NumberStatus.Invalid);
  lastRead.end = p;
  lastRead.status = NumberStatus.Ok;
  let value: number;
  if (digits <= MAX_EXACT_DIGITS && exponent >= -22 && exponent <= 22) {
    value = exponent >= 0 ? mantissa * POWERS_OF_TEN[exponent] : mantissa / POWERS_OF_TEN[-exponent];
    return negative ? -value : value;
  }
  // Rare: many digits or a large exponent. Number() reads the same grammar exactly.
  return Number(Buffer.from(bytes.buffer, bytes.byteOffset + start, numberStop - start).toString('latin1'));
}

function stop(at: number, status: NumberStatus): number {
  lastRead.end = at;
  lastRead.status = status;
  return NaN;
}

function stopAtDelimiter(bytes: Uint8Array, at: number, end: number, status: NumberStatus): number {
  let p = at;
  while (p < end && bytes[p] !== 44 && bytes[p] !== 10 && bytes[p] !== 13) p++;
  return stop(p, status);
}
