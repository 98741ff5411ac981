import { describe, expect, it } from 'vitest';
import { scalingResultFixture } from './analysis-fixture';
import { betaTable, cellText, collapseCurveTable, collapseTable, crossingsTable, driftTable, parametersTable, pointsTable, scanTable, type AnalysisTable } from './analysis-tables';

const result = scalingResultFixture();

const column = (table: AnalysisTable, key: string) => table.columns.find((c) => c.key === key)!;
const shown = (table: AnalysisTable, key: string, row = 0) => cellText(column(table, key), table.rows[row]);

describe('analysis-tables', () => {
  describe('the parameters', () => {
    it('should give W_c, nu and Lambda_c with their intervals, then chi², dof and p', () => {
      const table = parametersTable(result);
      expect(table.rows.map((r) => r.quantity)).toEqual(['Wc', 'nu', 'Lambdac', 'chi2', 'dof', 'p']);
      expect(table.rows[0]).toMatchObject({ value: result.Wc.value, lo: result.Wc.lo, hi: result.Wc.hi });
      expect(table.rows[5]).toMatchObject({ value: result.p, lo: null, hi: null });
      expect(table.caption).toContain('bootstrap, 20 refits');
    });

    it('should write each estimate at the precision of its own interval', () => {
      const table = parametersTable(result);
      expect(shown(table, 'value', 0)).toMatch(/^16\.5\d\d$/);
      expect(shown(table, 'lo', 1)).toMatch(/^1\.\d{3}$/);
      expect(shown(table, 'lo', 3)).toBe('—');
    });

    it('should add y when the model has an irrelevant exponent', () => {
      const withY = { ...result, y: { value: 2.9, lo: 2.1, hi: 3.8 } };
      expect(parametersTable(withY).rows.map((r) => r.quantity)).toContain('y');
    });
  });

  describe('the model scan', () => {
    it('should list every model with its orders and fit, the reported one marked', () => {
      const table = scanTable(result);
      expect(table.rows).toHaveLength(result.scan.length);
      expect(table.columns.map((c) => c.key)).toEqual(['nr', 'ni', 'mr', 'mi', 'parameters', 'Wc', 'nu', 'critical', 'y', 'chi2', 'dof', 'p', 'chosen', 'note']);
      const chosen = table.rows.filter((r) => r.chosen === true);
      expect(chosen).toHaveLength(1);
      expect(chosen[0]).toMatchObject({ nr: result.model.nr, ni: result.model.ni, mr: result.model.mr, mi: result.model.mi });
      expect(cellText(column(table, 'chosen'), chosen[0])).toBe('reported');
      expect(cellText(column(table, 'y'), table.rows[0])).toBe('—');
    });

    it('should write every model’s estimates to the decimals of the reported intervals, so they compare digit by digit', () => {
      const table = scanTable(result);
      const decimals = (key: string) => new Set(table.rows.map((r) => cellText(column(table, key), r).split('.')[1]?.length ?? 0));
      expect(decimals('Wc')).toEqual(new Set([3]));
      expect(decimals('nu')).toEqual(new Set([3]));
    });

    it('should keep a model that could not be fitted, with its reason', () => {
      const failed = { ...result.scan[0], Wc: null, nu: null, critical: null, y: null, chi2: null, p: null, selected: false, error: { reason: 'not-converged' as const, message: 'The fit did not converge.' } };
      const table = scanTable({ ...result, scan: [failed] });
      expect(table.rows[0]).toMatchObject({ Wc: null, p: null, note: 'The fit did not converge.' });
      expect(cellText(column(table, 'p'), table.rows[0])).toBe('—');
    });
  });

  describe('the crossings and their drift', () => {
    it('should give each crossing with the pair of sizes and both errors', () => {
      const table = crossingsTable(result);
      expect(table.columns.map((c) => c.key)).toEqual(['L1', 'L2', 'W', 'WError', 'Lambda', 'LambdaError']);
      expect(table.rows).toHaveLength(result.crossings.length);
      expect(table.rows[0]).toMatchObject({ L1: result.crossings[0].sizes[0], L2: result.crossings[0].sizes[1], W: result.crossings[0].x });
    });

    it('should give the shifts from one pair to the next, signed', () => {
      const table = driftTable(result);
      expect(table.rows).toHaveLength(result.crossingDrift.shifts.length);
      const shift = result.crossingDrift.shifts[0].shift;
      expect(shown(table, 'shift')).toMatch(shift > 0 ? /^\+/ : /^−/);
    });
  });

  describe('the charts’ numbers', () => {
    it('should list every point by size, then W, with its error', () => {
      const table = pointsTable(result);
      expect(table.rows).toHaveLength(result.model.points);
      expect(table.rows.map((r) => r.L)).toEqual([...table.rows.map((r) => r.L as number)].sort((a, b) => a - b));
      expect(table.rows[0]).toMatchObject({ L: 6, W: 15 });
      expect(table.caption).not.toContain('corrected');
      // The measured points are shown as measured, whatever the model; a result stored without them
      // falls back on the collapse, corrected when the model has an irrelevant term.
      expect(pointsTable({ ...result, model: { ...result.model, ni: 1 } }).caption).not.toContain('corrected');
      const stored = { ...result, measured: undefined } as unknown as typeof result;
      expect(pointsTable({ ...stored, model: { ...stored.model, ni: 1 } }).caption).toContain('irrelevant correction taken out');
    });

    it('should put each point of the collapse on psi, and sample the fitted curve', () => {
      expect(collapseTable(result).rows[0]).toHaveProperty('psi');
      expect(collapseCurveTable(result).rows).toHaveLength(result.collapse.curve.length);
    });

    it('should give beta and ln Lambda with their errors for each pair of sizes', () => {
      const table = betaTable(result);
      expect(table.columns.map((c) => c.key)).toEqual(['L1', 'L2', 'W', 'lnLambda', 'lnLambdaError', 'beta', 'betaError']);
      expect(table.rows).toHaveLength(result.beta.length);
    });
  });
});
