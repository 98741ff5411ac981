import { PILOT_3D_W, STRIPS_2D_W } from './campaigns-scenario';

/**
 * The demo's result archives: what Localis's own transfer-matrix kernel computes for the two
 * granted transfer-matrix campaigns of the Disordered Lattices group, packed as real archives
 * and uploaded through the real path, so the demo's analyses and spot-checks run on real numbers.
 * A 3D pilot around the orthogonal transition (two archives, as two jobs made them) and 2D strips,
 * which localize at every disorder.
 */
export interface DemoArchivePlan {
  campaignId: string;
  fileName: string;
  /** The member of the group who uploads it. */
  uploaderId: string;
  /** Job ids of the demo runs that made it (`runs-scenario.ts`); the manifest names their run ids. */
  runJobIds: string[];
  dimension: 2 | 3;
  /** Each size with the relative precision asked of the kernel. */
  sizes: { L: number; precision: number }[];
  disorder: number[];
  energy: number;
  /** The job's seed; point i of the archive runs with seed * 1000 + i. */
  seed: number;
}

const person = (n: number) => `2b000000-0000-4000-8000-${String(n).padStart(12, '0')}`;
const campaign = (n: number) => `5e000000-0000-4000-8000-${String(n).padStart(12, '0')}`;
export const PILOT_3D_CAMPAIGN = campaign(9);
export const STRIPS_2D_CAMPAIGN = campaign(10);

export const DEMO_ARCHIVES: DemoArchivePlan[] = [
  { campaignId: PILOT_3D_CAMPAIGN, fileName: 'pilot-3d-L4-L6.tar.gz', uploaderId: person(3), runJobIds: ['4471190'], dimension: 3, sizes: [{ L: 4, precision: 0.01 }, { L: 6, precision: 0.01 }], disorder: PILOT_3D_W, energy: 0, seed: 9001 },
  { campaignId: PILOT_3D_CAMPAIGN, fileName: 'pilot-3d-L8.tar.gz', uploaderId: person(3), runJobIds: ['4480552'], dimension: 3, sizes: [{ L: 8, precision: 0.015 }], disorder: PILOT_3D_W, energy: 0, seed: 9002 },
  { campaignId: STRIPS_2D_CAMPAIGN, fileName: 'strips-2d-L8-L32.tar.gz', uploaderId: person(2), runJobIds: ['4491733'], dimension: 2, sizes: [{ L: 8, precision: 0.01 }, { L: 16, precision: 0.01 }, { L: 32, precision: 0.015 }], disorder: STRIPS_2D_W, energy: 0, seed: 10001 },
];

/** The kernel inputs of an archive's points, in the order of its table. */
export function pointsOf(plan: DemoArchivePlan) {
  return plan.sizes.flatMap(({ L, precision }) => plan.disorder.map((W) => ({ dimension: plan.dimension, width: L, disorder: W, energy: plan.energy, precision }))).map((input, i) => ({ ...input, seed: plan.seed * 1000 + i }));
}
