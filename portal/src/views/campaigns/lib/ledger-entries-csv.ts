import { LEDGER_KIND_LABELS, toCsv, type LedgerEntry } from '@localis/shared';

/** The columns of the entries CSV, in the order of the table on screen. */
const COLUMNS = ['createdAt', 'kind', 'coreHours', 'balanceAfter', 'externalJobId', 'counterpartTitle', 'reason', 'overdraft', 'actorName', 'id'] as const;

/**
 * A ledger's entries as CSV, oldest first as the ledger keeps them: numbers stay numbers (core-hours
 * with up to three decimals), times are ISO UTC, the kind in words as on screen.
 */
export function ledgerEntriesCsv(entries: readonly LedgerEntry[]): string {
  const rows = entries.map((e) => ({
    createdAt: e.createdAt,
    kind: LEDGER_KIND_LABELS[e.kind],
    coreHours: e.coreHours,
    balanceAfter: e.balanceAfter,
    externalJobId: e.externalJobId,
    counterpartTitle: e.counterpartTitle,
    reason: e.reason,
    overdraft: e.overdraft ? 'yes' : 'no',
    actorName: e.actorName,
    id: e.id,
  }));
  return toCsv(rows, [...COLUMNS]);
}

/** A file name that says whose ledger and when: "ledger-<title>-2027-04-01.csv". */
export function ledgerCsvFileName(title: string, now: Date = new Date()): string {
  const slug = title
    .toLowerCase()
    .normalize('NFKD')
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60);
  return `ledger-${slug || 'campaign'}-${now.toISOString().slice(0, 10)}.csv`;
}
