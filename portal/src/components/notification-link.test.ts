import { describe, expect, it } from 'vitest';
import { badgeText, bellLabel, internalPath } from './notification-link';

describe('notification-link', () => {
  describe('internalPath', () => {
    it('should follow paths inside the portal', () => {
      expect(internalPath('/campaigns/8b1c/ledger')).toBe('/campaigns/8b1c/ledger');
    });

    it('should follow nothing that leads to another site or is missing', () => {
      expect(internalPath('//elsewhere.example/x')).toBeNull();
      expect(internalPath('/\\elsewhere.example')).toBeNull();
      expect(internalPath('https://elsewhere.example')).toBeNull();
      expect(internalPath('javascript:alert(1)')).toBeNull();
      expect(internalPath(null)).toBeNull();
      expect(internalPath('')).toBeNull();
    });
  });

  describe('bellLabel and badgeText', () => {
    it('should say how many are unread, and keep the badge short', () => {
      expect(bellLabel(0)).toBe('Notifications, none unread');
      expect(bellLabel(3)).toBe('Notifications, 3 unread');
      expect(badgeText(7)).toBe('7');
      expect(badgeText(120)).toBe('99+');
    });
  });
});
