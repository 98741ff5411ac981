import type { RunParameters } from '@localis/shared';
import { PILOT_3D_W, STRIPS_2D_W } from './campaigns-scenario';

/**
 * Runs of the demo's granted campaigns, in the order they happened, with the office's refund
 * and adjustment where the story has them. Job ids are fixed (a job is charged once, so a second
 * load skips them); dates are days before the load, so the runs are always recent. A run's
 * wall-clock follows from the share of the grant it uses and its cores, so the story (about 78 %
 * of the Quantum Transport grant used, most of the Device Modelling grant left) holds whatever
 * the cost model estimates for the campaigns. Job ids, codes and parameters are invented.
 */
export interface ScenarioRun {
  externalJobId: string;
  /** Days before the load the job started, and the hour (UTC, fractions allowed) it started at. */
  daysAgo: number;
  startHourUtc: number;
  cores: number;
  /** Of the campaign's grant; with the cores it gives the wall-clock. */
  shareOfGrant: number;
  codeName: string;
  codeVersion: string;
  parameters: RunParameters;
}

export type ScenarioRunStep =
  /** Recorded by a member of the group: in the portal's form, or by the CLI with their API token. */
  | { kind: 'run'; by: string; via: 'portal' | 'api'; run: ScenarioRun }
  /** Several jobs at once from the scheduler's accounting CSV. */
  | { kind: 'import'; by: string; runs: ScenarioRun[] }
  /** The office gives back the whole charge of a run. */
  | { kind: 'refund'; externalJobId: string; reason: string }
  /** The office changes the grant. */
  | { kind: 'adjustment'; coreHours: number; reason: string };

export interface ScenarioRunPlan {
  campaignId: string;
  steps: ScenarioRunStep[];
}

const person = (n: number) => `2b000000-0000-4000-8000-${String(n).padStart(12, '0')}`;
const campaign = (n: number) => `5e000000-0000-4000-8000-${String(n).padStart(12, '0')}`;
const MARA = person(4);
const PRIYA = person(5);
const SOFIA = person(8);
const TOBIAS = person(2);
const INES = person(3);

/** Conductance of cubes with the recursive Green's function code, class A, E = 0. */
const rgf = (externalJobId: string, daysAgo: number, startHourUtc: number, cores: number, shareOfGrant: number, p: { sizes: number[]; disorder: number[]; seeds: number[] }, codeVersion = '4e9c0a7'): ScenarioRun => ({
  externalJobId, daysAgo, startHourUtc, cores, shareOfGrant, codeName: 'rgf-cond', codeVersion, parameters: { ...p, energies: [0] },
});

/** Kernel polynomial density of states over the whole band (no single energy). */
const kpm = (externalJobId: string, daysAgo: number, startHourUtc: number, cores: number, shareOfGrant: number, p: { sizes: number[]; disorder: number[]; seeds: number[] }, codeVersion = '3ad91c2'): ScenarioRun => ({
  externalJobId, daysAgo, startHourUtc, cores, shareOfGrant, codeName: 'kpm-dos', codeVersion, parameters: { ...p, energies: [] },
});

/** Transfer-matrix bars with Localis's own kernel (the demo's result archives hold what it computed). */
const tmm = (externalJobId: string, daysAgo: number, startHourUtc: number, cores: number, shareOfGrant: number, p: { sizes: number[]; disorder: number[]; seeds: number[] }): ScenarioRun => ({
  externalJobId, daysAgo, startHourUtc, cores, shareOfGrant, codeName: 'localis-transfer-matrix', codeVersion: '1', parameters: { ...p, energies: [0] },
});

const ALL_W = [17, 17.5, 18, 18.5, 19, 19.5];


