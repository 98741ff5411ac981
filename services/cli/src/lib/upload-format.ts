import type { Archive, ArchiveProblem } from '@localis/shared';
import { formatRate } from './upload-throughput';

/** "40.0 MiB", "1.00 GiB", "512 bytes": sizes in binary units, three significant digits. */
export function formatSize(bytes: number): string {
  const units = ['bytes', 'KiB', 'MiB', 'GiB', 'TiB'];
  let value = bytes;
  let unit = 0;
  while (value >= 1024 && unit < units.length - 1) {
    value /= 1024;
    unit++;
  }
  if (unit === 0) return `${bytes.toLocaleString('en')} ${bytes === 1 ? 'byte' : 'bytes'}`;
  return `${value >= 100 ? value.toFixed(0) : value >= 10 ? value.toFixed(1) : value.toFixed(2)} ${units[unit]}`;
}

/** One line per problem, naming its code and the file it is about: `  file-missing results/a.csv: "results/a.csv" is listed …`. */
export function formatProblem(p: ArchiveProblem): string {
  return `  ${p.code}${p.path ? ` ${p.path}` : ''}: ${p.message}`;
}

/** What this run of `localis upload` did, for the summary and `--json`. */
export interface UploadSummary {
  partCount: number;
  /** Parts the store held before this run: not sent again. */
  partsAlreadyStored: number;
  alreadyStoredBytes: number;
  partsSent: number;
  sentBytes: number;
  /** True when this run went on with an archive an earlier run started. */
  resumed: boolean;
  /** Seconds spent sending and checksumming (not waiting for the check). */
  seconds: number;
}

export interface UploadStats {
  /** Largest resident set of this process so far (process.resourceUsage().maxRSS). */
  peakRssBytes: number;
  sentBytes: number;
  seconds: number;
  megabytesPerSecond: number;
}

export function uploadStats(summary: UploadSummary, usage: NodeJS.ResourceUsage = process.resourceUsage()): UploadStats {
  return {
    // maxRSS is in kibibytes.
    peakRssBytes: usage.maxRSS * 1024,
    sentBytes: summary.sentBytes,
    seconds: Number(summary.seconds.toFixed(3)),
    megabytesPerSecond: Number((summary.seconds > 0 ? summary.sentBytes / 1e6 / summary.seconds : 0).toFixed(2)),
  };
}

export function formatStats(stats: UploadStats): string {
  return (
    `stats: peak RSS ${(stats.peakRssBytes / 1e6).toFixed(1)} MB, sent ${stats.sentBytes.toLocaleString('en')} bytes (${formatSize(stats.sentBytes)}) ` +
    `in ${stats.seconds.toFixed(1)} s, ${stats.megabytesPerSecond.toFixed(2)} MB/s`
  );
}

function sentLine(s: UploadSummary): string {
  const speed = s.seconds > 0 && s.sentBytes > 0 ? `, ${formatRate(s.sentBytes / s.seconds)}` : '';
  const sent = `${s.partsSent.toLocaleString('en')} of ${s.partCount.toLocaleString('en')} ${s.partCount === 1 ? 'part' : 'parts'} (${formatSize(s.sentBytes)}) in ${s.seconds.toFixed(1)} s${speed}`;
  if (!s.partsAlreadyStored) return sent;
  return `${sent}; ${s.partsAlreadyStored.toLocaleString('en')} ${s.partsAlreadyStored === 1 ? 'was' : 'were'} stored by an earlier attempt`;
}

const utc = (iso: string) => `${new Date(iso).toISOString().replace('T', ' ').replace(/\.\d+Z$/, '')} UTC`;

/** The readable result: the archive, its checksum and what was sent; the outcome of the check when waited for. */
export function formatUploaded(archive: Archive, sha256: string, summary: UploadSummary | null): string {
  const head =
    archive.state === 'verified'
      ? `Verified: ${archive.fileName} (${formatSize(archive.sizeBytes)}) is in the campaign's archives`
      : `Uploaded: ${archive.fileName} (${formatSize(archive.sizeBytes)}); the portal checks it now`;
  const rows: [string, string][] = [
    ['archive', archive.id],
    ['campaign', archive.campaignId],
    ['SHA-256', sha256],
  ];
  if (summary) rows.push(['sent', sentLine(summary)]);
  if (archive.runIds.length) rows.push(['runs', archive.runIds.join(', ')]);
  if (archive.checkedAt && archive.state === 'verified') rows.push(['checked', utc(archive.checkedAt)]);
  const width = Math.max(...rows.map(([k]) => k.length));
  const lines = [head, ...rows.map(([k, v]) => `  ${k.padEnd(width)}  ${v}`)];
  if (archive.state !== 'verified') lines.push("Its state is on the campaign's page in the portal; once verified, `localis verify <archive>` checks its entry in the provenance log.");
  return lines.join('\n');
}

/** The message of a rejected archive: a line per problem. */
export function rejectionMessage(archive: Archive): string {
  const n = archive.problems.length;
  return [`${archive.fileName} was rejected by the portal's check (${n} ${n === 1 ? 'problem' : 'problems'}):`, ...archive.problems.map(formatProblem)].join('\n');
}
