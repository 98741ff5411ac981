/** The filters of the audit log, as they appear in the URL. */
export type AuditFilter = 'action' | 'targetType' | 'targetId' | 'actorPersonId' | 'from' | 'to';

/** A picked calendar day as the instant the filter means: its first or its last millisecond, local time. */
export function dayBoundary(day: Date, edge: 'start' | 'end'): string {
  const d = new Date(day);
  if (edge === 'start') d.setHours(0, 0, 0, 0);
  else d.setHours(23, 59, 59, 999);
  return d.toISOString();
}

export function parseInstant(value: string | undefined): Date | null {
  if (!value) return null;
  const d = new Date(value);
  return Number.isNaN(d.getTime()) ? null : d;
}
