import { basename } from 'node:path';
import type { ArchiveProblem, ArchiveProblemCode, SignedTreeHead } from '@localis/shared';
import type { ArchiveCheckResult } from '@localis/shared/node';
import { formatSize } from './upload-format';
import type { LogCheck } from './verify-log';
import type { OfflineCampaign } from './verify-spec';

/** What the provenance log said about an archive, or about itself. */
export interface LogReport {
  portal: string;
  /** The archive's entry was found (always true for `--log`). */
  found: boolean;
  checks: LogCheck[];
  /** Said, but neither passed nor failed (e.g. not in the log yet). */
  notes: string[];
}

/**
 * Which group of checks a problem belongs to, so each group can say ok or name its problems. Codes
 * the checker does not give (an upload cancelled or abandoned) count with the container.
 */
const GROUP_OF: Partial<Record<ArchiveProblemCode, Group>> = {
  'size-mismatch': 'container',
  'checksum-mismatch': 'container',
  unreadable: 'container',
  'unsafe-path': 'container',
  'link-or-device': 'container',
  'duplicate-name': 'container',
  'too-many-entries': 'container',
  'too-large': 'container',
  'compression-bomb': 'container',
  'wrong-type': 'container',
  'manifest-missing': 'manifest',
  'manifest-invalid': 'manifest',
  'file-not-in-manifest': 'files',
  'file-missing': 'files',
  'file-size-mismatch': 'files',
  'file-checksum-mismatch': 'files',
  'table-invalid': 'tables',
  'outside-spec': 'plan',
  'run-not-in-campaign': 'plan',
  'campaign-mismatch': 'plan',
};
type Group = 'container' | 'manifest' | 'files' | 'tables' | 'plan';

const mark = (ok: boolean | null) => (ok === null ? '--  ' : ok ? 'ok  ' : 'FAIL');

function groupLine(group: Group, problems: ArchiveProblem[], okText: string): string {
  const mine = problems.filter((p) => (GROUP_OF[p.code] ?? 'container') === group);
  if (!mine.length) return `  ${mark(true)}  ${okText}`;
  return `  ${mark(false)}  ${okText.split(':')[0]}: ${mine.length} ${mine.length === 1 ? 'problem' : 'problems'} (${[...new Set(mine.map((p) => p.code))].join(', ')})`;
}

export interface ArchiveReportInput {
  path: string;
  format: string;
  result: ArchiveCheckResult;
  problems: ArchiveProblem[];
  campaign: OfflineCampaign | null;
  log: LogReport | null;
  /** Why the log was not asked, when it was not. */
  skipped: string | null;
}

/** What was checked, group by group, here and (when asked) against the provenance log. */
export function formatArchiveReport({ path, format, result, problems, campaign, log, skipped }: ArchiveReportInput): string {
  const m = result.manifest;
  const lines = [`${basename(path)}: ${format}, ${formatSize(result.sizeBytes)}, SHA-256 ${result.sha256 ?? '(not computed: reading stopped early)'}`];
  lines.push("Checked on this machine, with the checks of the portal's worker:");
  lines.push(
    groupLine(
      'container',
      problems,
      `archive: read to the end, ${result.entries.toLocaleString('en')} entries, ${formatSize(result.unpackedBytes)} unpacked; no links, devices or unsafe names; within the limits`,
    ),
  );
  lines.push(
    groupLine(
      'manifest',
      problems,
      m
        ? `manifest.json: campaign ${m.campaignId}, ${m.runIds.length} ${m.runIds.length === 1 ? 'run' : 'runs'}, ${m.code.name} ${m.code.version} (${m.code.commit}) on ${m.machine}`
        : 'manifest.json: valid',
    ),
  );
  if (m) lines.push(groupLine('files', problems, `files: all ${m.files.length} listed in manifest.json are there with their sizes and SHA-256, and no other`));
  else lines.push(`  ${mark(null)}  files: not compared with the manifest (there is no valid one)`);
  const tables = result.tables.map((t) => `${t.path} (${t.kind}, ${t.rows.toLocaleString('en')} rows)`);
  lines.push(groupLine('tables', problems, `result tables: ${tables.length ? tables.join(', ') : 'none'}`));
  if (campaign) {
    const what = [campaign.id ? 'campaign id' : null, campaign.machine ? 'machine' : null, 'sizes, disorder and energies'].filter(Boolean).join(', ');
    lines.push(groupLine('plan', problems, `campaign's plan (${campaign.name}): ${what}; runs are checked by the portal`));
  } else {
    lines.push(`  ${mark(null)}  campaign's plan: not compared (give --campaign-spec spec.json)`);
  }

  if (log) {
    lines.push(`Checked against the provenance log of ${log.portal}:`);
    for (const c of log.checks) lines.push(`  ${mark(c.ok)}  ${c.detail}`);
    for (const n of log.notes) lines.push(`  ${mark(null)}  ${n}`);
  } else if (skipped) {
    lines.push(`Not checked: ${skipped}.`);
  }
  const logFailed = log?.checks.some((c) => !c.ok) ?? false;
  if (!problems.length && !logFailed) {
    lines.push(log?.found ? 'No problems: this file is the archive the portal verified and logged.' : 'No problems found.');
  }
  return lines.join('\n');
}

/** `localis verify --log`: the head and what was checked of it. */
export function formatLogReport(report: LogReport, head: SignedTreeHead): string {
  const lines = [`Provenance log of ${report.portal}: ${head.treeSize.toLocaleString('en')} entries, root ${head.rootHash}`];
  for (const c of report.checks) lines.push(`  ${mark(c.ok)}  ${c.detail}`);
  for (const n of report.notes) lines.push(`  ${mark(null)}  ${n}`);
  return lines.join('\n');
}
