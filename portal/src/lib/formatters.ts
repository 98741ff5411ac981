/**
 * How Localis writes times and numbers: times in the reader's zone, with the exact UTC instant
 * available on hover. `options` exist so tests (and later a user setting) can fix zone and locale.
 */
export interface FormatOptions {
  locale?: string;
  timeZone?: string;
}

type DateInput = string | Date | null | undefined;

function toDate(value: DateInput): Date | null {
  if (value === null || value === undefined || value === '') return null;
  const date = value instanceof Date ? value : new Date(value);
  return Number.isNaN(date.getTime()) ? null : date;
}

/** A date and time in the reader's zone, e.g. "3 Mar 2025, 14:05". Empty text for no date. */
export function formatLocalDateTime(value: DateInput, options: FormatOptions = {}): string {
  const date = toDate(value);
  if (!date) return '';
  return new Intl.DateTimeFormat(options.locale, {
    dateStyle: 'medium',
    timeStyle: 'short',
    timeZone: options.timeZone,
  }).format(date);
}

/** A calendar date in the reader's zone, e.g. "3 Mar 2025". */
export function formatLocalDate(value: DateInput, options: FormatOptions = {}): string {
  const date = toDate(value);
  if (!date) return '';
  return new Intl.DateTimeFormat(options.locale, { dateStyle: 'medium', timeZone: options.timeZone }).format(date);
}

/** The exact instant in UTC, for a title attribute: "2025-03-03 13:05:09 UTC". */
export function formatUtc(value: DateInput): string {
  const date = toDate(value);
  if (!date) return '';
  return `${date.toISOString().slice(0, 19).replace('T', ' ')} UTC`;
}

const DAY_MS = 24 * 60 * 60 * 1000;

/** Whole days from `now` until `value`, rounded up; negative once it has passed. */
export function daysUntil(value: DateInput, now: Date = new Date()): number | null {
  const date = toDate(value);
  if (!date) return null;
  return Math.ceil((date.getTime() - now.getTime()) / DAY_MS);
}

/** "in 3 days", "tomorrow", "today", "2 days ago": for deadlines like token expiry. */
export function formatDaysFromNow(value: DateInput, now: Date = new Date()): string {
  const days = daysUntil(value, now);
  if (days === null) return '';
  if (days === 0) return 'today';
  if (days === 1) return 'tomorrow';
  if (days > 1) return `in ${days} days`;
  if (days === -1) return 'yesterday';
  return `${-days} days ago`;
}

/** A count with its unit, pluralised in English: "1 token", "3 tokens". */
export function formatCount(count: number, singular: string, plural = `${singular}s`): string {
  return `${count.toLocaleString('en')} ${count === 1 ? singular : plural}`;
}

/**
 * A short form of an id for tables: the last 8 characters of a UUID (the demo's fixed ids differ
 * only there), the whole id when it is short. The full id goes in a title attribute.
 */
export function shortId(id: string): string {
  return /^[0-9a-f]{8}-[0-9a-f]{4}-/i.test(id) ? `…${id.slice(-8)}` : id.length > 24 ? `${id.slice(0, 23)}…` : id;
}

/** A sentence ending with its full stop, unless the writer already ended it (". ! ?", or "…"). */
export function endSentence(text: string): string {
  const trimmed = text.trimEnd();
  return /[.!?…]$/.test(trimmed) ? trimmed : `${trimmed}.`;
}
