import { describe, expect, it } from 'vitest';
import { CRITICAL_EXPONENTS } from '../physics/reference-values';
import type { CampaignSpec, CampaignSpecInput } from './campaign-spec.schema';
import { estimateCampaign } from './cost-model';
import { exampleSpec } from './example-spec.fixture';
import { campaignNotices, Notice, NOTICE_CODES, PILOT_EXTRAPOLATION_FACTOR, PRECISION_COST_CORE_HOURS, PRECISION_COST_THRESHOLD, type NoticeCode } from './notices';

const noticesOf = (spec: CampaignSpec) => campaignNotices(spec, estimateCampaign(spec));
const codesOf = (overrides: Partial<CampaignSpecInput>) => noticesOf(exampleSpec(overrides)).map((n) => n.code);
const only = (overrides: Partial<CampaignSpecInput>, code: NoticeCode) => {
  const found = noticesOf(exampleSpec(overrides)).filter((n) => n.code === code);
  expect(found, code).toHaveLength(1);
  return found[0];
};
/** Pilots with core-seconds = L^7 / 1000 at the given sizes. */
const pilots = (sizes: number[]) => sizes.map((size) => ({ size, seconds: size ** 7 / 1000, cores: 1 }));

/** One plan that sets off each notice, and one beside it that does not. Typed by code so a new code needs both. */
const CASES: Record<NoticeCode, { triggers: Partial<CampaignSpecInput>; quiet: Partial<CampaignSpecInput>; severity: Notice['severity']; field: string }> = {
  'no-transition-1d': { triggers: { dimension: 1 }, quiet: { dimension: 3 }, severity: 'warning', field: 'dimension' },
  'no-transition-2d': { triggers: { dimension: 2, symmetryClass: 'AI' }, quiet: { dimension: 2, symmetryClass: 'AII' }, severity: 'warning', field: 'symmetryClass' },
  'grid-misses-critical-disorder': { triggers: { disorder: { from: 10, to: 14, step: 1 } }, quiet: { disorder: { from: 15, to: 18, step: 0.25 } }, severity: 'warning', field: 'disorder' },
  'too-few-sizes': { triggers: { sizes: [8, 16] }, quiet: { sizes: [6, 12, 16] }, severity: 'warning', field: 'sizes' },
  'narrow-size-range': { triggers: { sizes: [12, 16, 20] }, quiet: { sizes: [6, 8, 12] }, severity: 'warning', field: 'sizes' },
  'job-exceeds-node': {
    triggers: { method: 'exact-diagonalization', symmetryClass: 'AIII', node: { coresPerNode: 64, memoryGiBPerNode: 0.125 } },
    quiet: { method: 'exact-diagonalization', symmetryClass: 'BDI', node: { coresPerNode: 64, memoryGiBPerNode: 0.125 } },
    severity: 'warning',
    field: 'sizes',
  },
  'precision-cost': { triggers: { targetPrecision: 0.0005 }, quiet: { targetPrecision: 0.001 }, severity: 'warning', field: 'targetPrecision' },
  'pilot-extrapolation': { triggers: { pilotTimings: pilots([4, 6]) }, quiet: { pilotTimings: pilots([4, 8]) }, severity: 'info', field: 'pilotTimings' },
};

