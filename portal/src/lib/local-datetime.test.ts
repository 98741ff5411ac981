import { describe, expect, it } from 'vitest';
import { fromLocalInput, toLocalInput } from './local-datetime';

describe('local-datetime', () => {
  describe('toLocalInput and fromLocalInput', () => {
    it('should give back the same instant when a time goes into the box and out again', () => {
      expect(fromLocalInput(toLocalInput('2027-02-01T08:30:00Z'))).toBe('2027-02-01T08:30:00.000Z');
      expect(toLocalInput('2027-02-01T08:30:00Z')).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}$/);
    });

    it('should give empty text when there is no time or it cannot be read', () => {
      expect(toLocalInput('')).toBe('');
      expect(toLocalInput(null)).toBe('');
      expect(toLocalInput('yesterday')).toBe('');
      expect(fromLocalInput('')).toBe('');
      expect(fromLocalInput(undefined)).toBe('');
      expect(fromLocalInput('not a time')).toBe('');
    });
  });
});
