/** A month as `<input type="month">` gives it: "2027-03". */
const MONTH = /^(\d{4})-(0[1-9]|1[0-2])$/;

export function isMonth(value: string): boolean {
  return MONTH.test(value);
}

/** The first day of a month: "2027-03" -> "2027-03-01". */
export function firstDayOf(month: string): string {
  return `${month}-01`;
}

/** The last day of a month, leap years counted: "2027-02" -> "2027-02-28", "2028-02" -> "2028-02-29". */
export function lastDayOf(month: string): string {
  const [, year, mm] = MONTH.exec(month)!;
  // Day 0 of the next month is the last day of this one.
  const days = new Date(Date.UTC(Number(year), Number(mm), 0)).getUTCDate();
  return `${month}-${String(days).padStart(2, '0')}`;
}

/** The month before the one `now` falls in (in the reader's zone): what an invoice run usually covers. */
export function previousMonth(now: Date = new Date()): string {
  const d = new Date(now.getFullYear(), now.getMonth() - 1, 1);
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}`;
}

/** The first day of the next month as YYYY-MM-DD (in the reader's zone): when a new rate card usually starts. */
export function firstOfNextMonth(now: Date = new Date()): string {
  const d = new Date(now.getFullYear(), now.getMonth() + 1, 1);
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-01`;
}
