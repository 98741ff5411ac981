import { describe, expect, it } from 'vitest';
import type { Run } from '@localis/shared';
import { coreHours, duration, formatBalance, formatRecordedRun, utc } from './format-runs';

const RUN: Run = {
  id: '5e000000-0000-4000-8000-000000000001',
  campaignId: '3c000000-0000-4000-8000-000000000001',
  externalJobId: '4711',
  machine: 'cluster-a',
  startedAt: '2027-02-01T08:00:00.000Z',
  endedAt: '2027-02-01T20:00:00.000Z',
  cores: 128,
  coreHours: 1536,
  refundedCoreHours: 0,
  codeName: 'tmm',
  codeVersion: '1.4.2',
  parameters: { sizes: [12, 16], disorder: [16.5, 17], energies: [0], seeds: [1, 2] },
  source: 'api',
  recordedByName: 'Ines Albrecht',
  createdAt: '2027-02-01T20:05:00.000Z',
};
const BALANCE = { granted: 10_000, used: 1_536, expired: 0, remaining: 8_464, overdraftPercent: 0, overdraftAllowance: 0 };

describe('format-runs', () => {
  describe('duration', () => {
    it('should use the largest units that matter', () => {
      expect(duration('2027-02-01T08:00:00Z', '2027-02-01T20:00:00Z')).toBe('12 h');
      expect(duration('2027-02-01T08:00:00Z', '2027-02-01T08:20:00Z')).toBe('20 min');
      expect(duration('2027-02-01T08:00:00Z', '2027-02-02T10:30:00Z')).toBe('1 d 2 h 30 min');
      expect(duration('2027-02-01T08:00:00Z', '2027-02-01T08:00:45Z')).toBe('45 s');
      expect(duration('2027-02-01T08:00:00Z', '2027-02-01T09:00:05Z')).toBe('1 h 5 s');
    });
  });

  describe('coreHours and utc', () => {
    it('should write core-hours with separators and up to three decimals', () => {
      expect(coreHours(1536)).toBe('1,536');
      expect(coreHours(1500.5)).toBe('1,500.5');
      expect(coreHours(0.0004)).toBe('0');
      expect(coreHours(-200.125)).toBe('-200.125');
    });

    it('should write times in UTC without milliseconds, whatever the offset given', () => {
      expect(utc('2027-02-01T09:00:00.250+01:00')).toBe('2027-02-01 08:00:00');
    });
  });

  describe('formatRecordedRun', () => {
    it('should show the worked example with its lists and the remaining grant', () => {
      expect(formatRecordedRun(RUN, BALANCE)).toBe(
        [
          'Recorded run 4711 on cluster-a: 1,536 core-hours charged',
          '  started     2027-02-01 08:00:00 UTC',
          '  ended       2027-02-01 20:00:00 UTC (12 h)',
          '  cores       128',
          '  code        tmm 1.4.2',
          '  sizes L     12, 16',
          '  disorder W  16.5, 17',
          '  energies E  0',
          '  seeds       1, 2',
          `  run id      ${RUN.id}`,
          'Remaining grant: 8,464 of 10,000 core-hours (used 1,536)',
        ].join('\n'),
      );
    });

    it('should leave out the balance when the ledger could not be read', () => {
      expect(formatRecordedRun(RUN, null)).not.toContain('Remaining');
    });
  });

  describe('formatBalance', () => {
    it('should name the expired core-hours when some expired', () => {
      expect(formatBalance({ ...BALANCE, expired: 100, remaining: 8_364 })).toBe('Remaining grant: 8,364 of 10,000 core-hours (used 1,536, expired 100)');
    });

    it('should explain an overdraft and its allowance when the remaining grant is below zero', () => {
      expect(formatBalance({ granted: 10_000, used: 10_500, expired: 0, remaining: -500, overdraftPercent: 10, overdraftAllowance: 1_000 })).toBe(
        'Remaining grant: -500 of 10,000 core-hours (used 10,500)\n' +
          'The grant is overdrawn: the round allows going 1,000 core-hours (10 %) below zero; further runs beyond that are refused.',
      );
    });
  });
});
