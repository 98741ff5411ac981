import { describe, expect, it } from 'vitest';
import { formatSpeed, formatTimeLeft, parseRunIds, percentOf, shortSha } from './archive-format';

describe('archive-format', () => {
  describe('formatSpeed', () => {
    it('should give decimal megabytes per second', () => {
      expect(formatSpeed(12_345_678)).toBe('12 MB/s');
      expect(formatSpeed(2_345_678)).toBe('2.3 MB/s');
      expect(formatSpeed(40_000)).toBe('0.0 MB/s');
    });

    it('should show a dash while nothing moves', () => {
      expect(formatSpeed(0)).toBe('—');
      expect(formatSpeed(Number.NaN)).toBe('—');
    });
  });

  describe('formatTimeLeft', () => {
    it('should round to what a person can plan with', () => {
      expect(formatTimeLeft(0.2)).toBe('about 1 s');
      expect(formatTimeLeft(42)).toBe('about 42 s');
      expect(formatTimeLeft(185)).toBe('about 3 min');
      expect(formatTimeLeft(3600)).toBe('about 1 h');
      expect(formatTimeLeft(4800)).toBe('about 1 h 20 min');
    });

    it('should show a dash when it cannot be told', () => {
      expect(formatTimeLeft(null)).toBe('—');
      expect(formatTimeLeft(Number.POSITIVE_INFINITY)).toBe('—');
    });
  });

  describe('percentOf', () => {
    it('should say 100 only when every byte is there', () => {
      expect(percentOf(999_999, 1_000_000)).toBe(99);
      expect(percentOf(1_000_000, 1_000_000)).toBe(100);
      expect(percentOf(425, 1000)).toBe(42);
      expect(percentOf(0, 0)).toBe(0);
    });
  });

  it('should shorten a SHA-256 to its first 12 digits', () => {
    expect(shortSha('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad')).toBe('ba7816bf8f01…');
  });

  it('should read run ids separated by lines, commas or spaces', () => {
    expect(parseRunIds(' a1,\nb2  c3;d4\n\n')).toEqual(['a1', 'b2', 'c3', 'd4']);
    expect(parseRunIds('   ')).toEqual([]);
  });
});
