import type { CampaignSpec } from '@localis/shared';
import { describe, expect, it } from 'vitest';
import { formatDisorder, formatList, formatNumber, formatPrecision, specLines } from './spec-notation';

const spec: CampaignSpec = {
  model: 'anderson-box',
  dimension: 3,
  symmetryClass: 'AI',
  goal: 'critical-point',
  sizes: [16, 8, 12],
  disorder: { from: 15, to: 18, step: 0.1 },
  energies: [0],
  realizations: 2000,
  method: 'transfer-matrix',
  targetPrecision: 0.005,
  methodOptions: { expectedLambda: 0.6, moments: 512 },
  node: { coresPerNode: 48, memoryGiBPerNode: 192 },
};

describe('spec-notation', () => {
  describe('formatNumber', () => {
    it('should hide float noise and print a true minus sign when the number is awkward', () => {
      expect(formatNumber(0.1 + 0.2)).toBe('0.3');
      expect(formatNumber(-0.5)).toBe('−0.5');
      expect(formatNumber(16.5)).toBe('16.5');
      expect(formatNumber(100000)).toBe('100,000');
    });
  });

  describe('formatList', () => {
    it('should list every value when the list is short', () => {
      expect(formatList([8, 12, 16])).toBe('8, 12, 16');
    });

    it('should keep the start and the end around an ellipsis when the list is long', () => {
      expect(formatList([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12], 6)).toBe('1, 2, 3, 4, …, 11, 12');
    });
  });

  describe('formatDisorder', () => {
    it('should write a range with its step and count when the grid is a range', () => {
      expect(formatDisorder({ from: 15, to: 18, step: 0.1 })).toEqual({ value: '15 … 18 in steps of 0.1', note: '31 values' });
    });

    it('should list the values when the grid is explicit', () => {
      expect(formatDisorder({ values: [2, 4.5] })).toEqual({ value: '2, 4.5', note: '2 values' });
    });
  });

  describe('formatPrecision', () => {
    it('should write a relative precision as a percentage', () => {
      expect(formatPrecision(0.01)).toBe('1 %');
      expect(formatPrecision(0.0005)).toBe('0.05 %');
    });
  });

  describe('specLines', () => {
    it('should give the physics in its usual notation, sizes sorted, when given a transfer-matrix spec', () => {
      const byKey = Object.fromEntries(specLines(spec).map((l) => [l.key, l]));
      expect(byKey.dimension).toMatchObject({ symbol: 'd', value: '3' });
      expect(byKey.symmetryClass).toMatchObject({ value: 'AI', note: 'orthogonal' });
      expect(byKey.sizes).toMatchObject({ symbol: 'L', value: '8, 12, 16', note: '3 sizes' });
      expect(byKey.disorder).toMatchObject({ symbol: 'W', note: '31 values' });
      expect(byKey.energies).toMatchObject({ symbol: 'E', value: '0' });
      expect(byKey.targetPrecision).toMatchObject({ symbol: 'ε', value: '0.5 %' });
      expect(byKey.expectedLambda).toMatchObject({ symbol: 'Λ', value: '0.6' });
      expect(byKey.node.value).toBe('48 cores, 192 GiB');
      expect(byKey.pilotTimings).toBeUndefined();
      expect(byKey.moments).toBeUndefined();
    });

    it('should leave the precision out and name the pilot sizes when the method needs none and pilots are given', () => {
      const lines = specLines({
        ...spec,
        method: 'exact-diagonalization',
        targetPrecision: undefined,
        methodOptions: {},
        pilotTimings: [
          { size: 6, seconds: 2, cores: 1 },
          { size: 8, seconds: 9, cores: 1 },
        ],
      });
      expect(lines.find((l) => l.key === 'targetPrecision')).toBeUndefined();
      expect(lines.find((l) => l.key === 'pilotTimings')).toMatchObject({ value: '2 timings', note: 'at L = 6, 8' });
    });
  });
});
