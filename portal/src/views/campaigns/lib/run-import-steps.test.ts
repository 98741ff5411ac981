import type { ImportRow } from '@localis/shared';
import { describe, expect, it } from 'vitest';
import { runImportFixture as result } from '../test/run-import-fixture';
import { columnChoices, commitBlockers, enabledSteps, fieldsMappedTwice, mappingToSend, missingFieldLabel, rowStatus } from './run-import-steps';

function row(over: Partial<ImportRow> = {}): ImportRow {
  return { line: 2, externalJobId: '1', startedAt: '2027-02-01T08:00:00.000Z', endedAt: '2027-02-01T09:00:00.000Z', cores: 4, coreHours: 4, errors: [], duplicate: null, ...over };
}

describe('run-import-steps', () => {
  describe('columnChoices', () => {
    it('should take the person’s choice over the guess, and leave unknown columns unchosen', () => {
      expect(columnChoices(result(), { Start: 'ignore' })).toEqual({ JobID: 'externalJobId', Start: 'ignore', End: 'endedAt', AllocCPUS: 'cores', Partition: null });
    });
  });

  describe('fieldsMappedTwice', () => {
    it('should find a field two columns are mapped to, and not count ignored columns', () => {
      expect(fieldsMappedTwice({ a: 'cores', b: 'cores', c: 'ignore', d: 'ignore', e: null })).toEqual(['cores']);
      expect(fieldsMappedTwice({ a: 'cores', b: 'ignore' })).toEqual([]);
    });
  });

  describe('missingFieldLabel', () => {
    it('should name missing fields in words, alternatives included', () => {
      expect(missingFieldLabel('externalJobId')).toBe('Job id');
      expect(missingFieldLabel('endedAt or elapsedSeconds')).toBe('End or Elapsed (seconds or [D-]HH:MM:SS)');
    });
  });

  describe('rowStatus', () => {
    it('should put errors before duplicates', () => {
      expect(rowStatus(row())).toBe('ok');
      expect(rowStatus(row({ duplicate: 'recorded' }))).toBe('duplicate');
      expect(rowStatus(row({ duplicate: 'in-file', errors: ['cores: a run uses at least 1 core'] }))).toBe('error');
    });
  });

  describe('commitBlockers', () => {
    it('should ask for a preview first when there is none', () => {
      expect(commitBlockers(null, {}, false)).toEqual(['Preview the file first.']);
    });

    it('should find nothing in the way when every column is chosen and every row is clean', () => {
      const clean = result({ unknownColumns: [], mapping: { ...result().mapping, Partition: 'ignore' } });
      expect(commitBlockers(clean, columnChoices(clean, {}), false)).toEqual([]);
    });

    it('should name an unknown column that still waits for a choice', () => {
      expect(commitBlockers(result(), columnChoices(result(), {}), false)).toEqual(['Choose a field or "ignore" for the column “Partition”.']);
    });

    it('should list missing fields, bad rows, duplicates and a ledger that refuses', () => {
      const bad = result({
        missingFields: ['codeName'],
        summary: { rows: 3, valid: 0, withErrors: 2, duplicates: 1, coreHours: 12 },
        ledger: { remaining: 10, after: -2, allowed: false, overdraft: false },
      });
      const blockers = commitBlockers(bad, columnChoices(bad, { Partition: 'ignore' }), false);
      expect(blockers).toEqual([
        'No column gives Code name.',
        '2 rows have errors; correct the file and upload it again.',
        '1 row repeats a job id; remove it from the file.',
        'The grant does not cover these runs, even with the round’s overdraft.',
      ]);
    });

    it('should hold the commit while a newer preview is on its way', () => {
      const clean = result({ unknownColumns: [], mapping: { ...result().mapping, Partition: 'ignore' } });
      expect(commitBlockers(clean, columnChoices(clean, {}), true)).toHaveLength(1);
    });

    it('should refuse a field mapped from two columns', () => {
      const blockers = commitBlockers(result(), columnChoices(result(), { Partition: 'cores' }), false);
      expect(blockers).toEqual(['Map Cores from one column only.']);
    });

    it('should refuse a file without rows', () => {
      const empty = result({ unknownColumns: [], mapping: { ...result().mapping, Partition: 'ignore' }, rows: [], summary: { rows: 0, valid: 0, withErrors: 0, duplicates: 0, coreHours: 0 } });
      expect(commitBlockers(empty, columnChoices(empty, {}), false)).toEqual(['The file has no rows to record.']);
    });
  });

  describe('enabledSteps', () => {
    it('should open the preview once there is one, and the commit only when nothing blocks it', () => {
      expect(enabledSteps({ hasSource: true, result: null, blockers: ['Preview the file first.'], committed: false })).toEqual({ source: true, preview: false, commit: false });
      expect(enabledSteps({ hasSource: true, result: result(), blockers: ['x'], committed: false })).toEqual({ source: true, preview: true, commit: false });
      expect(enabledSteps({ hasSource: true, result: result(), blockers: [], committed: false })).toEqual({ source: true, preview: true, commit: true });
    });

    it('should close the way back once the runs are recorded', () => {
      expect(enabledSteps({ hasSource: true, result: result(), blockers: [], committed: true })).toEqual({ source: false, preview: false, commit: true });
    });
  });

  describe('mappingToSend', () => {
    it('should drop choices for columns the current file does not have', () => {
      expect(mappingToSend({ JobID: 'externalJobId', Gone: 'cores' }, ['JobID', 'Start'])).toEqual({ JobID: 'externalJobId' });
    });
  });
});
