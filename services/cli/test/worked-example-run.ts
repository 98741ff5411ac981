import type { RunInput } from '@localis/shared';
import type { RunFlags } from '../src/lib/run-input';

/** The README's worked example as `localis runs add` options: job 4711, 128 cores for 12 hours. */
export const WORKED_EXAMPLE_FLAGS: RunFlags = {
  job: '4711',
  machine: 'cluster-a',
  start: '2027-02-01T08:00:00Z',
  end: '2027-02-01T20:00:00Z',
  cores: '128',
  code: 'tmm',
  codeVersion: '1.4.2',
};

/** The run those options describe, as the api receives it (no parameter lists given). */
export const WORKED_EXAMPLE_RUN: RunInput = {
  externalJobId: '4711',
  machine: 'cluster-a',
  startedAt: '2027-02-01T08:00:00.000Z',
  endedAt: '2027-02-01T20:00:00.000Z',
  cores: 128,
  codeName: 'tmm',
  codeVersion: '1.4.2',
  parameters: { sizes: [], disorder: [], energies: [], seeds: [] },
};
