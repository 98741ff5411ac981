import { describe, expect, it } from 'vitest';
import { ANDERSON_3D_ORTHOGONAL } from './reference-values';
import { analyzeTable, analyzeTableAsync, DEFAULT_ACCEPT_P, DEFAULT_SCAN_ORDERS } from './scaling-analysis';
import { ScalingFitCancelled, ScalingFitError } from './scaling-fit-error';
import { syntheticScalingTable } from './synthetic-scaling-table';

/** Same truth as the fit's tests (Slevin & Ohtsuki, PRL 82, 382 (1999), via REFERENCES.md). */
const TRUTH = { criticalX: 16.5, nu: ANDERSON_3D_ORTHOGONAL.exponentNu, criticalValue: ANDERSON_3D_ORTHOGONAL.criticalLambda };
const WS = Array.from({ length: 13 }, (_, i) => 15 + 0.25 * i);
const TABLE = syntheticScalingTable({ ...TRUTH, sizes: [6, 8, 10, 12, 14, 16], xs: WS, relativeError: 0.02, seed: 2 });

describe('scaling analysis', () => {
  describe('result shape', () => {
    const analysis = analyzeTable(TABLE, { bootstrap: 50 });

    it('should carry the fields `localis analyze --json` prints when run on a table', () => {
      for (const key of ['model', 'Wc', 'nu', 'critical', 'chi2', 'dof', 'p', 'crossings', 'beta']) expect(analysis).toHaveProperty(key);
      for (const key of ['value', 'lo', 'hi']) {
        expect(analysis.Wc).toHaveProperty(key);
        expect(analysis.nu).toHaveProperty(key);
        expect(analysis.critical).toHaveProperty(key);
      }
      expect(analysis.model).toMatchObject({ observable: 'lambda', variable: 'W', sizes: [6, 8, 10, 12, 14, 16], range: { min: 15, max: 18 }, points: 78 });
      expect(analysis.intervals).toEqual({ method: 'bootstrap', level: 0.95, samples: 50, failed: 0, seed: 1 });
    });

    it('should survive a JSON round trip unchanged, so the worker can store it as it is', () => {
      expect(JSON.parse(JSON.stringify(analysis))).toEqual(analysis);
    });

    it('should hold the truth within the intervals when the data come from a known scaling function', () => {
      expect(analysis.Wc.lo).toBeLessThan(TRUTH.criticalX);
      expect(analysis.Wc.hi).toBeGreaterThan(TRUTH.criticalX);
      expect(analysis.nu.lo).toBeLessThan(TRUTH.nu);
      expect(analysis.nu.hi).toBeGreaterThan(TRUTH.nu);
      expect(analysis.critical.lo).toBeLessThan(TRUTH.criticalValue);
      expect(analysis.critical.hi).toBeGreaterThan(TRUTH.criticalValue);
    });

    it('should include crossings of each successive pair and beta for each pair and W', () => {
      // With 2 % noise, neighbouring sizes cross several times; each pair crosses at least once.
      expect(new Set(analysis.crossings.map((c) => c.sizes.join(','))).size).toBe(5);
      expect(analysis.crossingDrift.path).toHaveLength(5);
      expect(analysis.beta).toHaveLength(5 * 13);
    });
  });

  describe('model choice', () => {
    const analysis = analyzeTable(TABLE, { bootstrap: 0 });

    it('should list every scanned model, fewest parameters first, with one selected', () => {
      expect(analysis.scan).toHaveLength(DEFAULT_SCAN_ORDERS.length);
      for (let i = 1; i < analysis.scan.length; i++) expect(analysis.scan[i].parameters).toBeGreaterThanOrEqual(analysis.scan[i - 1].parameters);
      expect(analysis.scan.filter((r) => r.selected)).toHaveLength(1);
      for (const row of analysis.scan) {
        if (row.error) expect(row.p).toBeNull();
        else expect(row.dof).toBe(78 - row.parameters);
      }
    });

    it('should choose the simplest model whose p reaches 0.1 when no orders are given', () => {
      const acceptable = analysis.scan.filter((r) => r.p !== null && r.p >= DEFAULT_ACCEPT_P);
      const fewest = Math.min(...acceptable.map((r) => r.parameters));
      const selected = analysis.scan.find((r) => r.selected);
      expect(selected?.parameters).toBe(fewest);
      expect(analysis.model.chosenBy).toBe('scan');
      expect(analysis.model).toMatchObject(selected?.orders ?? {});
      expect(analysis.p).toBe(selected?.p);
    });

    it('should give linearized intervals, 1.96 standard errors either side, when the bootstrap is 0', () => {
      expect(analysis.intervals.method).toBe('linearized');
      const sigma = analysis.parameters[0].standardError;
      expect(analysis.Wc.hi - analysis.Wc.value).toBeCloseTo(1.959964 * sigma, 6);
      expect(analysis.Wc.value - analysis.Wc.lo).toBeCloseTo(1.959964 * sigma, 6);
      // Lambda_c = exp(a00): the interval is exp of the a00 interval, so lopsided.
      expect(Math.log(analysis.critical.hi) - Math.log(analysis.critical.value)).toBeCloseTo(1.959964 * (analysis.parameters.find((q) => q.name === 'a00')?.standardError as number), 6);
    });

    it('should use the given orders, report y, and warn when p is poor', () => {
      const corrected = syntheticScalingTable({ ...TRUTH, sizes: [4, 6, 8, 10, 12, 16], xs: WS, relativeError: 0.005, seed: 3, irrelevant: { y: 2.5, amplitude: -2 } });
      const poor = analyzeTable(corrected, { orders: { nr: 2, ni: 0, mr: 1, mi: 0 }, scan: false, bootstrap: 0 });
      expect(poor.model.chosenBy).toBe('user');
      expect(poor.scan).toEqual([]);
      expect(poor.warnings.join(' ')).toMatch(/has p = .*below 0.1: it does not describe the data within their errors/);
      const good = analyzeTable(corrected, { orders: { nr: 2, ni: 1, mr: 1, mi: 0 }, scan: false, bootstrap: 20, acceptP: 0.05 });
      expect(good.y).toBeDefined();
      expect(good.y?.lo).toBeLessThan(good.y?.hi as number);
      expect(good.warnings).toEqual([]);
    });

    it('should find one crossing per pair near W_c, and beta changing sign there, when the errors are small', () => {
      const precise = syntheticScalingTable({ ...TRUTH, sizes: [6, 8, 10, 12, 14, 16], xs: WS, relativeError: 0.002, seed: 2 });
      const { crossings, beta } = analyzeTable(precise, { orders: { nr: 2, ni: 0, mr: 1, mi: 0 }, scan: false, bootstrap: 0 });
      expect(crossings).toHaveLength(5);
      for (const c of crossings) expect(Math.abs(c.x - TRUTH.criticalX)).toBeLessThan(3 * c.xError);
      // Below W_c (metal) Lambda grows with L: beta > 0; above it beta < 0.
      expect(beta.filter((b) => b.x < 16).every((b) => b.beta > 0)).toBe(true);
      expect(beta.filter((b) => b.x > 17).every((b) => b.beta < 0)).toBe(true);
    });

    it('should warn when no two sizes cross in the W range', () => {
      const metallic = syntheticScalingTable({ ...TRUTH, sizes: [6, 8, 10], xs: [13, 13.5, 14, 14.5, 15], relativeError: 0.01, seed: 4 });
      const analysis = analyzeTable(metallic, { orders: { nr: 2, ni: 0, mr: 1, mi: 0 }, scan: false, bootstrap: 0 });
      expect(analysis.crossings).toEqual([]);
      expect(analysis.warnings.join(' ')).toMatch(/No two successive sizes cross/);
    });
  });

  describe('progress and cancel', () => {
    it('should count scan fits and bootstrap refits in its progress', () => {
      const calls: [number, number][] = [];
      analyzeTable(TABLE, { bootstrap: 10, onProgress: (done, total) => calls.push([done, total]) });
      const total = DEFAULT_SCAN_ORDERS.length + 10;
      expect(calls).toHaveLength(total);
      expect(calls[calls.length - 1]).toEqual([total, total]);
    });

    it('should stop with ScalingFitCancelled when cancelled, synchronously or not', async () => {
      let done = 0;
      const options = { bootstrap: 50, onProgress: (d: number) => (done = d), isCancelled: () => done >= 3 };
      expect(() => analyzeTable(TABLE, options)).toThrow(ScalingFitCancelled);
      done = 0;
      await expect(analyzeTableAsync(TABLE, options)).rejects.toThrow(ScalingFitCancelled);
    });

    it('should give the same result asynchronously and hand control back while it works', async () => {
      let pauses = 0;
      const options = { orders: { nr: 2, ni: 0, mr: 1, mi: 0 }, scan: false as const, bootstrap: 20 };
      const sync = analyzeTable(TABLE, options);
      const async = await analyzeTableAsync(TABLE, {
        ...options,
        pauseEveryMs: 0,
        pause: async () => {
          pauses++;
        },
      });
      expect(async).toEqual(sync);
      expect(pauses).toBe(21);
    });
  });

  describe('refusals', () => {
    it('should refuse a bootstrap of one sample and a run with neither orders nor scan', () => {
      expect(() => analyzeTable(TABLE, { bootstrap: 1 })).toThrow(/0 \(linearized intervals\) or at least 2 samples/);
      expect(() => analyzeTable(TABLE, { scan: false })).toThrow(ScalingFitError);
    });

    it('should refuse bad tables with the table’s own message', () => {
      expect(() => analyzeTable(TABLE.filter((p) => p.x === 16))).toThrow(/more than one value of W/);
    });
  });
});
