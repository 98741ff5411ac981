import { describe, expect, it } from 'vitest';
import { AppError } from '../errors/app-error';
import { ScalingFitError, type ScalingFitReason } from './scaling-fit-error';
import { validateScalingTable, type ScalingPoint } from './scaling-table';

/** Three sizes × two W, all valid. */
function goodTable(): ScalingPoint[] {
  const rows: ScalingPoint[] = [];
  for (const L of [6, 8, 10]) for (const x of [16, 17]) rows.push({ L, x, value: 0.6, error: 0.01 });
  return rows;
}

function refusal(points: unknown, labels = {}): ScalingFitError {
  try {
    validateScalingTable(points as ScalingPoint[], labels);
  } catch (error) {
    expect(error).toBeInstanceOf(ScalingFitError);
    return error as ScalingFitError;
  }
  throw new Error('the table was accepted');
}

describe('scaling table', () => {
  describe('accepted tables', () => {
    it('should sort by L then W and precompute ln value and error/value when the table is valid', () => {
      const t = validateScalingTable([...goodTable()].reverse());
      expect(t.sizes).toEqual([6, 8, 10]);
      expect(t.xs).toEqual([16, 17]);
      expect([...t.L]).toEqual([6, 6, 8, 8, 10, 10]);
      expect(t.lnValue[0]).toBeCloseTo(Math.log(0.6), 15);
      expect(t.lnSigma[0]).toBeCloseTo(0.01 / 0.6, 15);
    });
  });

  describe('refused tables', () => {
    const bad: [what: string, mutate: (rows: ScalingPoint[]) => unknown, reason: ScalingFitReason, message: RegExp][] = [
      ['the table is empty', () => [], 'empty-table', /no points/],
      ['the table is not a list', () => null, 'empty-table', /no points/],
      ['a value is NaN', (r) => ((r[2].value = Number.NaN), r), 'bad-point', /point 3 \(L = 8, W = 16\): Lambda must be a positive number .* got NaN/],
      ['a W is NaN', (r) => ((r[1].x = Number.NaN), r), 'bad-point', /point 2 .*W must be a finite number, got NaN/],
      ['an error is missing', (r) => (delete (r[0] as Partial<ScalingPoint>).error, r), 'bad-point', /point 1 .*error of Lambda must be a positive number .* got undefined/],
      ['an error is zero', (r) => ((r[4].error = 0), r), 'bad-point', /point 5 .*error .* got 0/],
      ['an error is negative', (r) => ((r[4].error = -0.01), r), 'bad-point', /got -0.01/],
      ['an error is infinite', (r) => ((r[4].error = Number.POSITIVE_INFINITY), r), 'bad-point', /got Infinity/],
      ['a value is not positive', (r) => ((r[3].value = 0), r), 'bad-point', /logarithm is fitted/],
      ['a size is not positive', (r) => ((r[3].L = -8), r), 'bad-point', /size L must be a positive number, got -8/],
      ['a row repeats an (L, W)', (r) => [...r, { ...r[0] }], 'duplicate-point', /point 7 \(L = 6, W = 16\) repeats point 1/],
      ['only two sizes are given', (r) => r.filter((p) => p.L !== 10), 'too-few-sizes', /at least three sizes L; the table has 2 \(6, 8\)/],
      ['only one W is given', (r) => r.filter((p) => p.x === 16), 'one-x', /more than one value of W; every point has W = 16/],
    ];
    for (const [what, mutate, reason, message] of bad) {
      it(`should refuse with ${reason} and say what to fix when ${what}`, () => {
        const error = refusal(mutate(goodTable()));
        expect(error.reason).toBe(reason);
        expect(error.message).toMatch(message);
      });
    }

    it('should list every bad point in the details and count the rest in the message when several are bad', () => {
      const rows = goodTable();
      rows[0].error = 0;
      rows[5].value = Number.NaN;
      const error = refusal(rows);
      expect(error.details?.map((d) => d.path)).toEqual([
        ['points', 0, 'error'],
        ['points', 5, 'value'],
      ]);
      expect(error.message).toMatch(/and 1 more problems/);
    });

    it('should be an invalid (422) AppError so the api answers it like other bad input', () => {
      const error = refusal([]);
      expect(error).toBeInstanceOf(AppError);
      expect(error.status).toBe(422);
      expect(error.toBody().error.code).toBe('invalid');
    });

    it('should speak of g and E when the table is labelled so', () => {
      const rows = goodTable();
      rows[0].value = -1;
      expect(refusal(rows, { observable: 'g', variable: 'E' }).message).toMatch(/point 1 \(L = 6, E = 16\): g must be a positive number/);
    });
  });
});
