import { describe, expect, it } from 'vitest';
import type { RunInput } from '@localis/shared';
import { failure } from '../../test/cli-error-of';
import { WORKED_EXAMPLE_FLAGS as FLAGS } from '../../test/worked-example-run';
import { checkCampaignId, checkIdempotencyKey, runFromFlags, runIdempotencyKey, type RunFlags } from './run-input';

const CAMPAIGN = '3c000000-0000-4000-8000-000000000001';

/** The problems runFromFlags reports, as `path: message` lines. */
const problemsOf = async (flags: RunFlags) => {
  const e = await failure(Promise.resolve().then(() => runFromFlags(flags)));
  expect(e.exitCode).toBe(2);
  return e.details.map((d) => `${d.path.join('.')}: ${d.message}`);
};

describe('runFromFlags', () => {
  it('should turn the options into a RunInput with UTC times and numbers', () => {
    expect(runFromFlags({ ...FLAGS, start: '2027-02-01T09:00:00+01:00', coreHours: '1500.5', sizes: '12,16', disorder: '16.5 17', energies: '-0.5;0', seeds: '1, 2' })).toEqual({
      externalJobId: '4711',
      machine: 'cluster-a',
      startedAt: '2027-02-01T08:00:00.000Z',
      endedAt: '2027-02-01T20:00:00.000Z',
      cores: 128,
      coreHours: 1500.5,
      codeName: 'tmm',
      codeVersion: '1.4.2',
      parameters: { sizes: [12, 16], disorder: [16.5, 17], energies: [-0.5, 0], seeds: [1, 2] },
    } satisfies RunInput);
  });

  it('should leave the lists empty and core-hours out when not given', () => {
    const run = runFromFlags(FLAGS);
    expect(run.coreHours).toBeUndefined();
    expect(run.parameters).toEqual({ sizes: [], disorder: [], energies: [], seeds: [] });
  });

  it('should read cores that are not a plain decimal number as text, so the schema refuses them', async () => {
    for (const cores of ['four', '0x10', 'Infinity', '']) expect(await problemsOf({ ...FLAGS, cores })).toEqual([`cores: cores must be a number (--cores "${cores}")`]);
  });

  it('should refuse 0, negative and fractional cores, naming the option and what it read', async () => {
    expect(await problemsOf({ ...FLAGS, cores: '0' })).toEqual(['cores: a run uses at least 1 core (--cores "0")']);
    expect(await problemsOf({ ...FLAGS, cores: '-8' })).toEqual(['cores: a run uses at least 1 core (--cores "-8")']);
    expect(await problemsOf({ ...FLAGS, cores: '1.5' })).toEqual(['cores: cores is a whole number (--cores "1.5")']);
  });

  it('should refuse an end before the start at endedAt', async () => {
    expect(await problemsOf({ ...FLAGS, end: '2027-02-01T07:59:59Z' })).toEqual(['endedAt: a run must end after it starts (--end "2027-02-01T07:59:59Z")']);
  });

  it('should refuse core-hours of 0 and finer than the ledger counts (0.001)', async () => {
    expect(await problemsOf({ ...FLAGS, coreHours: '0' })).toEqual(['coreHours: coreHours must be at least 0.001 (3.6 core-seconds) (--core-hours "0")']);
    expect(await problemsOf({ ...FLAGS, coreHours: '1.0005' })).toEqual(['coreHours: coreHours have at most three decimals (--core-hours "1.0005")']);
  });

  it('should report list items that are not numbers and out-of-range ones at their place in the option', async () => {
    expect(await problemsOf({ ...FLAGS, sizes: '12,abc,0', seeds: '1,-1' })).toEqual([
      'parameters.sizes.1: "abc" is not a number (--sizes "12,abc,0")',
      'parameters.sizes.2: sizes are at least 1 (--sizes "12,abc,0")',
      'parameters.seeds.1: seeds are not negative (--seeds "1,-1")',
    ]);
  });

  it('should refuse a machine name outside the naming rule and an empty job id', async () => {
    expect(await problemsOf({ ...FLAGS, job: ' ', machine: 'Cluster A' })).toEqual([
      'externalJobId: give the scheduler\'s job id (--job " ")',
      'machine: machine names are 2–40 lower-case letters, digits and hyphens, e.g. cluster-a (--machine "Cluster A")',
    ]);
  });

  it('should name all missing options at once', async () => {
    const e = await failure(Promise.resolve().then(() => runFromFlags({ cores: '4' })));
    expect(e.message).toBe('a run needs --job, --machine, --start, --end, --code, --code-version; nothing was sent.');
  });
});

describe('runIdempotencyKey', () => {
  const run = runFromFlags(FLAGS);

  it('should be the same for the same campaign and run, whatever the key order or the case of the id', () => {
    const reordered = Object.fromEntries(Object.entries(run).reverse()) as RunInput;
    expect(runIdempotencyKey(CAMPAIGN, reordered)).toBe(runIdempotencyKey(CAMPAIGN, run));
    expect(runIdempotencyKey(CAMPAIGN.toUpperCase(), run)).toBe(runIdempotencyKey(CAMPAIGN, run));
    expect(runIdempotencyKey(CAMPAIGN, run)).toMatch(/^run-[0-9a-f]{64}$/);
  });

  it('should differ for another campaign or any change to the run', () => {
    const key = runIdempotencyKey(CAMPAIGN, run);
    expect(runIdempotencyKey('3c000000-0000-4000-8000-000000000002', run)).not.toBe(key);
    expect(runIdempotencyKey(CAMPAIGN, { ...run, cores: 64 })).not.toBe(key);
    expect(runIdempotencyKey(CAMPAIGN, { ...run, parameters: { ...run.parameters, seeds: [1] } })).not.toBe(key);
  });
});

describe('checkIdempotencyKey and checkCampaignId', () => {
  it('should accept visible ASCII keys up to 200 characters and refuse others', async () => {
    expect(checkIdempotencyKey('job-4711/attempt:1')).toBe('job-4711/attempt:1');
    for (const key of ['', 'with space', 'k'.repeat(201), 'ümlaut']) {
      expect((await failure(Promise.resolve().then(() => checkIdempotencyKey(key)))).exitCode).toBe(2);
    }
  });

  it('should accept a UUID in any case, trimmed, and refuse anything else', async () => {
    expect(checkCampaignId(` ${CAMPAIGN.toUpperCase()} `)).toBe(CAMPAIGN);
    const e = await failure(Promise.resolve().then(() => checkCampaignId('42')));
    expect(e).toMatchObject({ exitCode: 2, message: '--campaign "42" is not a campaign id; it looks like 3f2c8a4e-0b1d-4e6f-9a7b-2c5d8e1f4a6b.' });
  });
});
