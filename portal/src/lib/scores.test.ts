import { describe, expect, it } from 'vitest';
import { formatScore, formatScoreOutOf, SCORE_OPTIONS } from './scores';

describe('scores', () => {
  describe('formatScore', () => {
    it('should keep one decimal when the mean is not whole', () => {
      expect(formatScore(3.6667)).toBe('3.7');
    });

    it('should drop the decimal when the score is whole', () => {
      expect(formatScore(4)).toBe('4');
      expect(formatScore(4.01)).toBe('4');
    });

    it('should give empty text when there is no score yet', () => {
      expect(formatScore(null)).toBe('');
      expect(formatScore(undefined)).toBe('');
      expect(formatScore(Number.NaN)).toBe('');
    });
  });

  describe('formatScoreOutOf', () => {
    it('should name the scale when a score is given', () => {
      expect(formatScoreOutOf(2.5)).toBe('2.5 of 5');
    });

    it('should stay empty when there is no score', () => {
      expect(formatScoreOutOf(null)).toBe('');
    });
  });

  describe('SCORE_OPTIONS', () => {
    it('should offer 1 to 5 with words from poor to excellent', () => {
      expect(SCORE_OPTIONS.map((o) => o.value)).toEqual([1, 2, 3, 4, 5]);
      expect(SCORE_OPTIONS[0].title).toBe('1: poor');
      expect(SCORE_OPTIONS[4].title).toBe('5: excellent');
    });
  });
});
