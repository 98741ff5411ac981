import { analyzeTable, syntheticScalingTable, type Analysis, type ScalingAnalysis } from '@localis/shared';

/**
 * For tests only: a real ScalingAnalysis, computed by the shared analysis from a table drawn from
 * a known scaling function near the 3D Anderson transition (W_c ≈ 16.54, nu ≈ 1.57, Lambda_c ≈
 * 0.576), with 20 bootstrap refits to stay fast; and analyses as the api answers them.
 */

const FIXTURE_CAMPAIGN_ID = '3a4b5c6d-7e8f-4a0b-9c1d-2e3f4a5b6c7d';
const FIXTURE_ARCHIVE_ID = '7c1d2e3f-4a5b-4c6d-8e7f-9a0b1c2d3e4f';

const DISORDER = Array.from({ length: 13 }, (_, i) => 15 + i * 0.25);

let computed: ScalingAnalysis | undefined;

/** The analysis of the synthetic table, computed once per test file; each call gets its own copy. */
export function scalingResultFixture(): ScalingAnalysis {
  computed ??= analyzeTable(
    syntheticScalingTable({ criticalX: 16.54, nu: 1.57, criticalValue: 0.576, sizes: [6, 8, 10, 12, 16], xs: DISORDER, relativeError: 0.004, seed: 7 }),
    { bootstrap: 20 },
  );
  // Through JSON, as it comes from the api: no undefined keys, no shared objects.
  return JSON.parse(JSON.stringify(computed)) as ScalingAnalysis;
}

let counter = 0;

/** An analysis as GET /analyses/:id answers; finished, with the fixture's result, unless overridden. */
export function analysisFixture(overrides: Partial<Analysis> = {}): Analysis {
  counter += 1;
  return {
    id: `5e6f7a8b-9c0d-4e1f-8a2b-${String(counter).padStart(12, '0')}`,
    campaignId: FIXTURE_CAMPAIGN_ID,
    state: 'done',
    request: { bootstrap: 20 },
    progress: null,
    archiveIds: [FIXTURE_ARCHIVE_ID],
    points: 65,
    result: scalingResultFixture(),
    error: null,
    requestedByName: null,
    createdAt: '2027-03-01T09:22:00.000Z',
    startedAt: '2027-03-01T09:22:01.000Z',
    finishedAt: '2027-03-01T09:22:09.000Z',
    ...overrides,
  };
}
