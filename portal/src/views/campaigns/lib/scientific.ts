/**
 * A number as a physicist writes it: "4.2" or "1.23 × 10⁻⁵" (mantissa and power of ten apart, so
 * a template can set the exponent as a superscript). Plain notation between 0.01 and 10 000.
 */
export function scientific(x: number, digits = 3): { mantissa: string; exponent: number | null } {
  if (!Number.isFinite(x) || x === 0) return { mantissa: Number.isFinite(x) ? '0' : '—', exponent: null };
  const abs = Math.abs(x);
  if (abs >= 0.01 && abs < 10_000) return { mantissa: minus(String(Number(x.toPrecision(digits)))), exponent: null };
  const [m, e] = x.toExponential(digits - 1).split('e');
  return { mantissa: minus(String(Number(m))), exponent: Number(e) };
}

/** The same as one line of text: "1.23 × 10^-5" becomes "1.23 × 10⁻⁵". */
export function scientificText(x: number, digits = 3): string {
  const { mantissa, exponent } = scientific(x, digits);
  return exponent === null ? mantissa : `${mantissa} × 10${superscript(exponent)}`;
}

const SUPERSCRIPT: Record<string, string> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹', '.': '·' };

export function superscript(n: number | string): string {
  return String(n)
    .split('')
    .map((c) => SUPERSCRIPT[c] ?? c)
    .join('');
}

function minus(text: string): string {
  return text.replace(/^-/, '−');
}
