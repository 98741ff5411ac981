import { describe, expect, it } from 'vitest';
import { runMilliCoreHours } from '../ledger/ledger-math';
import { RunInput, type RunInputRaw } from './run.schema';

/** The worked example of the ledger: 128 cores for 12 hours on cluster-a, 1 536 core-hours. */
const EXAMPLE_RUN: RunInputRaw = {
  externalJobId: '4711',
  machine: 'cluster-a',
  startedAt: '2027-02-01T08:00:00Z',
  endedAt: '2027-02-01T20:00:00Z',
  cores: 128,
  codeName: 'tmm',
  codeVersion: '1.4.2',
  parameters: { sizes: [12, 16], disorder: [16.5, 17], energies: [0], seeds: [1, 2] },
};

/** The issues of the example run with some fields changed, as [path, message]. */
const issuesOf = (overrides: Record<string, unknown>) => {
  const result = RunInput.safeParse({ ...EXAMPLE_RUN, ...overrides });
  expect(result.success, 'the run should have been refused').toBe(false);
  return (result.error?.issues ?? []).map((i) => [i.path, i.message]);
};

describe('RunInput', () => {
  describe('the worked example', () => {
    it('should parse as given and cost 1 536 core-hours from cores and wall-clock', () => {
      const run = RunInput.parse(EXAMPLE_RUN);
      expect(run).toEqual(EXAMPLE_RUN);
      expect(runMilliCoreHours(run.cores, run.startedAt, run.endedAt)).toBe(1_536_000);
    });

    it('should accept a run without coreHours or parameters, filling in empty lists', () => {
      const { parameters: _parameters, ...bare } = EXAMPLE_RUN;
      const run = RunInput.parse(bare);
      expect(run.coreHours).toBeUndefined();
      expect(run.parameters).toEqual({ sizes: [], disorder: [], energies: [], seeds: [] });
    });

    it('should accept coreHours given by the scheduler when positive', () => {
      expect(RunInput.parse({ ...EXAMPLE_RUN, coreHours: 1500.25 }).coreHours).toBe(1500.25);
    });

    it('should accept times with an offset and trim the text fields', () => {
      const run = RunInput.parse({ ...EXAMPLE_RUN, startedAt: '2027-02-01T09:00:00+01:00', externalJobId: ' 4711 ', codeName: ' tmm ' });
      expect(run).toMatchObject({ startedAt: '2027-02-01T09:00:00+01:00', externalJobId: '4711', codeName: 'tmm' });
    });
  });

  describe('times', () => {
    it('should refuse a run that ends before it starts, at endedAt', () => {
      expect(issuesOf({ endedAt: '2027-02-01T07:00:00Z' })).toEqual([[['endedAt'], 'a run must end after it starts']]);
    });

    it('should refuse a run that ends the moment it starts', () => {
      expect(issuesOf({ endedAt: EXAMPLE_RUN.startedAt })).toEqual([[['endedAt'], 'a run must end after it starts']]);
    });

    it('should compare instants, not texts, when the offsets differ', () => {
      // 08:30+01:00 is 07:30Z, before the start at 08:00Z.
      expect(issuesOf({ endedAt: '2027-02-01T08:30:00+01:00' })).toEqual([[['endedAt'], 'a run must end after it starts']]);
    });

    it('should refuse a time without a zone, with an example', () => {
      expect(issuesOf({ startedAt: '2027-02-01T08:00:00' })).toEqual([[['startedAt'], 'startedAt must be a date and time, e.g. 2027-02-01T08:00:00Z']]);
    });
  });

  describe('cores and core-hours', () => {
    it('should refuse 0 and negative cores', () => {
      expect(issuesOf({ cores: 0 })).toEqual([[['cores'], 'a run uses at least 1 core']]);
      expect(issuesOf({ cores: -8 })).toEqual([[['cores'], 'a run uses at least 1 core']]);
    });

    it('should refuse fractional cores', () => {
      expect(issuesOf({ cores: 2.5 })).toEqual([[['cores'], 'cores is a whole number']]);
    });

    it('should refuse cores given as text', () => {
      expect(issuesOf({ cores: '128' })).toEqual([[['cores'], 'cores must be a number']]);
    });

    it('should refuse core-hours under 0.001 (less than the ledger can hold) or with more than three decimals', () => {
      const tooSmall = 'coreHours must be at least 0.001 (3.6 core-seconds)';
      expect(issuesOf({ coreHours: 0 })).toEqual([[['coreHours'], tooSmall]]);
      expect(issuesOf({ coreHours: -1 })).toEqual([[['coreHours'], tooSmall]]);
      expect(issuesOf({ coreHours: 0.0004 })).toEqual([[['coreHours'], tooSmall], [['coreHours'], 'coreHours have at most three decimals']]);
      expect(issuesOf({ coreHours: 12.0005 })).toEqual([[['coreHours'], 'coreHours have at most three decimals']]);
      expect(RunInput.safeParse({ ...EXAMPLE_RUN, coreHours: 0.001 }).success).toBe(true);
    });
  });

  describe('fields', () => {
    it('should refuse a misspelt key rather than drop it', () => {
      expect(issuesOf({ core: 128 })).toEqual([[[], 'Unrecognized key: "core"']]);
    });

    it('should refuse a misspelt parameter at parameters', () => {
      expect(issuesOf({ parameters: { sizes: [12], seed: [1] } })).toEqual([[['parameters'], 'Unrecognized key: "seed"']]);
    });

    it('should refuse an empty job id and a machine name outside the naming rule', () => {
      expect(issuesOf({ externalJobId: '  ', machine: 'Cluster A' })).toEqual([
        [['externalJobId'], "give the scheduler's job id"],
        [['machine'], 'machine names are 2–40 lower-case letters, digits and hyphens, e.g. cluster-a'],
      ]);
    });

    it('should refuse parameter values out of range at their index', () => {
      expect(issuesOf({ parameters: { sizes: [12, 0], disorder: [-1], seeds: [1.5] } })).toEqual([
        [['parameters', 'sizes', 1], 'sizes are at least 1'],
        [['parameters', 'disorder', 0], 'disorder is not negative'],
        [['parameters', 'seeds', 0], 'seeds are whole numbers'],
      ]);
    });
  });
});
