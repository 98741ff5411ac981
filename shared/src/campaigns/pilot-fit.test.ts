import { describe, expect, it } from 'vitest';
import { CampaignSpec, type PilotTiming } from './campaign-spec.schema';
import { estimateCampaign } from './cost-model';
import { exampleSpec } from './example-spec.fixture';
import { fitPilotTimings, parsePilotCsv } from './pilot-fit';

/** Pilots that follow core-seconds = prefactor × L^exponent exactly, run on `cores` cores. */
const powerLaw = (prefactor: number, exponent: number, sizes: number[], cores = 16): PilotTiming[] =>
  sizes.map((size) => ({ size, seconds: (prefactor * size ** exponent) / cores, cores }));

describe('pilot fit', () => {
  describe('fitPilotTimings', () => {
    it('should recover the prefactor and exponent exactly when the pilots follow a power law', () => {
      // core-seconds = 0.003 × L^6.8 at L = 4, 6, 8, 12 on 16 cores: ln(core-seconds) is exactly linear
      // in ln L, so the least-squares line is that line.
      const fit = fitPilotTimings(powerLaw(0.003, 6.8, [4, 6, 8, 12]));
      expect(Math.abs(fit.prefactor - 0.003)).toBeLessThan(1e-9);
      expect(Math.abs(fit.exponent - 6.8)).toBeLessThan(1e-9);
      expect(Math.abs(fit.rSquared - 1)).toBeLessThan(1e-9);
      expect(fit.points).toBe(4);
      expect(fit.sizeRange).toEqual({ min: 4, max: 12 });
      for (const r of fit.residuals) {
        expect(Math.abs(r.logResidual)).toBeLessThan(1e-9);
        expect(r.fitted / r.coreSeconds).toBeCloseTo(1, 9);
      }
    });

    it('should fit core-seconds (seconds × cores) when the pilots ran on different core counts', () => {
      // 0.003 × 8^6.8 core-seconds on 64 cores and 0.003 × 4^6.8 on 1 core lie on the same law.
      const timings = [...powerLaw(0.003, 6.8, [4], 1), ...powerLaw(0.003, 6.8, [8], 64)];
      const fit = fitPilotTimings(timings);
      expect(fit.exponent).toBeCloseTo(6.8, 9);
      expect(fit.residuals[1].coreSeconds).toBeCloseTo(0.003 * 8 ** 6.8, 6);
    });

    it('should give R² below 1 and the least-squares line when the pilots scatter', () => {
      // Worked by hand in base 2 (slope and R² do not depend on the base of the logarithm):
      // L = 2, 4, 8 → x = log2 L = 1, 2, 3; core-seconds 4, 32, 64 → y = 2, 5, 6.
      // mean x = 2, mean y = 13/3; Sxx = 2; Sxy = (-1)(-7/3) + (1)(5/3) = 4 → exponent 4/2 = 2;
      // intercept 13/3 - 2 × 2 = 1/3 → prefactor 2^(1/3) = 1.259921.
      // Fitted y = 7/3, 13/3, 19/3; residuals -1/3, 2/3, -1/3 → SSE = 6/9 = 2/3;
      // Syy = 49/9 + 4/9 + 25/9 = 26/3 → R² = 1 - (2/3)/(26/3) = 12/13 = 0.923077.
      const fit = fitPilotTimings([
        { size: 2, seconds: 2, cores: 2 },
        { size: 4, seconds: 16, cores: 2 },
        { size: 8, seconds: 32, cores: 2 },
      ]);
      expect(fit.exponent).toBeCloseTo(2, 12);
      expect(fit.prefactor).toBeCloseTo(2 ** (1 / 3), 12);
      expect(fit.rSquared).toBeCloseTo(12 / 13, 12);
      expect(fit.rSquared).toBeLessThan(1);
      // Natural-log residuals are the base-2 ones × ln 2.
      expect(fit.residuals.map((r) => r.logResidual / Math.LN2)).toEqual([expect.closeTo(-1 / 3, 12), expect.closeTo(2 / 3, 12), expect.closeTo(-1 / 3, 12)]);
    });

    it('should refuse to fit when every pilot has the same size', () => {
      expect(() => fitPilotTimings([{ size: 8, seconds: 1, cores: 1 }, { size: 8, seconds: 2, cores: 1 }])).toThrow(/two different sizes/);
    });
  });

  describe('parsePilotCsv', () => {
    it('should read the columns in any order when extra columns are present', () => {
      const csv = 'node,cores,seconds,size,notes\nn01,16,12.5,6,first\nn02,32,40,8,\n';
      expect(parsePilotCsv(csv)).toEqual({
        timings: [
          { size: 6, seconds: 12.5, cores: 16 },
          { size: 8, seconds: 40, cores: 32 },
        ],
        problems: [],
      });
    });

    it('should skip a byte-order mark, CRLF line ends, comments and blank lines when they are present', () => {
      const csv = '\uFEFF# pilots on cluster-a\r\nSize, Seconds, Cores\r\n\r\n6,10,4\r\n# warm cache\r\n8,30,4\r\n';
      const { timings, problems } = parsePilotCsv(csv);
      expect(problems).toEqual([]);
      expect(timings).toEqual([
        { size: 6, seconds: 10, cores: 4 },
        { size: 8, seconds: 30, cores: 4 },
      ]);
    });

    it('should name the missing columns when the header lacks some', () => {
      const { timings, problems } = parsePilotCsv('size,walltime\n6,10\n8,30\n');
      expect(timings).toEqual([]);
      expect(problems).toHaveLength(1);
      expect(problems[0].path).toEqual(['pilotTimings']);
      expect(problems[0].message).toContain('missing: seconds, cores');
      expect(problems[0].message).toContain('header read: size, walltime');
    });

    it('should point at the row and the line when seconds are 0 or negative', () => {
      // Line 1 header, line 2 first pilot (row 0), line 3 a comment, line 4 row 1, line 5 row 2.
      const { problems } = parsePilotCsv('size,seconds,cores\n6,10,4\n# retried\n8,0,4\n12,-3,4\n');
      expect(problems).toEqual([
        { path: ['pilotTimings', 1, 'seconds'], message: 'line 4: seconds must be greater than 0' },
        { path: ['pilotTimings', 2, 'seconds'], message: 'line 5: seconds must be greater than 0' },
      ]);
    });

    it('should say what it read when a time is not a number', () => {
      const { problems } = parsePilotCsv('size,seconds,cores\n6,10,4\n8,fast,4\n12,,4\n');
      expect(problems).toEqual([
        { path: ['pilotTimings', 1, 'seconds'], message: 'line 3: seconds must be a number (read "fast")' },
        { path: ['pilotTimings', 2, 'seconds'], message: 'line 4: seconds must be a number (read "")' },
      ]);
    });

    it('should refuse sizes and cores that are not whole positive numbers when a row has them', () => {
      const { problems } = parsePilotCsv('size,seconds,cores\n6.5,10,4\n8,10,0\n');
      expect(problems).toEqual([
        { path: ['pilotTimings', 0, 'size'], message: 'line 2: size must be a whole number' },
        { path: ['pilotTimings', 1, 'cores'], message: 'line 3: cores must be at least 1' },
      ]);
    });

    it('should refuse the set when every pilot has the same size', () => {
      const { timings, problems } = parsePilotCsv('size,seconds,cores\n8,10,4\n8,11,4\n');
      expect(timings).toHaveLength(2);
      expect(problems).toEqual([{ path: ['pilotTimings'], message: 'pilot timings need at least two different sizes to fit a power law' }]);
    });

    it('should say the file is empty when it has no header', () => {
      for (const csv of ['', '\n  \n', '# only a comment\n']) {
        const { timings, problems } = parsePilotCsv(csv);
        expect(timings).toEqual([]);
        expect(problems).toHaveLength(1);
        expect(problems[0].path).toEqual(['pilotTimings']);
        expect(problems[0].message).toMatch(/the pilot CSV is empty/);
      }
    });

    it('should say there are no timings when the file has only a header', () => {
      expect(parsePilotCsv('size,seconds,cores\n').problems).toEqual([{ path: ['pilotTimings'], message: 'the pilot CSV has no timings below its header' }]);
    });
  });

  describe('estimate from pilots', () => {
    // Pilots following core-seconds = 0.002 × L^7 at L = 4, 6, 8 (32 cores each). The estimate then takes
    // core-seconds per job from the fit, not from operations / DEFAULT_FLOPS_PER_CORE:
    // L = 6: 0.002 × 279 936 = 559.872;        L = 8: 0.002 × 2 097 152 = 4 194.304;
    // L = 12: 0.002 × 35 831 808 = 71 663.616; L = 16: 0.002 × 268 435 456 = 536 870.912.
    // Sum 613 288.704 core-s × 13 jobs / 3600 = 2 214.6536533 core-hours.
    const spec = exampleSpec({ pilotTimings: powerLaw(0.002, 7, [4, 6, 8], 32) });
    const estimate = estimateCampaign(spec);

    it('should use the fitted power law when pilot timings are given', () => {
      expect(estimate.rate.source).toBe('pilot');
      if (estimate.rate.source !== 'pilot') return;
      expect(estimate.rate.fit.exponent).toBeCloseTo(7, 9);
      expect(estimate.rate.fit.prefactor).toBeCloseTo(0.002, 9);
      const expected = [559.872, 4_194.304, 71_663.616, 536_870.912];
      estimate.rows.forEach((r, i) => expect(r.coreSecondsPerJob / expected[i]).toBeCloseTo(1, 9));
      expect(estimate.totalCoreHours / 2_214.6536533).toBeCloseTo(1, 9);
    });

    it('should keep counting operations and memory from the model when the speed comes from pilots', () => {
      // Same as without pilots: L = 16 needs 1.835008e13 operations and 2 099 200 bytes.
      expect(estimate.rows[3].operations / 1.835008e13).toBeCloseTo(1, 12);
      expect(estimate.rows[3].peakMemoryBytes).toBe(2_099_200);
    });

    it('should describe the fit in the assumptions when pilot timings are given', () => {
      expect(estimate.assumptions[0]).toMatch(/^Speed from 3 pilot timings: core-seconds per pilot job = 0\.00200 × L\^7\.00 \(R² = 1\.000\)/);
    });
  });
});

