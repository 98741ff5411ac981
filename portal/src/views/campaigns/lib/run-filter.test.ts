import { describe, expect, it } from 'vitest';
import { parameterSummary, runQueryProblems } from './run-filter';

describe('run-filter', () => {
  describe('runQueryProblems', () => {
    it('should find nothing wrong with the filters the page itself writes', () => {
      expect(runQueryProblems({ q: '9812', from: '2027-02-01T08:00:00.000Z', limit: 25, offset: 0, sort: '-startedAt' })).toEqual({});
    });

    it('should name a hand-edited time the api would refuse', () => {
      expect(runQueryProblems({ from: 'last week', limit: 25, offset: 0, sort: '-startedAt' })).toEqual({ from: 'from must be a date and time' });
    });
  });

  describe('parameterSummary', () => {
    it('should give ranges with counts, single values and the number of seeds', () => {
      expect(parameterSummary({ sizes: [8, 24, 12, 16], disorder: [16.5], energies: [], seeds: [1, 2, 3] })).toBe('L 8–24 (4) · W 16.5 · 3 seeds');
      expect(parameterSummary({ sizes: [], disorder: [], energies: [], seeds: [7] })).toBe('1 seed');
    });

    it('should give empty text when the run lists no parameters', () => {
      expect(parameterSummary({ sizes: [], disorder: [], energies: [], seeds: [] })).toBe('');
    });
  });
});
