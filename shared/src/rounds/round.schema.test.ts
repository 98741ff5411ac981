import { describe, expect, it } from 'vitest';
import { RoundInput, RoundPatch, roundStatus } from './round.schema';

const input = {
  name: 'Spring 2027',
  opensAt: '2027-01-15T00:00:00Z',
  closesAt: '2027-03-31T23:59:59Z',
  pools: [{ machine: 'cluster-a', coreHours: 2_000_000 }, { machine: 'gpu-b', coreHours: 500_000 }],
};
const issuesOf = (value: unknown, schema: typeof RoundInput | typeof RoundPatch = RoundInput) =>
  (schema.safeParse(value).error?.issues ?? []).map((i) => [i.path, i.message]);

describe('round schemas', () => {
  describe('RoundInput dates', () => {
    it('should accept a round when it closes after it opens', () => {
      expect(RoundInput.parse(input)).toEqual(input);
    });

    it('should refuse at closesAt when the round closes before it opens', () => {
      expect(issuesOf({ ...input, closesAt: '2027-01-01T00:00:00Z' })).toEqual([[['closesAt'], 'a round must close after it opens']]);
    });

    it('should refuse at closesAt when the round closes the instant it opens', () => {
      expect(issuesOf({ ...input, closesAt: input.opensAt })).toEqual([[['closesAt'], 'a round must close after it opens']]);
    });

    it('should compare instants, not text, when the dates carry different offsets', () => {
      // 2027-01-15T00:30:00+02:00 is 2027-01-14T22:30:00Z, before the opening.
      expect(issuesOf({ ...input, closesAt: '2027-01-15T00:30:00+02:00' })).toEqual([[['closesAt'], 'a round must close after it opens']]);
    });

    it('should refuse a date without a time when one is given', () => {
      expect(issuesOf({ ...input, opensAt: '2027-01-15' })).toEqual([[['opensAt'], 'opens must be a date and time, e.g. 2027-01-15T00:00:00Z']]);
    });
  });

  describe('RoundInput pools', () => {
    it('should refuse two pools on the same machine when a machine repeats', () => {
      const pools = [{ machine: 'cluster-a', coreHours: 10 }, { machine: 'cluster-a', coreHours: 20 }];
      expect(issuesOf({ ...input, pools })).toEqual([[['pools'], 'each machine may have only one pool']]);
    });

    it('should refuse a repeated machine when the names differ only by spaces', () => {
      const pools = [{ machine: 'cluster-a', coreHours: 10 }, { machine: ' cluster-a ', coreHours: 20 }];
      expect(issuesOf({ ...input, pools })).toEqual([[['pools'], 'each machine may have only one pool']]);
    });

    it('should refuse a round without pools when none is given', () => {
      expect(issuesOf({ ...input, pools: [] })).toEqual([[['pools'], 'a round needs a pool of core-hours on at least one machine']]);
    });

    it('should refuse a pool of fractional or zero core-hours at its index', () => {
      expect(issuesOf({ ...input, pools: [{ machine: 'cluster-a', coreHours: 0.5 }, { machine: 'gpu-b', coreHours: 0 }] })).toEqual([
        [['pools', 0, 'coreHours'], 'core-hours must be a whole number'],
        [['pools', 1, 'coreHours'], 'a pool needs at least 1 core-hour'],
      ]);
    });

    it('should refuse a machine name with capitals or spaces inside', () => {
      expect(issuesOf({ ...input, pools: [{ machine: 'Cluster A', coreHours: 10 }] })[0]).toEqual([['pools', 0, 'machine'], 'machine names are 2–40 lower-case letters, digits and hyphens, e.g. cluster-a']);
    });
  });

  describe('RoundPatch', () => {
    it('should check the order of the dates when both are sent', () => {
      expect(issuesOf({ opensAt: '2027-02-01T00:00:00Z', closesAt: '2027-01-01T00:00:00Z' }, RoundPatch)).toEqual([[['closesAt'], 'a round must close after it opens']]);
    });

    it('should accept one date alone when the other is not sent', () => {
      expect(RoundPatch.parse({ closesAt: '2027-01-01T00:00:00Z' })).toEqual({ closesAt: '2027-01-01T00:00:00Z' });
    });
  });

  describe('roundStatus', () => {
    const round = { opensAt: '2027-01-15T00:00:00Z', closesAt: '2027-03-31T23:59:59Z' };

    it('should be upcoming when now is before the opening', () => {
      expect(roundStatus(round, new Date('2027-01-14T23:59:59Z'))).toBe('upcoming');
    });

    it('should be open when now is between the opening and the closing, both included', () => {
      expect(roundStatus(round, new Date('2027-01-15T00:00:00Z'))).toBe('open');
      expect(roundStatus(round, new Date('2027-02-15T12:00:00Z'))).toBe('open');
      expect(roundStatus(round, new Date('2027-03-31T23:59:59Z'))).toBe('open');
    });

    it('should be closed when now is after the closing', () => {
      expect(roundStatus(round, new Date('2027-04-01T00:00:00Z'))).toBe('closed');
    });
  });
});