describe('pilot settings', () => {
  const pilots = powerLaw(0.003, 6.8, [4, 6, 8, 12]);
  const withPilots = (over: Record<string, unknown>) => exampleSpec({ pilotTimings: pilots, ...over });

  it('should quadruple a pilot-calibrated estimate when the plan halves the precision the pilots ran with', () => {
    // Slices M = Lambda L / eps^2 (Kramer & MacKinnon 1993): half the eps, four times the bar.
    const atPilot = estimateCampaign(withPilots({ targetPrecision: 0.002, pilotSettings: { method: 'transfer-matrix', symmetryClass: 'AI', targetPrecision: 0.002 } }));
    const finer = estimateCampaign(withPilots({ targetPrecision: 0.001, pilotSettings: { method: 'transfer-matrix', symmetryClass: 'AI', targetPrecision: 0.002 } }));
    expect(finer.totalCoreHours / atPilot.totalCoreHours).toBeCloseTo(4, 4);
    expect(finer.assumptions.join(' ')).toMatch(/eps = 0\.002.*scaled by the ratio of operations, 4\.00×/);
  });

  it('should refuse pilots timed with another method or another arithmetic', () => {
    const input = { ...exampleSpec(), pilotTimings: pilots };
    const method = CampaignSpec.safeParse({ ...input, pilotSettings: { method: 'kernel-polynomial', symmetryClass: 'AI' } });
    expect(method.error?.issues.map((i) => i.path)).toEqual([['pilotSettings', 'method']]);
    const arithmetic = CampaignSpec.safeParse({ ...input, pilotSettings: { method: 'transfer-matrix', symmetryClass: 'A' } });
    expect(arithmetic.error?.issues.map((i) => i.path)).toEqual([['pilotSettings', 'symmetryClass']]);
  });
});
