import type { RunImportResult } from '@localis/shared';

/**
 * The preview of a one-job scheduler CSV (JobID, Start, End, AllocCPUS, Partition): the
 * Partition column is not known, the row is valid and fits the grant.
 */
export function runImportFixture(overrides: Partial<RunImportResult> = {}): RunImportResult {
  return {
    dryRun: true,
    committed: false,
    columns: ['JobID', 'Start', 'End', 'AllocCPUS', 'Partition'],
    mapping: { JobID: 'externalJobId', Start: 'startedAt', End: 'endedAt', AllocCPUS: 'cores', Partition: null },
    unknownColumns: ['Partition'],
    missingFields: [],
    rows: [{ line: 2, externalJobId: '981234', startedAt: '2027-02-01T08:00:00.000Z', endedAt: '2027-02-01T20:00:00.000Z', cores: 64, coreHours: 768, errors: [], duplicate: null }],
    summary: { rows: 1, valid: 1, withErrors: 0, duplicates: 0, coreHours: 768 },
    ledger: { remaining: 10_000, after: 9_232, allowed: true, overdraft: false },
    runIds: [],
    ...overrides,
  };
}
