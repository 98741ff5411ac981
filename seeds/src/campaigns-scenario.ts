import type { CampaignInput, CampaignState, RoundPool } from '@localis/shared';

/**
 * Rounds and campaigns of the demo scenario. Dates are relative to the month of the first load so
 * the open round is open whenever the demo is started fresh; ids are fixed so a second load
 * changes nothing. Pilot timings are invented for the demo.
 */
export interface ScenarioRound {
  id: string;
  name: string;
  /** Months from the start of the current month. */
  opensMonths: number;
  closesMonths: number;
  /** When its grants can no longer be used: a year after the round closes. */
  allocationEndsMonths: number;
  pools: RoundPool[];
}

export interface ScenarioCampaign {
  id: string;
  ownerId: string;
  roundId: string;
  state: CampaignState;
  /** For decided campaigns: the core-hours granted (partly: less than requested) and a message. */
  decision?: { grantedShare: number; message: string };
  /** For a withdrawn campaign: the note its owner left. */
  withdrawNote?: string;
  input: Omit<CampaignInput, 'roundId' | 'spec'> & { spec: Record<string, unknown> };
}

const person = (n: number) => `2b000000-0000-4000-8000-${String(n).padStart(12, '0')}`;
const LATTICES = '3c000000-0000-4000-8000-000000000001';
const TRANSPORT = '3c000000-0000-4000-8000-000000000002';
const DEVICES = '3c000000-0000-4000-8000-000000000003';
export const OPEN_ROUND = '4d000000-0000-4000-8000-000000000002';
export const CLOSED_ROUND = '4d000000-0000-4000-8000-000000000001';

export const ROUNDS: ScenarioRound[] = [
  { id: CLOSED_ROUND, name: 'Coldwater allocation round 1', opensMonths: -8, closesMonths: -5, allocationEndsMonths: 7, pools: [{ machine: 'fjell', coreHours: 12_000_000 }, { machine: 'skerry-gpu', coreHours: 400_000 }] },
  { id: OPEN_ROUND, name: 'Coldwater allocation round 2', opensMonths: -1, closesMonths: 3, allocationEndsMonths: 15, pools: [{ machine: 'fjell', coreHours: 15_000_000 }, { machine: 'skerry-gpu', coreHours: 600_000 }] },
];

const node = { coresPerNode: 128, memoryGiBPerNode: 512 };
/** The disorder grids of the two transfer-matrix campaigns whose results the demo computes (`results-scenario.ts`). */
export const PILOT_3D_W = [15, 15.5, 16, 16.5, 17, 17.5, 18, 18.5, 19];
export const STRIPS_2D_W = [4, 5, 6, 7, 8];
const campaign = (n: number) => `5e000000-0000-4000-8000-${String(n).padStart(12, '0')}`;

