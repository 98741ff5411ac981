/**
 * An ISO time as a `datetime-local` box shows it (the reader's local time, to the minute), and
 * back. A native box rather than the component library's date picker: that one drops typed
 * date-times in 24-hour mode, so only a mouse could set a time.
 */
export function toLocalInput(iso: string | null | undefined): string {
  if (!iso) return '';
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return '';
  const two = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${two(d.getMonth() + 1)}-${two(d.getDate())}T${two(d.getHours())}:${two(d.getMinutes())}`;
}

/** A `datetime-local` value (local time) as ISO UTC; '' when empty or not a time. */
export function fromLocalInput(value: string | null | undefined): string {
  if (!value) return '';
  const d = new Date(value);
  return Number.isNaN(d.getTime()) ? '' : d.toISOString();
}
