import type { SpotCheck } from '@localis/shared';
import { describe, expect, it } from 'vitest';
import { tableCsv } from './analysis-export';
import { spotCheckFixture as check, spotCheckRowFixture as row } from './spot-check-fixture';
import {
  campaignSpotCheckSummary,
  formatWithError,
  formatZ,
  isSpotCheckMoving,
  rowDecimals,
  spotCheckCommand,
  spotCheckJson,
  spotCheckPercent,
  spotCheckSummary,
  spotCheckTable,
} from './spot-check-table';

const CAMPAIGN = '3a4b5c6d-7e8f-4a0b-9c1d-2e3f4a5b6c7d';

describe('spot-check-table', () => {
  describe('the command', () => {
    it('should repeat the point with localis tmm, every option the kernel was given', () => {
      expect(spotCheckCommand(row())).toBe('localis tmm --dim 3 --width 6 --disorder 15 --energy 0 --precision 0.005 --seed 2718281');
    });

    it('should write numbers as the CLI reads them: every digit, an ASCII minus, exponents as JavaScript writes them', () => {
      const command = spotCheckCommand(row({ W: 16.512345678901234, E: -0.5, precision: 2.5e-7, dimension: 2, L: 16 }));
      expect(command).toBe('localis tmm --dim 2 --width 16 --disorder 16.512345678901234 --energy -0.5 --precision 2.5e-7 --seed 2718281');
      expect(command).not.toContain('−');
    });
  });

  describe('the numbers on screen', () => {
    it('should sign z with two decimals and a true minus', () => {
      expect(formatZ(0.4747)).toBe('+0.47');
      expect(formatZ(-3.4)).toBe('−3.40');
      expect(formatZ(0)).toBe('0.00');
      expect(formatZ(-0.001)).toBe('0.00');
      expect(formatZ(Number.POSITIVE_INFINITY)).toBe('+∞');
      expect(formatZ(Number.NaN)).toBe('—');
    });

    it('should write both values of a row to the decimals of the smaller error, so they compare digit by digit', () => {
      const r = row();
      const decimals = rowDecimals(r);
      expect(decimals).toBe(4);
      expect(formatWithError(r.reported, r.reportedErr, decimals)).toBe('0.5734 ± 0.0021');
      expect(formatWithError(r.recomputed, r.recomputedErr, decimals)).toBe('0.5751 ± 0.0029');
      expect(rowDecimals(row({ reportedErr: 0, recomputedErr: 0 }))).toBe(4);
    });
  });

  describe('the summary', () => {
    it('should count the points within 3 standard errors, and say how many are flagged', () => {
      expect(spotCheckSummary(check().rows)).toBe('2 of 3 points within 3 standard errors; 1 flagged.');
      expect(spotCheckSummary([row()])).toBe('1 of 1 point within 3 standard errors.');
      expect(spotCheckSummary([])).toBeNull();
    });

    it('should add up the archives that have points', () => {
      const checks = [check(), check({ rows: [row()], flagged: 0 }), check({ state: 'not-applicable', rows: [], reason: 'the kernel has real hopping (class AI)' })];
      expect(campaignSpotCheckSummary(checks)).toBe('Over 2 archives, 3 of 4 points within 3 standard errors; 1 flagged.');
      expect(campaignSpotCheckSummary([check({ state: 'queued', rows: [] })])).toBeNull();
    });
  });

  describe('the state', () => {
    it('should keep polling for queued and running checks only, and count progress in whole percent', () => {
      expect(['queued', 'running', 'done', 'not-applicable', 'failed'].map((state) => isSpotCheckMoving({ state: state as SpotCheck['state'] }))).toEqual([true, true, false, false, false]);
      expect(spotCheckPercent({ done: 2, total: 3 })).toBe(66);
      expect(spotCheckPercent(null)).toBeNull();
      expect(spotCheckPercent({ done: 0, total: 0 })).toBeNull();
    });
  });

  describe('the downloads', () => {
    const newer = check({ id: '1b2c3d4e-5f6a-4b7c-8d9e-0f1a2b3c4d5e', archiveId: '2c3d4e5f-6a7b-4c8d-9e0f-1a2b3c4d5e6f', archiveFileName: 'L8, "second".tar.gz', rows: [row({ L: 8 })], flagged: 0 });
    const table = spotCheckTable([newer, check(), check({ state: 'failed', rows: [], reason: 'the kernel stopped' })]);

    it('should hold every row of every archive, newest archive first, with the raw numbers and the command', () => {
      expect(table.rows).toHaveLength(4);
      expect(table.rows.map((r) => r.archive)).toEqual(['L8, "second".tar.gz', 'w15-18-L6-16.tar.gz', 'w15-18-L6-16.tar.gz', 'w15-18-L6-16.tar.gz']);
      expect(table.rows[2]).toMatchObject({ W: 16.5, z: -4.1, flagged: true, command: spotCheckCommand(row({ W: 16.5 })) });
    });

    it('should write CSV with plain keys as the header and quote what needs it (RFC 4180)', () => {
      const lines = tableCsv(table).split('\r\n');
      expect(lines[0]).toBe('archive,archiveId,L,W,E,reported,reportedErr,recomputed,recomputedErr,z,flagged,dimension,precision,seed,slices,seconds,command');
      expect(lines[1]).toBe(
        '"L8, ""second"".tar.gz",2c3d4e5f-6a7b-4c8d-9e0f-1a2b3c4d5e6f,8,15,0,0.5734,0.0021,0.5751,0.0029,0.4747,false,3,0.005,2718281,48000,11.2,' +
          'localis tmm --dim 3 --width 8 --disorder 15 --energy 0 --precision 0.005 --seed 2718281',
      );
      expect(lines[3]).toContain(',-4.1,true,');
      expect(lines).toHaveLength(6);
    });

    it('should write JSON with the campaign, the definition of z and the rows keyed like the CSV', () => {
      const parsed = JSON.parse(spotCheckJson(table, CAMPAIGN));
      expect(parsed).toMatchObject({ campaignId: CAMPAIGN, table: 'spot-checks', limit: 3, columns: table.columns.map((c) => c.key) });
      expect(parsed.definition).toContain('|z| > 3');
      expect(parsed.rows).toHaveLength(4);
      expect(parsed.rows[0]).toEqual(Object.fromEntries(table.columns.map((c) => [c.key, table.rows[0][c.key]])));
    });
  });
});
