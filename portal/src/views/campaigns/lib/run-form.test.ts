import { RunInput } from '@localis/shared';
import { describe, expect, it } from 'vitest';
import { formatWallClock, parseNumberList, runFormOf, runInputOf, wallClockCoreHours, type RunForm } from './run-form';

function filled(): RunForm {
  return {
    ...runFormOf('cluster-a'),
    externalJobId: '981234',
    startedAt: '2027-02-01T08:00:00.000Z',
    endedAt: '2027-02-01T20:00:00.000Z',
    cores: 64,
    codeName: 'tmm-kernel',
    codeVersion: '1.4.2',
  };
}

describe('run-form', () => {
  describe('parseNumberList', () => {
    it('should read numbers separated by commas, semicolons and spaces', () => {
      expect(parseNumberList('8 12, 16;24')).toEqual([8, 12, 16, 24]);
      expect(parseNumberList(' 16.0,16.5 , -0.5 1e-3 ')).toEqual([16, 16.5, -0.5, 0.001]);
    });

    it('should give an empty list when nothing is typed', () => {
      expect(parseNumberList('')).toEqual([]);
      expect(parseNumberList(' ,  ')).toEqual([]);
    });

    it('should keep a word that is not a number as NaN so the schema refuses the list', () => {
      const list = parseNumberList('8 twelve 16');
      expect(list).toHaveLength(3);
      expect(list[1]).toBeNaN();
      expect(parseNumberList('0x10')[0]).toBeNaN();
    });
  });

  describe('runInputOf', () => {
    it('should give what RunInput accepts when the form is filled, with core-hours left to the server', () => {
      const input = runInputOf({ ...filled(), parameters: { sizes: '8 12', disorder: '16.5', energies: '', seeds: '1,2' } });
      expect(input).not.toHaveProperty('coreHours');
      const parsed = RunInput.parse(input);
      expect(parsed.parameters).toEqual({ sizes: [8, 12], disorder: [16.5], energies: [], seeds: [1, 2] });
      expect(parsed.machine).toBe('cluster-a');
    });

    it('should pass typed core-hours on', () => {
      expect(RunInput.parse(runInputOf({ ...filled(), coreHours: 700.5 })).coreHours).toBe(700.5);
    });

    it('should let the schema name the fields that are missing or wrong', () => {
      const result = RunInput.safeParse(runInputOf({ ...runFormOf('cluster-a'), parameters: { sizes: '8 x', disorder: '', energies: '', seeds: '' } }));
      const paths = result.error?.issues.map((i) => i.path.join('.')) ?? [];
      expect(paths).toEqual(expect.arrayContaining(['externalJobId', 'startedAt', 'endedAt', 'cores', 'codeName', 'codeVersion', 'parameters.sizes.1']));
    });
  });

  describe('wallClockCoreHours', () => {
    it('should multiply cores by the wall-clock hours when cores and times are given', () => {
      expect(wallClockCoreHours(filled())).toBe(768);
      expect(wallClockCoreHours({ cores: 3, startedAt: '2027-02-01T08:00:00Z', endedAt: '2027-02-01T08:00:10Z' })).toBe(0.008);
    });

    it('should give nothing while a value is missing or the run ends before it starts', () => {
      expect(wallClockCoreHours({ ...filled(), cores: null })).toBeNull();
      expect(wallClockCoreHours({ ...filled(), endedAt: '' })).toBeNull();
      expect(wallClockCoreHours({ ...filled(), endedAt: '2027-02-01T07:00:00Z' })).toBeNull();
    });
  });

  describe('formatWallClock', () => {
    it('should write days, hours and minutes that are not zero', () => {
      expect(formatWallClock('2027-02-01T08:00:00Z', '2027-02-01T20:00:00Z')).toBe('12 h');
      expect(formatWallClock('2027-02-01T08:00:00Z', '2027-02-03T09:05:00Z')).toBe('2 d 1 h 5 min');
      expect(formatWallClock('2027-02-01T08:00:00Z', '2027-02-01T08:45:00Z')).toBe('45 min');
      expect(formatWallClock('2027-02-01T08:00:00Z', '2027-02-01T07:00:00Z')).toBe('');
    });
  });
});