describe('campaign notices', () => {
  describe('every code', () => {
    it('should raise no notice when the plan is the sound 3D example', () => {
      expect(noticesOf(exampleSpec())).toEqual([]);
    });

    it.each(NOTICE_CODES)('should raise %s with its severity, field and a message when its plan calls for it', (code) => {
      const notice = only(CASES[code].triggers, code);
      expect(notice.severity).toBe(CASES[code].severity);
      expect(notice.field).toBe(CASES[code].field);
      expect(notice.message.length).toBeGreaterThan(40);
      expect(Notice.parse(notice)).toEqual(notice);
    });

    it.each(NOTICE_CODES)('should not raise %s when the plan beside it does not call for it', (code) => {
      expect(codesOf(CASES[code].quiet)).not.toContain(code);
    });
  });

  describe('no-transition-1d', () => {
    // Abrahams et al., PRL 42, 673 (1979): in d = 1 every state localizes at any disorder.
    it('should warn that there is no transition when a 1D campaign seeks a critical point', () => {
      const n = only({ dimension: 1 }, 'no-transition-1d');
      expect(n.message).toMatch(/no metal–insulator transition/);
      expect(n.message).toMatch(/d = 3 \(or d = 2 in class AII\)/);
    });

    it('should only inform when a 1D campaign measures localization lengths', () => {
      const n = only({ dimension: 1, goal: 'localization-length' }, 'no-transition-1d');
      expect(n.severity).toBe('info');
      expect(n.message).toBe('In one dimension every state is localized for any disorder: expect localization lengths, not a transition.');
    });
  });

  describe('no-transition-2d', () => {
    // Abrahams et al. 1979; REFERENCES "Scaling theory": in d = 2 classes AI and A localize, AII has a transition.
    it('should warn without the quantum Hall sentence when the class is AI', () => {
      const n = only({ dimension: 2, symmetryClass: 'AI' }, 'no-transition-2d');
      expect(n.message).toMatch(/^In two dimensions in class AI all states localize for any disorder/);
      expect(n.message).toMatch(/use the symplectic class AII/);
      expect(n.message).not.toMatch(/quantum Hall/);
    });

    it('should add the integer quantum Hall exception when the class is A', () => {
      // nu = 2.593, Slevin & Ohtsuki, PRB 80, 041304(R) (2009).
      const n = only({ dimension: 2, symmetryClass: 'A' }, 'no-transition-2d');
      expect(n.message).toMatch(/in class A all states localize/);
      expect(n.message).toContain(`The exception is the integer quantum Hall transition in class A`);
      expect(n.message).toContain(`nu = ${CRITICAL_EXPONENTS.quantumHall.nu}, Slevin & Ohtsuki 2009`);
    });

    it('should keep the quantum Hall sentence but only inform when a 2D class A campaign measures localization lengths', () => {
      const n = only({ dimension: 2, symmetryClass: 'A', goal: 'localization-length' }, 'no-transition-2d');
      expect(n.severity).toBe('info');
      expect(n.message).toMatch(/localization lengths can be exponentially large/);
      expect(n.message).toMatch(/integer quantum Hall/);
    });

    it('should raise nothing about a 2D transition when the class is AII', () => {
      // 2D symplectic class has a transition (nu = 2.73, Asada, Slevin & Ohtsuki, PRL 89, 256601 (2002)).
      expect(codesOf({ dimension: 2, symmetryClass: 'AII' })).not.toContain('no-transition-2d');
    });

    it('should raise nothing about a 2D transition when the campaign is 3D in class A', () => {
      expect(codesOf({ dimension: 3, symmetryClass: 'A' })).not.toContain('no-transition-2d');
    });
  });

  describe('grid-misses-critical-disorder', () => {
    // W_c = 16.54 ± 0.02 for the 3D Anderson model, box disorder, E = 0 (Slevin & Ohtsuki, PRL 82, 382 (1999);
    // confirmed in secondary sources).
    it('should name W_c and its source when the grid lies below it', () => {
      const n = only({ disorder: { from: 10, to: 14, step: 1 } }, 'grid-misses-critical-disorder');
      expect(n.message).toContain('W from 10 to 14');
      expect(n.message).toContain('W_c = 16.54 ± 0.02 (Slevin & Ohtsuki, PRL 82, 382 (1999))');
    });

    it('should warn when the grid lies above W_c', () => {
      expect(codesOf({ disorder: { values: [17, 18, 19] } })).toContain('grid-misses-critical-disorder');
    });

    it('should warn when the grid only reaches W_c at its edge', () => {
      expect(codesOf({ disorder: { from: 16.54, to: 18, step: 0.5 } })).toContain('grid-misses-critical-disorder');
    });

    it('should stay quiet when the grid brackets W_c', () => {
      expect(codesOf({ disorder: { values: [16.5, 16.6] } })).not.toContain('grid-misses-critical-disorder');
    });

    it('should stay quiet when the model, class, energy, dimension or goal is not the one W_c belongs to', () => {
      const below = { disorder: { from: 10, to: 14, step: 1 } };
      expect(codesOf({ ...below, model: 'anderson-gaussian' })).not.toContain('grid-misses-critical-disorder');
      expect(codesOf({ ...below, symmetryClass: 'A' })).not.toContain('grid-misses-critical-disorder');
      expect(codesOf({ ...below, energies: [0.5] })).not.toContain('grid-misses-critical-disorder');
      expect(codesOf({ ...below, dimension: 2, symmetryClass: 'AII' })).not.toContain('grid-misses-critical-disorder');
      expect(codesOf({ ...below, goal: 'localization-length' })).not.toContain('grid-misses-critical-disorder');
    });

    it('should warn when E = 0 is one of several energies', () => {
      expect(codesOf({ disorder: { from: 10, to: 14, step: 1 }, energies: [0, 0.5] })).toContain('grid-misses-critical-disorder');
    });
  });

  describe('too-few-sizes', () => {
    // Three sizes at least for finite-size scaling (common practice).
    it('should count the sizes in its message when there are two', () => {
      expect(only({ sizes: [8, 16] }, 'too-few-sizes').message).toContain('this plan has 2');
    });

    it('should warn when there is a single size', () => {
      expect(only({ sizes: [16] }, 'too-few-sizes').message).toContain('this plan has 1');
    });

    it('should stay quiet when the goal is not a critical point', () => {
      expect(codesOf({ sizes: [8, 16], goal: 'spectral-statistics' })).not.toContain('too-few-sizes');
    });
  });

  describe('narrow-size-range', () => {
    // Sizes spanning at least a factor of two (common practice).
    it('should give the factor and the size to add when the sizes span less than two', () => {
      // 20 / 12 = 1.67 → "1.7"; add 2 × 12 = 24.
      const n = only({ sizes: [12, 16, 20] }, 'narrow-size-range');
      expect(n.message).toContain('span only a factor 1.7 (L from 12 to 20)');
      expect(n.message).toContain('Add a size of 24 or more');
    });

    it('should stay quiet when the sizes span exactly a factor of two', () => {
      expect(codesOf({ sizes: [6, 8, 12] })).not.toContain('narrow-size-range');
    });

    it('should stay quiet when there is one size or the goal is not a critical point', () => {
      expect(codesOf({ sizes: [16] })).not.toContain('narrow-size-range');
      expect(codesOf({ sizes: [12, 16, 20], goal: 'transport' })).not.toContain('narrow-size-range');
    });
  });

  describe('job-exceeds-node', () => {
    // ED memory N^2 × 16 bytes (complex): L = 16 → 4 096^2 × 16 = 2^28 bytes = 0.25 GiB; node 0.125 GiB = 2^27.
    it('should name the sizes and the memory when a job needs more than a node', () => {
      const n = only(CASES['job-exceeds-node'].triggers, 'job-exceeds-node');
      expect(n.message).toMatch(/^A job at L = 16 needs up to 0\.25 GiB, more than one node's 0\.125 GiB\./);
    });

    it('should list every size that does not fit and quote the largest when several do not', () => {
      // L = 12: 1 728^2 × 16 = 47 775 744 bytes = 0.0445 GiB > 0.04 GiB; L = 16 needs 0.25 GiB.
      const n = only({ method: 'exact-diagonalization', symmetryClass: 'A', node: { coresPerNode: 64, memoryGiBPerNode: 0.04 } }, 'job-exceeds-node');
      expect(n.message).toMatch(/^A job at L = 12, 16 needs up to 0\.25 GiB, more than one node's 0\.04 GiB\./);
    });

    it('should warn whatever the goal is when a job does not fit', () => {
      expect(only({ ...CASES['job-exceeds-node'].triggers, goal: 'spectral-statistics' }, 'job-exceeds-node').severity).toBe('warning');
    });
  });

  describe('precision-cost', () => {
    // Threshold 0.1 % (common practice: studies aim at 0.1 %–1 %).
    it('should quote the cost and the cost at twice the eps when the precision is below 0.1 %', () => {
      expect(PRECISION_COST_THRESHOLD).toBe(0.001);
      const spec = exampleSpec({ targetPrecision: 0.0005 });
      const total = estimateCampaign(spec).totalCoreHours;
      const n = noticesOf(spec).find((x) => x.code === 'precision-cost');
      expect(n?.message).toContain('A target precision of 0.05 %');
      expect(n?.message).toContain(`costs ${Number(total.toPrecision(3)).toLocaleString('en')} core-hours`);
      expect(n?.message).toContain('At 0.1 % it would be about');
    });

    it('should warn at an ordinary precision when the plan passes a million core-hours', () => {
      // 3D bars up to L = 96 at eps = 0.002: ~10^7 core-hours (L^7 growth), where a look at eps pays most.
      const spec = exampleSpec({ sizes: [32, 64, 96], realizations: 1, targetPrecision: 0.002 });
      expect(estimateCampaign(spec).totalCoreHours).toBeGreaterThan(PRECISION_COST_CORE_HOURS);
      expect(noticesOf(spec).map((n) => n.code)).toContain('precision-cost');
    });

    it('should stay quiet when the method is not the transfer matrix', () => {
      expect(codesOf({ method: 'kernel-polynomial', targetPrecision: 0.0005 })).not.toContain('precision-cost');
    });
  });

  describe('pilot-extrapolation', () => {
    it('should name the largest size, the largest pilot and both exponents when the sizes go past twice the pilots', () => {
      // L = 16 > 2 × 6 = 12; the pilots follow L^7 exactly, the TMM's asymptotic exponent in 3D is 7.
      expect(PILOT_EXTRAPOLATION_FACTOR).toBe(2);
      const n = only({ pilotTimings: pilots([4, 6]) }, 'pilot-extrapolation');
      expect(n.message).toContain('The largest size (L = 16) is more than 2× the largest pilot (L = 6)');
      expect(n.message).toContain("the fitted exponent 7.00 (the method's asymptotic exponent is 7)");
    });

    it('should stay quiet when there are no pilots', () => {
      expect(codesOf({ sizes: [6, 8, 12, 160] })).not.toContain('pilot-extrapolation');
    });
  });
});
