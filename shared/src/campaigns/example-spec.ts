import type { CampaignSpecInput } from './campaign-spec.schema';

/**
 * The worked example of a campaign specification: 3D Anderson model with box disorder, class AI,
 * L = 6, 8, 12, 16, W from 15 to 18 in steps of 0.25 (13 points), E = 0, one realization,
 * transfer matrix at 0.2 %. The tests of shared, the CLI and the portal start from it.
 */
export const EXAMPLE_CAMPAIGN_SPEC: CampaignSpecInput = {
  model: 'anderson-box',
  dimension: 3,
  symmetryClass: 'AI',
  sizes: [6, 8, 12, 16],
  disorder: { from: 15, to: 18, step: 0.25 },
  energies: [0],
  realizations: 1,
  method: 'transfer-matrix',
  targetPrecision: 0.002,
  methodOptions: { moments: 1024, randomVectors: 8, eigenpairs: 50, expectedLambda: 0.6 },
  node: { coresPerNode: 64, memoryGiBPerNode: 256 },
};
