import { z } from 'zod';
import { formatCoreHours, Ledger, toMilli, type Run } from '@localis/shared';
import { table } from './format-estimate';

/** The part of GET /campaigns/:id/ledger the CLI shows; the entries are left to the portal. */
export const LedgerBalance = Ledger.pick({ granted: true, used: true, expired: true, remaining: true, overdraftPercent: true, overdraftAllowance: true });
export type LedgerBalance = z.infer<typeof LedgerBalance>;

/** Core-hours as the portal writes them: up to three decimals, thousands separated. */
export const coreHours = (x: number): string => formatCoreHours(toMilli(x));

/** `2027-02-01 08:00:00` in UTC: sortable, and the same on every login node whatever its zone. */
export const utc = (iso: string): string => new Date(iso).toISOString().replace('T', ' ').replace(/\.\d+Z$/, '');

/** A wall-clock span in the largest units that matter: `12 h`, `1 d 2 h 30 min`, `45 s`. */
export function duration(startedAt: string, endedAt: string): string {
  let seconds = Math.round((new Date(endedAt).getTime() - new Date(startedAt).getTime()) / 1000);
  const parts: string[] = [];
  for (const [unit, size] of [['d', 86_400], ['h', 3600], ['min', 60]] as const) {
    if (seconds >= size) {
      parts.push(`${Math.floor(seconds / size)} ${unit}`);
      seconds %= size;
    }
  }
  if (seconds || !parts.length) parts.push(`${seconds} s`);
  return parts.join(' ');
}

/** The run the portal recorded, and what is left of the grant when the ledger could be read. */
export function formatRecordedRun(run: Run, balance: LedgerBalance | null): string {
  const { parameters: p } = run;
  const lists: [string, number[]][] = [
    ['sizes L', p.sizes],
    ['disorder W', p.disorder],
    ['energies E', p.energies],
    ['seeds', p.seeds],
  ];
  const rows: [string, string][] = [
    ['started', `${utc(run.startedAt)} UTC`],
    ['ended', `${utc(run.endedAt)} UTC (${duration(run.startedAt, run.endedAt)})`],
    ['cores', run.cores.toLocaleString('en')],
    ['code', `${run.codeName} ${run.codeVersion}`],
    ...lists.filter(([, values]) => values.length).map(([label, values]): [string, string] => [label, values.join(', ')]),
    ['run id', run.id],
  ];
  const width = Math.max(...rows.map(([label]) => label.length)) + 2;
  return [
    `Recorded run ${run.externalJobId} on ${run.machine}: ${coreHours(run.coreHours)} core-hours charged`,
    ...rows.map(([label, value]) => `  ${label.padEnd(width)}${value}`),
    ...(balance ? [formatBalance(balance)] : []),
  ].join('\n');
}

export function formatBalance(b: LedgerBalance): string {
  const line = `Remaining grant: ${coreHours(b.remaining)} of ${coreHours(b.granted)} core-hours (used ${coreHours(b.used)}${b.expired ? `, expired ${coreHours(b.expired)}` : ''})`;
  if (b.remaining >= 0) return line;
  return `${line}\nThe grant is overdrawn: the round allows going ${coreHours(b.overdraftAllowance)} core-hours (${b.overdraftPercent} %) below zero; further runs beyond that are refused.`;
}

/** One line per run, newest first as the portal sorts them, and a total. */
export function formatRunList(runs: Run[], total: number): string {
  if (!runs.length) return 'No runs are recorded for this campaign yet.';
  const anyRefund = runs.some((r) => r.refundedCoreHours > 0);
  const header = ['job', 'machine', 'started (UTC)', 'wall-clock', 'cores', 'core-hours', ...(anyRefund ? ['refunded'] : []), 'code'];
  const rows = runs.map((r) => [
    r.externalJobId,
    r.machine,
    utc(r.startedAt),
    duration(r.startedAt, r.endedAt),
    r.cores.toLocaleString('en'),
    coreHours(r.coreHours),
    ...(anyRefund ? [r.refundedCoreHours ? coreHours(r.refundedCoreHours) : ''] : []),
    `${r.codeName} ${r.codeVersion}`,
  ]);
  const right = header.map((h) => ['wall-clock', 'cores', 'core-hours', 'refunded'].includes(h));
  const charged = runs.reduce((sum, r) => sum + toMilli(r.coreHours) - toMilli(r.refundedCoreHours), 0);
  const shown = runs.length === total ? `${total.toLocaleString('en')} run${total === 1 ? '' : 's'}` : `the latest ${runs.length.toLocaleString('en')} of ${total.toLocaleString('en')} runs`;
  return [...table(header, rows, right), '', `${shown}: ${formatCoreHours(charged)} core-hours charged${anyRefund ? ' after refunds' : ''}`].join('\n');
}
