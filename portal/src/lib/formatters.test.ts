import { describe, expect, it } from 'vitest';
import { daysUntil, formatCount, formatDaysFromNow, formatLocalDate, formatLocalDateTime, formatUtc, endSentence, shortId } from './formatters';

const berlin = { locale: 'en-GB', timeZone: 'Europe/Berlin' };

describe('formatters', () => {
  describe('formatLocalDateTime', () => {
    it('should show the time in the given zone when a zone is set', () => {
      expect(formatLocalDateTime('2025-03-03T13:05:09Z', berlin)).toBe('3 Mar 2025, 14:05');
    });

    it('should follow daylight saving time when the instant is in summer', () => {
      expect(formatLocalDateTime('2025-07-01T10:00:00Z', berlin)).toBe('1 Jul 2025, 12:00');
    });

    it('should return empty text when there is no date', () => {
      expect(formatLocalDateTime(null)).toBe('');
      expect(formatLocalDateTime(undefined)).toBe('');
      expect(formatLocalDateTime('not a date')).toBe('');
    });
  });

  describe('formatLocalDate', () => {
    it('should show the calendar day of the zone when the UTC day differs', () => {
      expect(formatLocalDate('2025-03-03T23:30:00Z', berlin)).toBe('4 Mar 2025');
    });
  });

  describe('formatUtc', () => {
    it('should write the exact instant in UTC when given an ISO string with an offset', () => {
      expect(formatUtc('2025-03-03T14:05:09+01:00')).toBe('2025-03-03 13:05:09 UTC');
    });

    it('should accept a Date when given one', () => {
      expect(formatUtc(new Date(Date.UTC(2024, 0, 2, 3, 4, 5)))).toBe('2024-01-02 03:04:05 UTC');
    });

    it('should return empty text when there is no date', () => {
      expect(formatUtc(null)).toBe('');
    });
  });

  describe('daysUntil and formatDaysFromNow', () => {
    const now = new Date('2025-03-01T12:00:00Z');

    it('should round up partial days when the date is in the future', () => {
      expect(daysUntil('2025-03-04T13:00:00Z', now)).toBe(4);
      expect(formatDaysFromNow('2025-03-04T11:00:00Z', now)).toBe('in 3 days');
    });

    it('should say tomorrow and today when the date is close', () => {
      expect(formatDaysFromNow('2025-03-02T11:00:00Z', now)).toBe('tomorrow');
      expect(formatDaysFromNow('2025-03-01T12:00:00Z', now)).toBe('today');
    });

    it('should count days ago when the date has passed', () => {
      expect(formatDaysFromNow('2025-02-26T12:00:00Z', now)).toBe('3 days ago');
    });
  });

  describe('formatCount', () => {
    it('should use the singular when the count is one', () => {
      expect(formatCount(1, 'token')).toBe('1 token');
    });

    it('should use the plural and group digits when the count is large', () => {
      expect(formatCount(12500, 'core-hour')).toBe('12,500 core-hours');
      expect(formatCount(0, 'person', 'people')).toBe('0 people');
    });
  });
});

describe('shortId', () => {
  describe('UUIDs', () => {
    it('should keep the last 8 characters when the id is a UUID', () => {
      expect(shortId('2b000000-0000-4000-8000-000000000005')).toBe('…00000005');
    });
  });

  describe('other ids', () => {
    it('should keep short ids whole and cut long ones', () => {
      expect(shortId('4711')).toBe('4711');
      expect(shortId('x'.repeat(30))).toBe(`${'x'.repeat(23)}…`);
    });
  });
});

describe('endSentence', () => {
  describe('the closing mark', () => {
    it('should add a full stop when the text has none', () => {
      expect(endSentence('I co-authored the pilot study')).toBe('I co-authored the pilot study.');
    });

    it.each(['We calibrate.', 'Really?', 'Same group!', 'And so on…'])('should add nothing when the text ends with its own mark: %s', (text) => {
      expect(endSentence(text)).toBe(text);
    });

    it('should look past trailing spaces when the writer left some', () => {
      expect(endSentence('We calibrate.  ')).toBe('We calibrate.');
      expect(endSentence('We calibrate \n')).toBe('We calibrate.');
    });
  });
});
