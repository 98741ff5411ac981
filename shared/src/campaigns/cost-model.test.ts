import { describe, expect, it } from 'vitest';
import { SYMMETRY_CLASSES, type Method } from './campaign-spec.schema';
import { arithmeticOf, DEFAULT_FLOPS_PER_CORE, estimateCampaign, GIB, jobCost, METHOD_OPTION_DEFAULTS, sizeExponent } from './cost-model';
import { exampleSpec } from './example-spec.fixture';

/**
 * Expected values are worked out by hand from the formulas in REFERENCES.md ("Cost of the
 * numerical methods"), never by calling the model, so a changed formula shows up here. The
 * example is the issue's: 3D, class AI (real, 8 bytes), L = 6, 8, 12, 16, 13 disorder points
 * (15 to 18 by 0.25), E = 0, one realization, so 13 jobs per size; 64 cores, 256 GiB per node.
 */
function expectRel(actual: number, expected: number, rel = 1e-12) {
  expect(Math.abs(actual - expected), `${actual} vs ${expected}`).toBeLessThanOrEqual(rel * Math.abs(expected));
}

const JOBS = 13; // 13 disorder points × 1 energy × 1 realization

describe('cost model', () => {
  describe('transfer-matrix worked example', () => {
    // TMM (REFERENCES, "Cost of the numerical methods"; Kramer & MacKinnon, Rep. Prog. Phys. 56, 1469
    // (1993) for the method): slices M = Lambda L / eps^2; per slice 2(2d-1) N_ch^2 for the sparse
    // slice times the N_ch-column block plus (10/3) N_ch^3 / q for the Householder QR of the
    // 2N_ch x N_ch block every q slices (2mn^2 - 2n^3/3 with m = 2n; common practice).
    // Lambda = 0.6, eps = 0.002 so eps^2 = 4e-6, d = 3 so 2(2d-1) = 10, q = 8 (the default).
    const estimate = estimateCampaign(exampleSpec());

    it('should take Lambda L / eps^2 slices when the precision and Lambda are given', () => {
      // L = 6: 0.6 × 6 / 4e-6 = 900 000; L = 8: 1 200 000; L = 12: 1 800 000; L = 16: 2 400 000.
      expect(estimate.rows.map((r) => r.slices)).toEqual([900_000, 1_200_000, 1_800_000, 2_400_000]);
    });

    it('should count slices × (10 N_ch^2 + (10/3) N_ch^3 / 8) operations per job when d = 3', () => {
      // L = 6,  N_ch = 36:  10 × 1 296 + (10/3) × 46 656 / 8 = 12 960 + 19 440 = 32 400 per slice;
      //                     × 900 000 = 2.916e10.
      // L = 8,  N_ch = 64:  10 × 4 096 + (10/3) × 262 144 / 8 = 40 960 + 109 226.67 = 450 560 / 3;
      //                     × 1 200 000 = 1.80224e11.
      // L = 12, N_ch = 144: 10 × 20 736 + (10/3) × 2 985 984 / 8 = 207 360 + 1 244 160 = 1 451 520;
      //                     × 1 800 000 = 2.612736e12.
      // L = 16, N_ch = 256: 10 × 65 536 + (10/3) × 16 777 216 / 8 = 655 360 + 6 990 506.67 = 22 937 600 / 3;
      //                     × 2 400 000 = 1.835008e13.
      const expected = [2.916e10, 1.80224e11, 2.612736e12, 1.835008e13];
      estimate.rows.forEach((r, i) => expectRel(r.operations, expected[i]));
    });

    it('should turn operations into core-hours at the default rate when no pilots are given', () => {
      // core-hours = operations × jobs / DEFAULT_FLOPS_PER_CORE (1e9 flop/s, common practice) / 3600:
      // L = 6:  29.16 s × 13 / 3600 = 0.1053;      L = 8:  180.224 s × 13 / 3600 = 0.65080889;
      // L = 12: 2 612.736 s × 13 / 3600 = 9.43488; L = 16: 18 350.08 s × 13 / 3600 = 66.2641778.
      // Total: (29.16 + 180.224 + 2 612.736 + 18 350.08) × 13 / 3600 = 21 172.2 × 13 / 3600 = 76.4551667.
      expect(DEFAULT_FLOPS_PER_CORE).toBe(1e9);
      expect(estimate.rate).toEqual({ source: 'default', flopsPerCore: 1e9 });
      expect(estimate.rows.map((r) => r.jobs)).toEqual([JOBS, JOBS, JOBS, JOBS]);
      expect(estimate.rows.map((r) => r.points)).toEqual([13, 13, 13, 13]);
      expectRel(estimate.rows[0].coreSecondsPerJob, 29.16);
      const expected = [0.1053, 180.224 * 13 / 3600, 9.43488, 18_350.08 * 13 / 3600];
      estimate.rows.forEach((r, i) => expectRel(r.coreHours, expected[i]));
      expectRel(estimate.totalCoreHours, 275_238.6 / 3600);
    });

    it('should give each size its share of the total when the shares sum to 1', () => {
      // share = core-seconds of the size / 21 172.2: 29.16 → 0.00137728, 180.224 → 0.00851229,
      // 2 612.736 → 0.12340409, 18 350.08 → 0.86670634.
      const expected = [29.16, 180.224, 2_612.736, 18_350.08].map((s) => s / 21_172.2);
      estimate.rows.forEach((r, i) => expectRel(r.share, expected[i], 1e-9));
      expectRel(estimate.rows.reduce((s, r) => s + r.share, 0), 1);
    });

    it('should hold the 2N_ch x N_ch block, its QR workspace and one slice when counting memory', () => {
      // (4 N_ch^2 + N_ch) × 8 bytes: L = 16: (4 × 65 536 + 256) × 8 = 262 400 × 8 = 2 099 200 bytes.
      expect(estimate.rows[3].peakMemoryBytes).toBe(2_099_200);
      expect(estimate.peakMemoryBytes).toBe(2_099_200);
      expect(estimate.nodeMemoryBytes).toBe(256 * 2 ** 30);
      expect(estimate.fitsNode).toBe(true);
    });

    it('should not add a slice when Lambda L / eps^2 is whole but floating point overshoots it', () => {
      // 0.6 × 43 / 0.002^2 = 25.8 / 4e-6 = 6 450 000 exactly; in doubles it is 6450000.000000001.
      const cost = jobCost(exampleSpec({ sizes: [43] }), 43);
      expect(cost.slices).toBe(6_450_000);
      // A fraction of a slice still rounds up: 0.6 × 7 / 0.3^2 = 46.67 → 47.
      expect(jobCost(exampleSpec({ targetPrecision: 0.3 }), 7).slices).toBe(47);
    });

    it('should use Lambda = 1 and q = 8 when the method options leave them out', () => {
      // L = 6, eps = 0.01: 1 × 6 / 1e-4 = 60 000 slices of 32 400 operations = 1.944e9.
      expect(METHOD_OPTION_DEFAULTS.expectedLambda).toBe(1);
      expect(METHOD_OPTION_DEFAULTS.reorthogonalizeEvery).toBe(8);
      const cost = jobCost(exampleSpec({ targetPrecision: 0.01, methodOptions: {} }), 6);
      expect(cost.slices).toBe(60_000);
      expectRel(cost.operations, 1.944e9);
      // q = 4 doubles the QR part: 12 960 + 38 880 = 51 840 per slice; × 60 000 = 3.1104e9.
      expectRel(jobCost(exampleSpec({ targetPrecision: 0.01, methodOptions: { reorthogonalizeEvery: 4 } }), 6).operations, 3.1104e9);
    });

    it('should use 2(2d-1) = 6 for the slice product when d = 2', () => {
      // d = 2, L = 10, N_ch = 10, eps = 0.01, Lambda = 1: 100 000 slices ×
      // (6 × 100 + (10/3) × 1 000 / 8 = 600 + 416.67 = 3 050 / 3) = 1.0166667e8.
      const cost = jobCost({ method: 'transfer-matrix', dimension: 2, symmetryClass: 'AI', targetPrecision: 0.01, methodOptions: {} }, 10);
      expect(cost.slices).toBe(100_000);
      expectRel(cost.operations, 1e5 * 3050 / 3);
    });
  });

  describe('exact diagonalization worked example', () => {
    // ED (REFERENCES: O(N^3) time, O(N^2) memory, 8 bytes real / 16 complex; common practice):
    // 4/3 N^3 flops for the Householder tridiagonalization, N = L^3.
    const estimate = estimateCampaign(exampleSpec({ method: 'exact-diagonalization' }));

    it('should count 4/3 N^3 operations and N^2 × 8 bytes when the class is real', () => {
      // L = 6:  N = 216,   4/3 × 10 077 696 = 13 436 928;            216^2 × 8 = 373 248 bytes.
      // L = 8:  N = 512,   4/3 × 134 217 728 = 178 956 970.67;       512^2 × 8 = 2 097 152.
      // L = 12: N = 1 728, 4/3 × 5 159 780 352 = 6 879 707 136;     1 728^2 × 8 = 23 887 872.
      // L = 16: N = 4 096, 4/3 × 68 719 476 736 = 91 625 968 981.33; 4 096^2 × 8 = 134 217 728 (0.125 GiB).
      const ops = [13_436_928, 536_870_912 / 3, 6_879_707_136, 274_877_906_944 / 3];
      estimate.rows.forEach((r, i) => expectRel(r.operations, ops[i]));
      expect(estimate.rows.map((r) => r.peakMemoryBytes)).toEqual([373_248, 2_097_152, 23_887_872, 134_217_728]);
      expect(estimate.rows.map((r) => r.slices)).toEqual([null, null, null, null]);
    });

    it('should add the sizes into core-hours when there are 13 jobs per size', () => {
      // Sum of operations = 13 436 928 + 178 956 970.67 + 6 879 707 136 + 91 625 968 981.33
      // = 98 698 070 016 → 98.698070016 core-s; × 13 / 3600 = 0.35640969728 core-hours.
      expectRel(estimate.totalCoreHours, 0.35640969728, 1e-11);
      // L = 16 alone: 91.62596898 s × 13 / 3600 = 0.33087155.
      expectRel(estimate.rows[3].coreHours, (274_877_906_944 / 3) * 13 / 1e9 / 3600);
    });

    it('should cost four times the operations and twice the memory when the class is complex', () => {
      // Class A: complex arithmetic (a complex multiply-add is 4 real flops), 16 bytes per entry.
      // L = 16: 4 × 91 625 968 981.33 = 366 503 875 925.33; 4 096^2 × 16 = 268 435 456 (0.25 GiB).
      const complex = estimateCampaign(exampleSpec({ method: 'exact-diagonalization', symmetryClass: 'A' }));
      expectRel(complex.rows[3].operations, 1_099_511_627_776 / 3);
      expect(complex.rows[3].peakMemoryBytes).toBe(268_435_456);
      expect(complex.arithmetic).toEqual({ kind: 'complex', bytesPerEntry: 16 });
    });
  });

  describe('kernel polynomial worked example', () => {
    // KPM (Weisse, Wellein, Alvermann & Fehske, RMP 78, 275 (2006)): moments × vectors × 2 nnz,
    // nnz = N(2d + 1) = 7N in 3D; memory 3 vectors of N plus CSR, nnz × (8 + 4) bytes.
    const estimate = estimateCampaign(exampleSpec({ method: 'kernel-polynomial' }));

    it('should count moments × vectors × 2 nnz operations when 1024 moments and 8 vectors are asked for', () => {
      // L = 6:  nnz = 216 × 7 = 1 512;    1 024 × 8 × 2 × 1 512 = 24 772 608.
      // L = 16: nnz = 4 096 × 7 = 28 672; 16 384 × 28 672 = 469 762 048.
      expect(estimate.rows[0].operations).toBe(24_772_608);
      expect(estimate.rows[3].operations).toBe(469_762_048);
    });

    it('should count three vectors and the sparse matrix when counting memory', () => {
      // L = 6:  3 × 216 × 8 + 1 512 × 12 = 5 184 + 18 144 = 23 328 bytes.
      // L = 16: 3 × 4 096 × 8 + 28 672 × 12 = 98 304 + 344 064 = 442 368 bytes.
      expect(estimate.rows[0].peakMemoryBytes).toBe(23_328);
      expect(estimate.rows[3].peakMemoryBytes).toBe(442_368);
    });

    it('should share the total in proportion to N when the cost is linear in N', () => {
      // N = 216, 512, 1 728, 4 096; sum 6 552; shares 216/6 552 = 0.032967, …, 4 096/6 552 = 0.625153.
      const expected = [216, 512, 1728, 4096].map((n) => n / 6552);
      estimate.rows.forEach((r, i) => expectRel(r.share, expected[i], 1e-12));
      // 16 384 × 7 × 6 552 = 751 403 008 operations → 0.751403008 s × 13 / 3600 = 0.00271351808 core-hours.
      expectRel(estimate.totalCoreHours, 0.00271351808, 1e-11);
    });

    it('should use 16-byte entries and 20-byte CSR entries when the class is complex', () => {
      // Class AII, L = 16: 4 × 469 762 048 = 1 879 048 192 operations;
      // 3 × 4 096 × 16 + 28 672 × 20 = 196 608 + 573 440 = 770 048 bytes.
      const row = estimateCampaign(exampleSpec({ method: 'kernel-polynomial', symmetryClass: 'AII' })).rows[3];
      expect(row.operations).toBe(1_879_048_192);
      expect(row.peakMemoryBytes).toBe(770_048);
    });
  });

  describe('shift-invert worked example', () => {
    // Shift-invert on a 3D lattice (memory; Schenk, Bollhoefer & Roemer, SIAM Rev. 50, 91 (2008) for the
    // approach): factorization N^2 flops, fill N^(4/3); 50 eigenpairs take 2 × 50 solves of 4 flops
    // per fill entry; memory = (fill + 2 × 50 × N) × 8 bytes.
    const estimate = estimateCampaign(exampleSpec({ method: 'shift-invert' }));

    it('should count N^2 plus 400 N^(4/3) operations when 50 eigenpairs are asked for', () => {
      // L = 8:  N = 512,   N^2 = 262 144,    N^(4/3) = 8^4 = 4 096,    400 × 4 096 = 1 638 400;    total 1 900 544.
      // L = 16: N = 4 096, N^2 = 16 777 216, N^(4/3) = 16^4 = 65 536, 400 × 65 536 = 26 214 400; total 42 991 616.
      expectRel(estimate.rows[1].operations, 1_900_544);
      expectRel(estimate.rows[3].operations, 42_991_616);
    });

    it('should count the fill and the Lanczos basis when counting memory', () => {
      // L = 8:  (4 096 + 100 × 512) × 8 = 55 296 × 8 = 442 368 bytes.
      // L = 16: (65 536 + 100 × 4 096) × 8 = 475 136 × 8 = 3 801 088 bytes.
      expectRel(estimate.rows[1].peakMemoryBytes, 442_368);
      expectRel(estimate.rows[3].peakMemoryBytes, 3_801_088);
    });
  });

  describe("recursive Green's function worked example", () => {
    // RGF of an L^(d-1) x L bar (REFERENCES: O(L × N_ch^3); prefactor common practice): L slices, each an
    // N_ch x N_ch inversion and two products, 2 + 2 + 2 = 6 N_ch^3; memory 4 N_ch^2 entries.
    const estimate = estimateCampaign(exampleSpec({ method: 'recursive-green' }));

    it('should count 6 L N_ch^3 operations and 4 N_ch^2 entries when d = 3', () => {
      // L = 8:  N_ch = 64,  8 × 6 × 262 144 = 12 582 912;       4 × 4 096 × 8 = 131 072 bytes.
      // L = 16: N_ch = 256, 16 × 6 × 16 777 216 = 1 610 612 736; 4 × 65 536 × 8 = 2 097 152 bytes.
      expect(estimate.rows[1].operations).toBe(12_582_912);
      expect(estimate.rows[3].operations).toBe(1_610_612_736);
      expect(estimate.rows[1].peakMemoryBytes).toBe(131_072);
      expect(estimate.rows[3].peakMemoryBytes).toBe(2_097_152);
      // 1 610 612 736 flops = 1.610612736 s × 13 / 3600 = 0.0058161015 core-hours.
      expectRel(estimate.rows[3].coreHours, 1.610612736 * 13 / 3600);
    });
  });

  describe('jobs', () => {
    it('should run points × energies × realizations jobs per size when several energies and realizations are asked for', () => {
      // 13 disorder points × 3 energies × 100 realizations = 3 900 jobs; ED at L = 6:
      // 13 436 928 flops × 3 900 / 1e9 / 3600 = 0.014556672 core-hours.
      const row = estimateCampaign(exampleSpec({ method: 'exact-diagonalization', energies: [0, 0.5, 1], realizations: 100 })).rows[0];
      expect(row.jobs).toBe(3900);
      expect(row.energies).toBe(3);
      expect(row.realizations).toBe(100);
      expectRel(row.coreHours, 0.014556672);
    });

    it('should count the values of an explicit disorder list when the grid is a list', () => {
      const row = estimateCampaign(exampleSpec({ disorder: { values: [15, 16.5, 18] } })).rows[0];
      expect(row.points).toBe(3);
      expect(row.jobs).toBe(3);
    });

    it('should list the rows by increasing size when the sizes are given out of order', () => {
      const estimate = estimateCampaign(exampleSpec({ sizes: [16, 6, 12, 8] }));
      expect(estimate.rows.map((r) => r.size)).toEqual([6, 8, 12, 16]);
      expect(estimate.rows.map((r) => r.sites)).toEqual([216, 512, 1728, 4096]);
    });
  });

  describe('arithmetic by symmetry class', () => {
    // Real arithmetic where time reversal squares to +1 (Altland & Zirnbauer, PRB 55, 1142 (1997): T^2 = +1
    // in AI, BDI, CI); complex in the other seven classes.
    it('should be real with 8-byte entries when the class is AI, BDI or CI', () => {
      for (const cls of ['AI', 'BDI', 'CI'] as const) expect(arithmeticOf(cls), cls).toEqual({ kind: 'real', bytesPerEntry: 8 });
    });

    it('should be complex with 16-byte entries when the class is any of the other seven', () => {
      const others = SYMMETRY_CLASSES.filter((c) => !['AI', 'BDI', 'CI'].includes(c));
      expect(others).toEqual(['A', 'AII', 'AIII', 'CII', 'D', 'C', 'DIII']);
      for (const cls of others) expect(arithmeticOf(cls), cls).toEqual({ kind: 'complex', bytesPerEntry: 16 });
    });

    it('should multiply every method\'s operations by 4 when the arithmetic is complex', () => {
      for (const method of ['transfer-matrix', 'exact-diagonalization', 'kernel-polynomial', 'shift-invert', 'recursive-green'] as const) {
        const real = jobCost(exampleSpec({ method }), 8).operations;
        const complex = jobCost(exampleSpec({ method, symmetryClass: 'DIII' }), 8).operations;
        expectRel(complex, 4 * real);
      }
    });

    it('should state the arithmetic in the assumptions when the estimate is made', () => {
      expect(estimateCampaign(exampleSpec({ symmetryClass: 'AIII' })).assumptions).toContain('Symmetry class AIII: complex arithmetic, 16 bytes per matrix entry.');
    });
  });

  describe('fitsNode', () => {
    // Node memory = memoryGiBPerNode × 2^30 bytes. ED at L = 16 in 3D needs 4 096^2 × 8 = 2^27 bytes = 0.125 GiB.
    it('should fit when the job needs exactly the node memory', () => {
      const estimate = estimateCampaign(exampleSpec({ method: 'exact-diagonalization', node: { coresPerNode: 64, memoryGiBPerNode: 0.125 } }));
      expect(GIB).toBe(2 ** 30);
      expect(estimate.nodeMemoryBytes).toBe(2 ** 27);
      expect(estimate.rows.map((r) => r.fitsNode)).toEqual([true, true, true, true]);
      expect(estimate.fitsNode).toBe(true);
    });

    it('should not fit when the job needs more than the node memory', () => {
      // Complex (class A) doubles it: 2^28 bytes > 2^27 at L = 16; L = 12: 1 728^2 × 16 = 47 775 744 still fits.
      const estimate = estimateCampaign(exampleSpec({ method: 'exact-diagonalization', symmetryClass: 'A', node: { coresPerNode: 64, memoryGiBPerNode: 0.125 } }));
      expect(estimate.rows.map((r) => r.fitsNode)).toEqual([true, true, true, false]);
      expect(estimate.fitsNode).toBe(false);
      expect(estimate.peakMemoryBytes).toBe(2 ** 28);
    });
  });

  describe('scaling with size', () => {
    // Local log-log slope of operations (or memory) between L and 2L, checked against the published
    // exponent of each method (REFERENCES.md, "Cost of the numerical methods").
    const slope = (method: Method, d: 1 | 2 | 3, L: number, of: 'operations' | 'memoryBytes' = 'operations') => {
      const spec = { method, dimension: d, symmetryClass: 'AI' as const, targetPrecision: 0.01, methodOptions: {} };
      return Math.log(jobCost(spec, 2 * L)[of] / jobCost(spec, L)[of]) / Math.log(2);
    };

    it('should approach L^7 for the transfer matrix when d = 3 and L is large', () => {
      // Lambda L / eps^2 slices × N_ch^3 = L^7 / eps^2 (REFERENCES; Kramer & MacKinnon 1993 for the method).
      expect(Math.abs(slope('transfer-matrix', 3, 1000) - 7)).toBeLessThan(1e-4);
      // "Approaches": the N_ch^2 slice product still shows at small L.
      expect(7 - slope('transfer-matrix', 3, 4)).toBeGreaterThan(7 - slope('transfer-matrix', 3, 1000));
      expect(sizeExponent('transfer-matrix', 3)).toBe(7);
    });

    it('should approach L^4 for the transfer matrix when d = 2 and L is large', () => {
      // L slices × N_ch^3 = L × L^3 (REFERENCES, TMM cost with N_ch = L^(d-1)).
      expect(Math.abs(slope('transfer-matrix', 2, 100_000) - 4)).toBeLessThan(1e-3);
      expect(sizeExponent('transfer-matrix', 2)).toBe(4);
    });

    it('should grow as N^3 = L^(3d) for exact diagonalization', () => {
      // REFERENCES: ED O(N^3) time (common practice).
      for (const d of [1, 2, 3] as const) {
        expect(slope('exact-diagonalization', d, 8)).toBeCloseTo(3 * d, 9);
        expect(sizeExponent('exact-diagonalization', d)).toBe(3 * d);
      }
    });

    it('should grow as N^2 = L^(2d) in memory for exact diagonalization', () => {
      // REFERENCES: ED O(N^2) memory (common practice).
      for (const d of [1, 2, 3] as const) expect(slope('exact-diagonalization', d, 8, 'memoryBytes')).toBeCloseTo(2 * d, 9);
    });

    it('should grow linearly in N = L^d in time and memory for the kernel polynomial method', () => {
      // Weisse, Wellein, Alvermann & Fehske, RMP 78, 275 (2006): O(moments × vectors × nnz) time, O(N) memory.
      for (const d of [1, 2, 3] as const) {
        expect(slope('kernel-polynomial', d, 8)).toBeCloseTo(d, 9);
        expect(slope('kernel-polynomial', d, 8, 'memoryBytes')).toBeCloseTo(d, 9);
        expect(sizeExponent('kernel-polynomial', d)).toBe(d);
      }
    });

    it('should approach N^2 = L^6 for shift-invert when d = 3 and L is large', () => {
      // Memory; Schenk, Bollhoefer & Roemer, SIAM Rev. 50, 91 (2008) for the approach: about O(N^2) flops.
      expect(Math.abs(slope('shift-invert', 3, 10_000) - 6)).toBeLessThan(1e-4);
      expect(6 - slope('shift-invert', 3, 8)).toBeGreaterThan(6 - slope('shift-invert', 3, 10_000));
      expect(sizeExponent('shift-invert', 3)).toBe(6);
    });

    it('should approach N^(4/3) = L^4 in memory for shift-invert when d = 3 and L is large', () => {
      // Memory; Schenk, Bollhoefer & Roemer 2008 for the approach: O(N^(4/3)) memory with nested dissection.
      expect(Math.abs(slope('shift-invert', 3, 100_000, 'memoryBytes') - 4)).toBeLessThan(2e-3);
      expect(4 - slope('shift-invert', 3, 8, 'memoryBytes')).toBeGreaterThan(4 - slope('shift-invert', 3, 100_000, 'memoryBytes'));
    });

    it("should grow as L × N_ch^3 = L^7 for the recursive Green's function when d = 3", () => {
      // REFERENCES: RGF of an L^(d-1) x L bar, O(L × N_ch^3) (common practice).
      expect(slope('recursive-green', 3, 8)).toBeCloseTo(7, 9);
      expect(slope('recursive-green', 2, 8)).toBeCloseTo(4, 9);
      expect(sizeExponent('recursive-green', 3)).toBe(7);
    });

    it('should report the method exponent on the estimate when it is made', () => {
      expect(estimateCampaign(exampleSpec()).sizeExponent).toBe(7);
      expect(estimateCampaign(exampleSpec({ method: 'kernel-polynomial' })).sizeExponent).toBe(3);
    });
  });

  describe('assumptions', () => {
    it('should mark the options it filled in as defaults when the proposer left them out', () => {
      const assumptions = estimateCampaign(exampleSpec()).assumptions;
      expect(assumptions).toContain('Slices per job = Lambda × L / eps² with Lambda = 0.6, eps = 0.002.');
      expect(assumptions).toContain('QR re-orthonormalization every 8 slices (default).');
      expect(assumptions[0]).toMatch(/default sustained rate of 1\.0 GFLOP\/s per core/);
    });
  });
});
