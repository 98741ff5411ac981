import { describe, expect, it } from 'vitest';
import { estimateCampaign } from './cost-model';
import { estimateReport, EstimateReportSchema } from './estimate-report';
import { exampleSpec } from './example-spec.fixture';

describe('estimateReport', () => {
  describe('contents', () => {
    it('should be the estimate with no notices when the plan is the sound 3D example', () => {
      const spec = exampleSpec();
      expect(estimateReport(spec)).toEqual({ ...estimateCampaign(spec), notices: [] });
    });

    it('should carry the notices of the plan when scaling theory has something to say', () => {
      const report = estimateReport(exampleSpec({ dimension: 1, sizes: [100, 200, 400] }));
      expect(report.notices.map((n) => n.code)).toEqual(['no-transition-1d']);
      // 1D TMM: N_ch = 1, 0.6 × 100 / 4e-6 = 15 000 000 slices of 2 × 1 × 1 + (10/3) / 8 = 2.4166667 operations.
      expect(report.rows[0].slices).toBe(15_000_000);
      expect(report.rows[0].operations / (15e6 * (2 + 10 / 24))).toBeCloseTo(1, 12);
    });
  });

  describe('EstimateReportSchema', () => {
    it('should describe the report when the api answers with it', () => {
      const report = estimateReport(exampleSpec({ sizes: [8, 16], pilotTimings: [{ size: 4, seconds: 1, cores: 8 }, { size: 6, seconds: 9, cores: 8 }] }));
      expect(report.notices.length).toBeGreaterThan(0);
      const parsed = EstimateReportSchema.parse(report);
      // Loose: fields the schema does not document (rate, arithmetic, slices…) pass through.
      expect(parsed).toEqual(report);
    });

    it('should refuse a report whose rows lack their sizes', () => {
      const report = estimateReport(exampleSpec());
      const broken = { ...report, rows: report.rows.map(({ size: _size, ...rest }) => rest) };
      expect(EstimateReportSchema.safeParse(broken).error?.issues[0].path).toEqual(['rows', 0, 'size']);
    });
  });
});
