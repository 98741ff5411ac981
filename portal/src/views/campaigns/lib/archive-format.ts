import type { ArchiveKind, ArchiveState } from '@localis/shared';

/** How the archives page writes transfer figures and checksums. */

/** "12.3 MB/s": decimal megabytes, as network speeds are usually given. */
export function formatSpeed(bytesPerSecond: number): string {
  if (!Number.isFinite(bytesPerSecond) || bytesPerSecond <= 0) return '—';
  const mb = bytesPerSecond / 1e6;
  return `${mb < 10 ? mb.toFixed(1) : Math.round(mb).toLocaleString('en')} MB/s`;
}

/** "about 40 s", "about 3 min", "about 1 h 20 min"; a dash while it cannot be told. */
export function formatTimeLeft(seconds: number | null): string {
  if (seconds === null || !Number.isFinite(seconds) || seconds < 0) return '—';
  if (seconds < 60) return `about ${Math.max(1, Math.round(seconds))} s`;
  const minutes = Math.round(seconds / 60);
  if (minutes < 60) return `about ${minutes} min`;
  const hours = Math.floor(minutes / 60);
  const rest = minutes % 60;
  return `about ${hours} h${rest ? ` ${rest} min` : ''}`;
}

/** Whole per cent done, 100 only when every byte is there. */
export function percentOf(done: number, total: number): number {
  if (total <= 0) return 0;
  return done >= total ? 100 : Math.min(99, Math.floor((done / total) * 100));
}

/** The start of a SHA-256, enough to tell two files apart by eye; the whole goes in a title. */
export function shortSha(sha256: string): string {
  return `${sha256.slice(0, 12)}…`;
}

/** Run ids as typed: one per line, or separated by commas or spaces. */
export function parseRunIds(text: string): string[] {
  return text
    .split(/[\s,;]+/)
    .map((s) => s.trim())
    .filter(Boolean);
}

/** The file types a kind accepts, for the file picker. */
export const ACCEPT_OF_KIND: Record<ArchiveKind, string> = {
  results: '.tar.gz,.tgz,.tar,.zip',
  'science-case': '.pdf,application/pdf',
  'pilot-timings': '.csv,text/csv',
};

/** States in which the archive is still moving: the page asks again every few seconds. */
export const MOVING_STATES: readonly ArchiveState[] = ['uploading', 'received', 'checking'];

type TagSeverity = 'success' | 'info' | 'secondary' | 'warn' | 'danger';
export const STATE_SEVERITY: Record<ArchiveState, TagSeverity> = {
  uploading: 'info',
  received: 'secondary',
  checking: 'info',
  verified: 'success',
  rejected: 'danger',
};
