import type { SpotCheck, SpotCheckRow } from '@localis/shared';

/** For tests only: spot-checks and their points as the api answers them. */

const FIXTURE_CAMPAIGN_ID = '3a4b5c6d-7e8f-4a0b-9c1d-2e3f4a5b6c7d';
const FIXTURE_ARCHIVE_ID = '7c1d2e3f-4a5b-4c6d-8e7f-9a0b1c2d3e4f';

/** One recomputed point: L = 6 at W = 15, within one standard error of the archive's value, unless overridden. */
export function spotCheckRowFixture(overrides: Partial<SpotCheckRow> = {}): SpotCheckRow {
  return {
    L: 6,
    W: 15,
    E: 0,
    reported: 0.5734,
    reportedErr: 0.0021,
    recomputed: 0.5751,
    recomputedErr: 0.0029,
    z: 0.4747,
    flagged: false,
    dimension: 3,
    precision: 0.005,
    seed: 2718281,
    slices: 48_000,
    seconds: 11.2,
    ...overrides,
  };
}

/** A spot-check, done: three points of L = 6 (W = 15, 16.5 and 18), the middle one beyond 3 standard errors, unless overridden. */
export function spotCheckFixture(overrides: Partial<SpotCheck> = {}): SpotCheck {
  return {
    id: '9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d',
    campaignId: FIXTURE_CAMPAIGN_ID,
    archiveId: FIXTURE_ARCHIVE_ID,
    archiveFileName: 'w15-18-L6-16.tar.gz',
    state: 'done',
    progress: { done: 3, total: 3 },
    rows: [
      spotCheckRowFixture(),
      spotCheckRowFixture({ W: 16.5, reported: 0.61, recomputed: 0.5951, z: -4.1, flagged: true }),
      spotCheckRowFixture({ W: 18, z: 1.2 }),
    ],
    flagged: 1,
    reason: null,
    createdAt: '2027-03-01T09:22:00.000Z',
    startedAt: '2027-03-01T09:22:01.000Z',
    finishedAt: '2027-03-01T09:22:40.000Z',
    ...overrides,
  };
}
