import type { ReviewScores } from '@localis/shared';

/**
 * The allocation committee's part of the demo story: who was asked to review which proposal,
 * what they wrote, and one declared conflict of interest. Henrik Solberg (Kestrel) may not
 * review Kestrel's Quantum Transport proposals, Aiko Tanaka and Elena Marchetti (Brennmoor) may
 * not review Brennmoor's Disordered Lattices ones; the reviews service refuses such assignments.
 * Texts and scores are invented for the demo.
 */
export interface ScenarioReview {
  scores: ReviewScores;
  /** Shown to the proposers after the decision, without the reviewer's name. */
  toProposers: string;
  /** Read by the committee and the office only. */
  confidential: string;
  /**
   * The recommendation as a share of the core-hours requested, so it stays in step with
   * whatever the cost model estimates for the proposal.
   */
  recommendedShare: number;
}

export interface ScenarioAssignment {
  reviewerId: string;
  /** Left out: assigned, the review still to be written. */
  review?: ScenarioReview;
}

export interface ScenarioReviewPlan {
  campaignId: string;
  /** In the order the office made them; the first one puts the proposal in review. */
  assignments: ScenarioAssignment[];
  /** Members who declared a conflict of interest with the proposal themselves. */
  conflicts: { reviewerId: string; reason: string }[];
}

const person = (n: number) => `2b000000-0000-4000-8000-${String(n).padStart(12, '0')}`;
const campaign = (n: number) => `5e000000-0000-4000-8000-${String(n).padStart(12, '0')}`;
const HENRIK = person(6);
const AIKO = person(7);
const ELENA = person(10);

const paragraphs = (...ps: string[]) => ps.join('\n\n');