export const CAMPAIGNS: ScenarioCampaign[] = [
  {
    id: campaign(1), ownerId: person(3), roundId: OPEN_ROUND, state: 'submitted',
    input: {
      title: 'Critical exponent of the 3D Anderson transition with box disorder',
      abstract: 'Transfer-matrix computation of the normalised localization length Lambda on bars of cross-section up to 24 x 24 around W = 16.5, to determine W_c, nu and Lambda_c with 95 % confidence intervals by finite-size scaling with irrelevant corrections.',
      justification: '## Aim\nPin down **nu** of the orthogonal class to better than 1 % with our own code, as the reference point for the group\'s later studies of correlated disorder.\n\n## Method\n- bars of L = 8 … 24, periodic transverse boundaries\n- relative precision 0.2 % of the smallest Lyapunov exponent\n- pilot timings on fjell attached',
      groupId: LATTICES, machine: 'fjell',
      spec: {
        model: 'anderson-box', dimension: 3, symmetryClass: 'AI', goal: 'critical-point', sizes: [8, 10, 12, 14, 16, 20, 24],
        disorder: { from: 15, to: 18, step: 0.25 }, energies: [0], realizations: 1, method: 'transfer-matrix', targetPrecision: 0.002,
        methodOptions: { expectedLambda: 0.6 }, node,
        pilotTimings: [
          { size: 6, seconds: 41, cores: 1 }, { size: 8, seconds: 228, cores: 1 }, { size: 10, seconds: 890, cores: 1 },
          { size: 12, seconds: 2630, cores: 1 }, { size: 14, seconds: 6650, cores: 1 },
        ],
        pilotSettings: { method: 'transfer-matrix', symmetryClass: 'AI', targetPrecision: 0.002, methodOptions: { expectedLambda: 0.6 } },
      },
    },
  },
  {
    id: campaign(2), ownerId: person(3), roundId: OPEN_ROUND, state: 'draft',
    input: {
      title: 'Level statistics across the 3D transition',
      abstract: 'Mean adjacent gap ratio from exact diagonalization of cubes around the critical disorder, to follow the crossover from the orthogonal ensemble to Poisson statistics.',
      justification: 'Complements the transfer-matrix campaign with a spectral probe of the same transition.',
      groupId: LATTICES, machine: 'fjell',
      spec: {
        model: 'anderson-box', dimension: 3, symmetryClass: 'AI', goal: 'spectral-statistics', sizes: [8, 10, 12, 14, 16, 18, 20],
        disorder: { from: 14, to: 19, step: 0.5 }, energies: [0], realizations: 1000, method: 'exact-diagonalization', node,
      },
    },
  },
  {
    id: campaign(3), ownerId: person(3), roundId: OPEN_ROUND, state: 'draft',
    input: {
      title: 'Search for a transition in the 2D orthogonal model',
      abstract: 'A first plan for transfer-matrix scans of two-dimensional strips with box disorder; the notices explain why it needs rethinking before submission.',
      justification: '',
      groupId: LATTICES, machine: 'fjell',
      spec: {
        model: 'anderson-box', dimension: 2, symmetryClass: 'AI', goal: 'critical-point', sizes: [32, 48],
        disorder: { from: 4, to: 8, step: 0.5 }, energies: [0], realizations: 1, method: 'transfer-matrix', targetPrecision: 0.005, node,
      },
    },
  },
  {
    id: campaign(4), ownerId: person(5), roundId: OPEN_ROUND, state: 'in-review',
    input: {
      title: 'Metal–insulator transition of the 2D symplectic class',
      abstract: 'Strips with spin–orbit coupling (class AII) of widths 16 to 256, to determine the critical disorder and the exponent of the two-dimensional symplectic transition.',
      justification: 'The symplectic class is the one two-dimensional class with a transition at zero field; its exponent nu = 2.73 (Asada, Slevin & Ohtsuki 2002) is a stringent test of our code.',
      groupId: TRANSPORT, machine: 'fjell',
      spec: {
        model: 'anderson-box', dimension: 2, symmetryClass: 'AII', goal: 'critical-point', sizes: [16, 32, 64, 128, 256],
        disorder: { from: 5, to: 7, step: 0.1 }, energies: [1], realizations: 1, method: 'transfer-matrix', targetPrecision: 0.003, node,
      },
    },
  },
  {
    id: campaign(8), ownerId: person(5), roundId: OPEN_ROUND, state: 'withdrawn',
    withdrawNote: 'Merged into the symplectic-class proposal.',
    input: {
      title: 'Spin–orbit strips at weak disorder',
      abstract: 'Localization lengths of wide two-dimensional strips with spin–orbit coupling at weak disorder, before the transition.',
      justification: '',
      groupId: TRANSPORT, machine: 'fjell',
      spec: {
        model: 'anderson-box', dimension: 2, symmetryClass: 'AII', goal: 'localization-length', sizes: [32, 64, 128],
        disorder: { from: 2, to: 4, step: 0.5 }, energies: [1], realizations: 1, method: 'transfer-matrix', targetPrecision: 0.005, node,
      },
    },
  },
  {
    id: campaign(5), ownerId: person(4), roundId: CLOSED_ROUND, state: 'granted',
    decision: { grantedShare: 1, message: 'Granted in full; the pilot data made the request convincing.' },
    input: {
      title: 'Conductance at the 3D unitary critical point',
      abstract: "Recursive Green's function conductance of cubes in a magnetic field (class A) around the critical disorder, for the scale-invariant conductance distribution.",
      justification: 'Needed to compare the unitary exponent with the orthogonal one measured by the Brennmoor group.',
      groupId: TRANSPORT, machine: 'fjell',
      spec: {
        model: 'anderson-box', dimension: 3, symmetryClass: 'A', goal: 'transport', sizes: [8, 12, 16, 24, 32],
        disorder: { from: 17, to: 19.5, step: 0.5 }, energies: [0], realizations: 5000, method: 'recursive-green', node,
      },
    },
  },
  {
    id: campaign(6), ownerId: person(8), roundId: CLOSED_ROUND, state: 'partly-granted',
    decision: { grantedShare: 0.6, message: 'Partly granted: L = 64 and 128 in full and about half the realizations at L = 256, which self-average; ask for the rest of the largest size in the next round.' },
    input: {
      title: 'Disorder-limited density of states in nanowire channels',
      abstract: 'Kernel polynomial density of states of long disordered channels, to calibrate device models of the partner.',
      justification: 'Industrial partner campaign, billed at the partner rate card.',
      groupId: DEVICES, machine: 'skerry-gpu',
      spec: {
        model: 'anderson-gaussian', dimension: 3, symmetryClass: 'A', goal: 'transport', sizes: [64, 128, 256],
        disorder: { values: [1, 2, 4] }, energies: [0], realizations: 100, method: 'kernel-polynomial',
        methodOptions: { moments: 2048, randomVectors: 16 }, node,
      },
    },
  },
  {
    id: campaign(9), ownerId: person(3), roundId: CLOSED_ROUND, state: 'granted',
    decision: { grantedShare: 1, message: 'Granted in full: a small pilot whose crossings will size the full study of the next round.' },
    input: {
      title: 'Pilot scan of the 3D orthogonal transition on small bars',
      abstract: 'Transfer-matrix Lambda of bars of width L = 4, 6 and 8 with box disorder around W = 16.5, to see the crossing and size the full study.',
      justification: '## Aim\nA first look at the crossing of Lambda(W) for small bars before asking for L up to 24.\n\n## Method\n- periodic transverse boundaries, E = 0\n- relative precision 1 % (1.5 % at L = 8)',
      groupId: LATTICES, machine: 'fjell',
      spec: {
        model: 'anderson-box', dimension: 3, symmetryClass: 'AI', goal: 'critical-point', sizes: [4, 6, 8],
        disorder: { values: PILOT_3D_W }, energies: [0], realizations: 1, method: 'transfer-matrix', targetPrecision: 0.01,
        methodOptions: { expectedLambda: 0.6 }, node,
      },
    },
  },
  {
    id: campaign(10), ownerId: person(2), roundId: CLOSED_ROUND, state: 'granted',
    decision: { grantedShare: 1, message: 'Granted in full; a useful baseline for the 2D proposals.' },
    input: {
      title: 'Localization lengths of 2D orthogonal strips',
      abstract: 'Transfer-matrix Lambda of strips of width 8, 16 and 32 with box disorder W = 4 to 8: in two dimensions the orthogonal class localizes at any disorder, so Lambda should fall with L everywhere.',
      justification: 'The baseline against which the group will judge its 2D transition searches.',
      groupId: LATTICES, machine: 'fjell',
      spec: {
        model: 'anderson-box', dimension: 2, symmetryClass: 'AI', goal: 'localization-length', sizes: [8, 16, 32],
        disorder: { values: STRIPS_2D_W }, energies: [0], realizations: 1, method: 'transfer-matrix', targetPrecision: 0.01, node,
      },
    },
  },
  {
    id: campaign(7), ownerId: person(5), roundId: CLOSED_ROUND, state: 'declined',
    decision: { grantedShare: 0, message: 'Declined: the 1D plan cannot show a transition; resubmit as a localization-length study.' },
    input: {
      title: 'Critical point of the 1D binary-alloy chain',
      abstract: 'Transfer-matrix scan of long one-dimensional chains with binary disorder looking for a critical concentration.',
      justification: '',
      groupId: TRANSPORT, machine: 'fjell',
      spec: {
        model: 'anderson-binary', dimension: 1, symmetryClass: 'AI', goal: 'critical-point', sizes: [1],
        disorder: { from: 0.5, to: 3, step: 0.25 }, energies: [0.5, 1], realizations: 1, method: 'transfer-matrix', targetPrecision: 0.001, node,
      },
    },
  },
];