export const RUN_PLANS: ScenarioRunPlan[] = [
  {
    // Quantum Transport on fjell: small sizes, then L = 24, then L = 32 one disorder value at a time.
    campaignId: campaign(5),
    steps: [
      { kind: 'run', by: PRIYA, via: 'portal', run: rgf('4412086', 128, 9.25, 64, 0.008, { sizes: [8, 12, 16], disorder: ALL_W, seeds: [5001] }) },
      { kind: 'run', by: PRIYA, via: 'api', run: rgf('4425519', 121, 7.75, 128, 0.058, { sizes: [24], disorder: [17, 17.5, 18], seeds: [5101, 5102, 5103] }) },
      { kind: 'run', by: PRIYA, via: 'api', run: rgf('4428802', 119, 21, 128, 0.058, { sizes: [24], disorder: [18.5, 19, 19.5], seeds: [5104, 5105, 5106] }) },
      { kind: 'run', by: PRIYA, via: 'api', run: rgf('4457310', 101, 8.25, 512, 0.118, { sizes: [32], disorder: [17], seeds: [5201, 5202, 5203, 5204] }) },
      { kind: 'run', by: MARA, via: 'portal', run: rgf('4478044', 88, 13.75, 512, 0.118, { sizes: [32], disorder: [17.5], seeds: [5211, 5212, 5213, 5214] }) },
      { kind: 'run', by: PRIYA, via: 'api', run: rgf('4499171', 74, 6.5, 512, 0.03, { sizes: [32], disorder: [18], seeds: [5221, 5222, 5223, 5224] }) },
      { kind: 'run', by: PRIYA, via: 'api', run: rgf('4502655', 72, 19.25, 512, 0.118, { sizes: [32], disorder: [18], seeds: [5221, 5222, 5223, 5224] }) },
      { kind: 'refund', externalJobId: '4499171', reason: 'Node fj-n0417 failed (NODE_FAIL) and the scheduler killed the job; the L = 32, W = 18 set was rerun as job 4502655.' },
      {
        kind: 'import',
        by: PRIYA,
        runs: [
          rgf('4529814', 55, 10, 256, 0.04, { sizes: [32], disorder: [18.5], seeds: [5231] }, 'b71d2f3'),
          rgf('4531207', 54, 2.5, 256, 0.04, { sizes: [32], disorder: [18.5], seeds: [5232] }, 'b71d2f3'),
          rgf('4531209', 54, 2.55, 256, 0.04, { sizes: [32], disorder: [18.5], seeds: [5233] }, 'b71d2f3'),
        ],
      },
      { kind: 'run', by: PRIYA, via: 'api', run: rgf('4563920', 33, 11.75, 512, 0.118, { sizes: [32], disorder: [19], seeds: [5241, 5242, 5243, 5244] }, 'b71d2f3') },
      { kind: 'run', by: MARA, via: 'portal', run: rgf('4594418', 12, 16, 256, 0.065, { sizes: [32], disorder: [19.5], seeds: [5251, 5252] }, 'b71d2f3') },
    ],
  },
  {
    // Device Modelling on skerry-gpu: a few runs, most of the grant still to use.
    campaignId: campaign(6),
    steps: [
      { kind: 'run', by: SOFIA, via: 'portal', run: kpm('207341', 96, 10.5, 64, 0.02, { sizes: [64], disorder: [1, 2, 4], seeds: [11, 12, 13] }) },
      { kind: 'run', by: SOFIA, via: 'api', run: kpm('208912', 80, 8, 128, 0.08, { sizes: [128], disorder: [1, 2], seeds: [21, 22] }) },
      { kind: 'run', by: SOFIA, via: 'api', run: kpm('210377', 61, 14.25, 128, 0.05, { sizes: [128], disorder: [4], seeds: [31, 32] }) },
      { kind: 'adjustment', coreHours: 150, reason: 'Agreed with the committee after the W = 4 convergence test: 4096 moments at W = 4, where the band tail did not converge with 2048.' },
      { kind: 'run', by: SOFIA, via: 'api', run: kpm('213054', 20, 9.75, 256, 0.09, { sizes: [256], disorder: [1], seeds: [41] }, '5f0e8b2') },
    ],
  },
  {
    // The 3D pilot of the Disordered Lattices group: the small bars, then L = 8 (each an archive).
    campaignId: campaign(9),
    steps: [
      { kind: 'run', by: INES, via: 'api', run: tmm('4471190', 90, 8.5, 1, 0.3, { sizes: [4, 6], disorder: PILOT_3D_W, seeds: [9001] }) },
      { kind: 'run', by: INES, via: 'api', run: tmm('4480552', 84, 10, 1, 0.45, { sizes: [8], disorder: PILOT_3D_W, seeds: [9002] }) },
    ],
  },
  {
    // The 2D baseline: one job for all three strip widths.
    campaignId: campaign(10),
    steps: [{ kind: 'run', by: TOBIAS, via: 'portal', run: tmm('4491733', 77, 14.5, 1, 0.5, { sizes: [8, 16, 32], disorder: STRIPS_2D_W, seeds: [10001] }) }],
  },
];
