import { describe, expect, it } from 'vitest';
import { CampaignSpec, disorderCount, disorderValues, MAX_GRID_POINTS, pilotSetProblems, rangeCount } from './campaign-spec.schema';
import { EXAMPLE_CAMPAIGN_SPEC } from './example-spec';

/** The issues of a spec that differs from the example in the given fields, as [path, message]. */
const issuesOf = (overrides: Record<string, unknown>) => {
  const result = CampaignSpec.safeParse({ ...EXAMPLE_CAMPAIGN_SPEC, ...overrides });
  expect(result.success, 'the spec should have been refused').toBe(false);
  return (result.error?.issues ?? []).map((i) => [i.path, i.message]);
};

describe('CampaignSpec', () => {
  describe('the issue example', () => {
    it('should accept it and fill in the goal when none is given', () => {
      const spec = CampaignSpec.parse(EXAMPLE_CAMPAIGN_SPEC);
      expect(spec.goal).toBe('critical-point');
      expect(spec.methodOptions).toEqual({ moments: 1024, randomVectors: 8, eigenpairs: 50, expectedLambda: 0.6 });
    });

    it('should stand for 13 disorder points when W runs from 15 to 18 by 0.25', () => {
      const spec = CampaignSpec.parse(EXAMPLE_CAMPAIGN_SPEC);
      expect(disorderCount(spec.disorder)).toBe(13);
      expect(disorderValues(spec.disorder)).toEqual([15, 15.25, 15.5, 15.75, 16, 16.25, 16.5, 16.75, 17, 17.25, 17.5, 17.75, 18]);
    });

    it('should accept a method without precision when it is not the transfer matrix', () => {
      expect(CampaignSpec.safeParse({ ...EXAMPLE_CAMPAIGN_SPEC, method: 'exact-diagonalization', targetPrecision: undefined }).success).toBe(true);
    });
  });

  describe('sizes', () => {
    it('should refuse 0 and negative sizes at their index when they are not positive', () => {
      expect(issuesOf({ sizes: [0, 8, -4] })).toEqual([
        [['sizes', 0], 'sizes must be positive integers'],
        [['sizes', 2], 'sizes must be positive integers'],
      ]);
    });

    it('should refuse a fractional size when it is not whole', () => {
      expect(issuesOf({ sizes: [6, 8.5] })).toEqual([[['sizes', 1], 'sizes must be whole numbers']]);
    });

    it('should refuse an empty list when no size is given', () => {
      expect(issuesOf({ sizes: [] })).toEqual([[['sizes'], 'give at least one system size L']]);
    });

    it('should refuse duplicates when a size appears twice', () => {
      expect(issuesOf({ sizes: [6, 8, 8, 12] })).toEqual([[['sizes'], 'each size may appear only once']]);
    });
  });

  describe('disorder grid', () => {
    it('should refuse an empty values list when no value is given', () => {
      expect(issuesOf({ disorder: { values: [] } })).toEqual([[['disorder', 'values'], 'list at least one disorder value']]);
    });

    it('should refuse values together with a range when both are given', () => {
      expect(issuesOf({ disorder: { values: [16], from: 15 } })).toEqual([[['disorder', 'values'], 'give either values or from, to and step, not both']]);
    });

    it('should name each missing bound when a range is incomplete', () => {
      expect(issuesOf({ disorder: { from: 15 } })).toEqual([
        [['disorder', 'to'], 'to is required (or give a list of values)'],
        [['disorder', 'step'], 'step is required (or give a list of values)'],
      ]);
    });

    it('should refuse a reversed grid at to when to is below from', () => {
      expect(issuesOf({ disorder: { from: 18, to: 15, step: 0.25 } })).toEqual([[['disorder', 'to'], 'to (15) must not be below from (18); the grid runs upwards']]);
    });

    it('should refuse a step of 0 or below when the grid could never end', () => {
      expect(issuesOf({ disorder: { from: 15, to: 18, step: 0 } })).toEqual([[['disorder', 'step'], 'step must be greater than 0']]);
      expect(issuesOf({ disorder: { from: 15, to: 18, step: -0.25 } })).toEqual([[['disorder', 'step'], 'step must be greater than 0']]);
    });

    it('should refuse a grid of more than 100 000 points at step when the step is too fine', () => {
      // (100 000 - 0) / 0.5 + 1 = 200 001 points.
      expect(issuesOf({ disorder: { from: 0, to: 100_000, step: 0.5 } })).toEqual([
        [['disorder', 'step'], 'this grid has 200,001 points; at most 100,000 are allowed, so take a larger step'],
      ]);
    });

    it('should accept exactly 100 000 points when the grid is at the limit', () => {
      const grid = { from: 1, to: 100_000, step: 1 };
      expect(CampaignSpec.safeParse({ ...EXAMPLE_CAMPAIGN_SPEC, disorder: grid }).success).toBe(true);
      expect(rangeCount(grid.from, grid.to, grid.step)).toBe(MAX_GRID_POINTS);
    });

    it('should refuse more than 100 000 listed values when the list is too long', () => {
      const values = Array.from({ length: MAX_GRID_POINTS + 1 }, (_, i) => i / 1000);
      expect(issuesOf({ disorder: { values } })).toEqual([[['disorder', 'values'], 'at most 100,000 disorder values']]);
    });

    it('should refuse negative disorder at its index when a value is below 0', () => {
      expect(issuesOf({ disorder: { values: [16, -1] } })).toEqual([[['disorder', 'values', 1], 'disorder values must be 0 or more']]);
    });

    it('should refuse unknown keys when the grid carries one', () => {
      const issues = CampaignSpec.safeParse({ ...EXAMPLE_CAMPAIGN_SPEC, disorder: { from: 15, to: 18, step: 0.25, width: 1 } }).error?.issues ?? [];
      expect(issues).toHaveLength(1);
      expect(issues[0]).toMatchObject({ code: 'unrecognized_keys', path: ['disorder'], keys: ['width'] });
      expect(issues[0].message).toContain('width');
    });

    it('should refuse disorder × energies beyond 100 000 points at energies when both are large', () => {
      // 401 points (0 to 100 by 0.25) × 1 000 energies = 401 000.
      const energies = Array.from({ length: 1000 }, (_, i) => i / 1000);
      expect(issuesOf({ disorder: { from: 0, to: 100, step: 0.25 }, energies })).toEqual([
        [['energies'], 'disorder values × energies make 401,000 grid points; at most 100,000 are allowed'],
      ]);
    });
  });

  describe('disorderValues', () => {
    it('should round to 12 significant digits when from + i × step lands off the decimal', () => {
      // 15 + 3 × 0.1 is meant as 15.3; 0.3 + 3 × 0.1 is 0.6000000000000001 in doubles and must read 0.6.
      expect(disorderValues({ from: 15, to: 15.3, step: 0.1 })).toEqual([15, 15.1, 15.2, 15.3]);
      expect(0.3 + 3 * 0.1).not.toBe(0.6);
      expect(disorderValues({ from: 0.3, to: 0.6, step: 0.1 })).toEqual([0.3, 0.4, 0.5, 0.6]);
    });

    it('should include the end when it lies on the grid up to rounding and leave it out when it does not', () => {
      // (0.6 - 0.3) / 0.1 = 2.9999999999999996 in doubles: still 4 points.
      expect(rangeCount(0.3, 0.6, 0.1)).toBe(4);
      expect(disorderValues({ from: 15, to: 16, step: 0.3 })).toEqual([15, 15.3, 15.6, 15.9]);
    });

    it('should return a copy of the listed values when the grid is a list', () => {
      const grid = { values: [16.5, 15] };
      const values = disorderValues(grid);
      expect(values).toEqual([16.5, 15]);
      values.push(1);
      expect(grid.values).toEqual([16.5, 15]);
    });
  });

  describe('symmetry class and method', () => {
    it('should list the ten classes when the class is unknown', () => {
      expect(issuesOf({ symmetryClass: 'BD' })).toEqual([
        [['symmetryClass'], 'symmetry class must be one of the ten Altland–Zirnbauer classes: A, AI, AII, AIII, BDI, CII, D, C, DIII, CI'],
      ]);
    });

    it('should list the methods when the method is unknown', () => {
      expect(issuesOf({ method: 'monte-carlo' })).toEqual([
        [['method'], 'method must be one of: transfer-matrix, exact-diagonalization, shift-invert, kernel-polynomial, recursive-green'],
      ]);
    });

    it('should refuse a dimension other than 1, 2 or 3', () => {
      expect(issuesOf({ dimension: 4 })).toEqual([[['dimension'], 'dimension must be 1, 2 or 3']]);
    });
  });

  describe('target precision', () => {
    it.each([0, 1, -0.01, 1.5])('should refuse %s when the precision is outside (0, 1)', (targetPrecision) => {
      expect(issuesOf({ targetPrecision })).toEqual([[['targetPrecision'], 'target precision must be between 0 and 1 (exclusive)']]);
    });

    it('should accept a precision just inside (0, 1)', () => {
      for (const targetPrecision of [1e-5, 0.999]) expect(CampaignSpec.safeParse({ ...EXAMPLE_CAMPAIGN_SPEC, targetPrecision }).success).toBe(true);
    });

    it('should refuse a precision finer than 0.001 % when the bars could never be run', () => {
      expect(issuesOf({ targetPrecision: 1e-6 })[0][0]).toEqual(['targetPrecision']);
    });

    it('should refuse a plan whose total passes what a round can hold', () => {
      // 3D transfer matrix at L = 400 and eps = 1e-5: ~10^24 operations per job, far past 10^12 core-hours.
      const issues = issuesOf({ sizes: [100, 400], targetPrecision: 1e-5, realizations: 1000 });
      expect(issues).toHaveLength(1);
      expect(issues[0][0]).toEqual(['sizes']);
      expect(issues[0][1]).toMatch(/10\^12/);
    });

    it('should require a precision when the method is the transfer matrix', () => {
      expect(issuesOf({ targetPrecision: undefined })).toEqual([[['targetPrecision'], 'the transfer-matrix method needs a target precision, e.g. 0.01 for 1 %']]);
    });
  });

  describe('pilot timings', () => {
    it('should refuse pilots of a single size when a power law cannot be fitted', () => {
      const pilotTimings = [{ size: 8, seconds: 10, cores: 4 }, { size: 8, seconds: 12, cores: 4 }];
      expect(issuesOf({ pilotTimings })).toEqual([[['pilotTimings'], 'pilot timings need at least two different sizes to fit a power law']]);
    });

    it('should accept an empty list when no pilots were run', () => {
      expect(CampaignSpec.safeParse({ ...EXAMPLE_CAMPAIGN_SPEC, pilotTimings: [] }).success).toBe(true);
      expect(pilotSetProblems([])).toEqual([{ path: ['pilotTimings'], message: 'the pilot CSV has no timings below its header' }]);
    });

    it('should refuse a non-positive time at its row when a pilot has one', () => {
      const pilotTimings = [{ size: 6, seconds: 10, cores: 4 }, { size: 8, seconds: 0, cores: 4 }];
      expect(issuesOf({ pilotTimings })).toEqual([[['pilotTimings', 1, 'seconds'], 'seconds must be greater than 0']]);
    });
  });

  describe('strictness', () => {
    it('should refuse unknown method options when one is misspelt', () => {
      const issues = CampaignSpec.safeParse({ ...EXAMPLE_CAMPAIGN_SPEC, methodOptions: { moment: 1024 } }).error?.issues ?? [];
      expect(issues).toHaveLength(1);
      expect(issues[0]).toMatchObject({ code: 'unrecognized_keys', path: ['methodOptions'], keys: ['moment'] });
    });
  });
});