export const REVIEW_PLANS: ScenarioReviewPlan[] = [
  {
    // Conductance at the 3D unitary critical point (Quantum Transport, Kestrel): granted in full.
    campaignId: campaign(5),
    assignments: [
      {
        reviewerId: AIKO,
        review: {
          scores: { merit: 5, feasibility: 4, costJustification: 4 },
          toProposers: paragraphs(
            'A well-posed campaign with a clear payoff. The conductance distribution at the critical point of class A is scale invariant but depends on boundary conditions and sample shape; with 5000 realizations per point on cubes up to L = 32 its tails will be good enough to compare with the orthogonal class, which is what the network needs next to the Brennmoor exponent.',
            'Three points for the production runs. (1) The window W = 17 to 19.5 brackets the critical disorder, but a step of 0.5 leaves only two or three points where the distribution is close to its critical form; if the L = 32 budget allows, add points at the centre rather than widening the window. (2) Please state the flux per plaquette and the gauge: an incommensurate flux in small cubes gives oscillations with L that a scaling fit will mistake for an irrelevant correction. (3) Keep the raw conductances, not only the mean and variance of ln g; the tails are where the comparison with class AI says something.',
            "The estimate follows the L^7 cost of the recursive Green's function method; the step from L = 24 to L = 32, a factor (4/3)^7 or about 7.5, is where it is least certain.",
          ),
          confidential: 'Strong group with a good record on its last allocation. The conductance distribution is the natural companion to the orthogonal exponent from Brennmoor; the network should fund both. I would grant in full. The field geometry (point 2) is the only risk and costs no extra time to fix.',
          recommendedShare: 1,
        },
      },
      {
        reviewerId: ELENA,
        review: {
          scores: { merit: 4, feasibility: 5, costJustification: 4 },
          toProposers: paragraphs(
            'Feasible as planned: the memory per job is small, so the L = 32 cubes run comfortably on fjell nodes, and the work splits into independent jobs per disorder value.',
            'The mean conductance at E = 0 will sharpen the unitary exponent (nu about 1.44) only if irrelevant corrections are under control at the small sizes. Consider leaving L = 8 out of the fit and keeping it as a check. A short note on how the 5000 realizations are split into independent random-number streams (seeds per job) would let others reproduce the distribution.',
          ),
          confidential: 'No concerns. The request is modest next to the fjell pool; grant as asked.',
          recommendedShare: 1,
        },
      },
    ],
    conflicts: [],
  },
  {
    // Density of states in nanowire channels (Device Modelling, Orrin): partly granted.
    campaignId: campaign(6),
    assignments: [
      {
        reviewerId: HENRIK,
        review: {
          scores: { merit: 3, feasibility: 4, costJustification: 3 },
          toProposers: paragraphs(
            'The kernel polynomial method is the right tool for the density of states of systems this large, and 2048 Chebyshev moments with the Jackson kernel resolve features down to about a thousandth of the bandwidth, which is what a device model needs near the band edge.',
            'Two reservations. First, the density of states self-averages: at L = 256 one realization with 16 random vectors already averages over more than sixteen million sites, so 100 realizations there mostly buy down a statistical error that is below the kernel broadening. Forty to fifty realizations at L = 256 would do, with the full 100 kept at L = 64 and 128 to show the self-averaging. Second, the plan computes cubes, not long channels; the calibration against devices would be more convincing with at least one elongated sample.',
            'I recommend L = 64 and 128 in full and L = 256 with fewer realizations.',
          ),
          confidential: 'Industrial calibration rather than an open question about localization, but legitimate under the partner agreement and billed at the partner rate. I would not fund the full L = 256 set now; the partner can come back in round 2 with a channel geometry.',
          recommendedShare: 0.55,
        },
      },
      {
        reviewerId: AIKO,
        review: {
          scores: { merit: 3, feasibility: 5, costJustification: 3 },
          toProposers: paragraphs(
            'Technically sound: moments, random vectors and sizes are consistent, and even at L = 256 a job fits comfortably in the memory of a skerry-gpu node.',
            'For W = 4 the Gaussian disorder gives long band tails, and 2048 moments may not converge there; a test at L = 64 with 4096 moments would tell. Nearly nine tenths of the request is L = 256. Since the density of states self-averages, run L = 256 with about half the realizations first and ask for the rest only if the W = 4 tails need it.',
          ),
          confidential: 'Fine to fund in part. The Device Modelling group has been a reliable partner, and the campaign is paid for at the partner rate.',
          recommendedShare: 0.65,
        },
      },
    ],
    conflicts: [
      { reviewerId: ELENA, reason: 'I hold a joint industrial grant with Orrin Quantum Devices on disordered nanowire channels, the devices this campaign is meant to calibrate.' },
    ],
  },
  {
    // Critical point of the 1D binary-alloy chain (Quantum Transport, Kestrel): declined.
    campaignId: campaign(7),
    assignments: [
      {
        reviewerId: AIKO,
        review: {
          scores: { merit: 1, feasibility: 2, costJustification: 2 },
          toProposers: paragraphs(
            'In one dimension every eigenstate is localized for any amount of uncorrelated disorder, the binary alloy included, so a scan for a critical concentration cannot find a transition; the notices on the proposal say as much. With a single chain length there is no finite-size scaling either.',
            'The localization length of the binary chain is worth a small allocation on its own: its anomalies at special energies, and the delocalized resonances that appear once the disorder is correlated (dimer-type pairs), are open to a careful numerical study. Please resubmit as a localization-length study against energy and concentration.',
          ),
          confidential: 'A clear decline, but the student should be encouraged; the correlated-dimer variant would make a good small project.',
          recommendedShare: 0,
        },
      },
    ],
    conflicts: [],
  },
  {
    // Metal–insulator transition of the 2D symplectic class (Quantum Transport, Kestrel): in review,
    // one review written, one still to come.
    campaignId: campaign(4),
    assignments: [
      {
        reviewerId: ELENA,
        review: {
          scores: { merit: 4, feasibility: 3, costJustification: 3 },
          toProposers: paragraphs(
            'The two-dimensional symplectic transition is a good benchmark, and the plan follows the standard route: the normalised localization length of quasi-one-dimensional strips by the transfer-matrix method, then finite-size scaling.',
            'Two suggestions. The window W = 5 to 7 with 21 points is wider than needed once the critical point is located, and the widest strips (M = 256) carry more than nine tenths of the cost: run all widths on a coarse grid first, then concentrate the M = 256 points within a few tenths of W_c. At 0.3 % precision the fit will need irrelevant corrections at M = 16 and 32; include them or leave the smallest width out. Please also say which spin–orbit model you use; the SU(2) model has the smallest corrections to scaling.',
          ),
          confidential: 'A good proposal from the Kestrel postdoc. With the refined grid the cost comes down by about 15 %; I recommend a grant of about 85 % of the request.',
          recommendedShare: 0.85,
        },
      },
      { reviewerId: AIKO },
    ],
    conflicts: [],
  },
];
