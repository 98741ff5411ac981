import { describe, expect, it } from 'vitest';
import { dayBoundary, parseInstant } from './audit-filter';

describe('audit-filter', () => {
  describe('dayBoundary', () => {
    it('should give local midnight for the start and the last millisecond for the end of a day', () => {
      const day = new Date(2026, 2, 3, 15, 30);
      const start = new Date(dayBoundary(day, 'start'));
      const end = new Date(dayBoundary(day, 'end'));

      expect([start.getFullYear(), start.getMonth(), start.getDate(), start.getHours(), start.getMinutes()]).toEqual([2026, 2, 3, 0, 0]);
      expect([end.getDate(), end.getHours(), end.getMinutes(), end.getSeconds(), end.getMilliseconds()]).toEqual([3, 23, 59, 59, 999]);
      expect(dayBoundary(day, 'start')).toMatch(/Z$/);
    });
  });

  describe('parseInstant', () => {
    it('should read an ISO instant and refuse nonsense when given URL text', () => {
      expect(parseInstant('2026-03-03T00:00:00.000Z')?.toISOString()).toBe('2026-03-03T00:00:00.000Z');
      expect(parseInstant('yesterday')).toBeNull();
      expect(parseInstant(undefined)).toBeNull();
    });
  });
});
