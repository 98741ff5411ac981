/**
 * Quantities with their units, at the precision a reader can use: three significant digits for
 * large amounts (the exact figure belongs in a title attribute or the CSV), whole numbers below.
 */

const GIB = 1024 ** 3;

function significant(x: number, digits = 3): string {
  return typographicMinus(Number(x.toPrecision(digits)).toLocaleString('en', { maximumFractionDigits: 20 }));
}

/** Negative figures carry the typographic minus "−", as the ledger writes them; "-0" is just "0". */
function typographicMinus(text: string): string {
  if (/^-0(\.0*)?$/.test(text)) return text.slice(1);
  return text.replace(/^-/, '−');
}

/** "850 core-hours", "20.4 core-hours", "12.3 k core-hours", "4.56 M core-hours", "0.25 core-hours". */
export function formatCoreHours(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '';
  const abs = Math.abs(value);
  if (abs === 0) return '0 core-hours';
  if (abs < 1) return `${significant(value, 2)} core-hours`;
  // Small totals keep three digits: a request is the estimate rounded up, and 20 next to 21 confuses.
  if (abs < 100) return `${significant(value)} core-hours`;
  if (abs < 10_000) return `${typographicMinus(Math.round(value).toLocaleString('en'))} core-hours`;
  if (abs < 1e6) return `${significant(value / 1e3)} k core-hours`;
  if (abs < 1e9) return `${significant(value / 1e6)} M core-hours`;
  return `${significant(value / 1e9)} G core-hours`;
}

/** Every digit, for a title attribute or a figure that must add up: "1,234,567 core-hours". */
export function formatCoreHoursExact(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '';
  return `${typographicMinus(Math.round(value).toLocaleString('en'))} core-hours`;
}

/**
 * Ledger amounts to the milli-core-hour the ledger keeps: "1,234.5 core-hours". A balance must
 * add up to its entries, so nothing is rounded away beyond the third decimal.
 */
export function formatCoreHoursPrecise(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '';
  // Written from the absolute value: -0.0001 must not show as "-0".
  const text = Math.abs(value).toLocaleString('en', { maximumFractionDigits: 3 });
  return `${value < 0 && text !== '0' ? '−' : ''}${text} core-hours`;
}

/** A ledger entry's effect on the balance, always with its sign: "+500 core-hours", "−12.5 core-hours". */
export function formatCoreHoursSigned(value: number | null | undefined): string {
  const text = formatCoreHoursPrecise(value);
  return text && !text.startsWith('−') && text !== '0 core-hours' ? `+${text}` : text;
}

/** Memory in binary units, three significant digits: "512 MiB", "1.5 GiB", "3.2 TiB". */
export function formatBytes(bytes: number | null | undefined): string {
  if (bytes === null || bytes === undefined || !Number.isFinite(bytes)) return '';
  const units = ['B', 'KiB', 'MiB', 'GiB', 'TiB', 'PiB'];
  let value = bytes;
  let unit = 0;
  while (Math.abs(value) >= 1024 && unit < units.length - 1) {
    value /= 1024;
    unit += 1;
  }
  return `${unit === 0 ? Math.round(value) : significant(value)} ${units[unit]}`;
}

/** Memory in GiB whatever its size, for figures compared with a node's GiB. */
export function formatGiB(bytes: number): string {
  return `${significant(bytes / GIB)} GiB`;
}

/** A share 0..1 as a percentage: "42 %", "0.3 %", "< 0.1 %". */
export function formatShare(share: number): string {
  if (!Number.isFinite(share)) return '';
  const pct = share * 100;
  if (pct === 0) return '0 %';
  if (pct < 0.1) return '< 0.1 %';
  return `${pct < 10 ? significant(pct, 2) : Math.round(pct)} %`;
}
