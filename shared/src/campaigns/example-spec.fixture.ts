import { CampaignSpec, type CampaignSpecInput } from './campaign-spec.schema';

/**
 * The worked example, for the tests: 3D Anderson model with box disorder, class AI, L = 6,
 * 8, 12, 16, W from 15 to 18 in steps of 0.25 (13 points), E = 0, one realization, transfer
 * matrix at 0.2 %. Overrides replace top-level fields; the result goes through the schema, so a
 * test always holds what the server would hold.
 */
export const EXAMPLE_SPEC_INPUT: CampaignSpecInput = {
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

export function exampleSpec(overrides: Partial<CampaignSpecInput> = {}): CampaignSpec {
  return CampaignSpec.parse({ ...EXAMPLE_SPEC_INPUT, ...overrides });
}
