import { AnalysisRequest } from '@localis/shared';
import { describe, expect, it } from 'vitest';
import { analysisFixture } from './analysis-fixture';
import { analysisFormValues, analysisRequestInput, availableEnergies, availableSizes, requestWords } from './analysis-request';

const SIZES = [6, 8, 10, 12, 16];
const spec = (sizes: number[], energies: number[] = [0]) => ({ spec: { sizes, energies } }) as never;

describe('analysis-request', () => {
  describe('where the form starts', () => {
    it('should start from the analysis shown: the scan when it chose, its orders ready to adjust, all its sizes', () => {
      const values = analysisFormValues(analysisFixture(), SIZES);
      expect(values).toEqual({ observable: 'auto', energy: 'auto', ordersMode: 'scan', nr: 2, ni: 0, mr: 1, mi: 0, sizes: SIZES, bootstrap: '20' });
    });

    it('should repeat what was asked for when the orders and sizes were given', () => {
      const analysis = analysisFixture({ request: { observable: 'g', energy: 0.5, orders: { nr: 3, ni: 1, mr: 2, mi: 1 }, sizes: [8, 12, 16], bootstrap: 500 } });
      expect(analysisFormValues(analysis, SIZES)).toEqual({ observable: 'g', energy: '0.5', ordersMode: 'given', nr: 3, ni: 1, mr: 2, mi: 1, sizes: [8, 12, 16], bootstrap: '500' });
    });

    it('should offer the campaign’s sizes and those analysed, and its energies', () => {
      expect(availableSizes(spec([8, 12, 16, 24]), analysisFixture())).toEqual([6, 8, 10, 12, 16, 24]);
      expect(availableSizes(null, null)).toEqual([]);
      expect(availableEnergies(spec([8], [0.5, 0, 0.5]))).toEqual([0, 0.5]);
    });
  });

  describe('what is sent', () => {
    const base = analysisFormValues(null, SIZES);

    it('should send only the bootstrap when nothing else was changed, the api filling the rest', () => {
      const parsed = AnalysisRequest.parse(analysisRequestInput(base, SIZES));
      expect(parsed).toEqual({ bootstrap: 200 });
    });

    it('should send the orders when given, dropping mi without an irrelevant term', () => {
      const input = analysisRequestInput({ ...base, ordersMode: 'given', nr: 3, ni: 0, mr: 2, mi: 2 }, SIZES);
      expect(AnalysisRequest.parse(input).orders).toEqual({ nr: 3, ni: 0, mr: 2, mi: 0 });
    });

    it('should send the sizes kept, ascending, when some are left out', () => {
      const input = analysisRequestInput({ ...base, sizes: [16, 8, 10] }, SIZES);
      expect(AnalysisRequest.parse(input).sizes).toEqual([8, 10, 16]);
    });

    it('should let the schema refuse fewer than three sizes, a bootstrap that is not a whole number, and too many refits', () => {
      const issues = (values: typeof base) => AnalysisRequest.safeParse(analysisRequestInput(values, SIZES)).error?.issues.map((i) => i.message);
      expect(issues({ ...base, sizes: [12, 16] })).toEqual(['a scaling fit needs at least three sizes']);
      expect(issues({ ...base, bootstrap: '1.5' })).toEqual(['bootstrap is a whole number of refits']);
      expect(issues({ ...base, bootstrap: '5000' })).toEqual(['at most 2000 bootstrap refits']);
    });

    it('should read a typed minus and an observable and energy chosen', () => {
      const parsed = AnalysisRequest.parse(analysisRequestInput({ ...base, observable: 'lambda', energy: '−0.25', bootstrap: ' 0 ' }, SIZES));
      expect(parsed).toEqual({ observable: 'lambda', energy: -0.25, bootstrap: 0 });
    });
  });

  describe('in words', () => {
    it('should say what an analysis was asked to do', () => {
      expect(requestWords({ bootstrap: 200 })).toBe('orders chosen by the scan · all sizes · 200 bootstrap refits');
      expect(requestWords({ observable: 'g', orders: { nr: 3, ni: 1, mr: 2, mi: 0 }, sizes: [8, 12, 16], bootstrap: 0, energy: 0.5 })).toBe(
        'g · orders nr = 3, ni = 1, mr = 2, mi = 0 · sizes L = 8, 12, 16 · linearized intervals · E = 0.5',
      );
    });
  });
});
