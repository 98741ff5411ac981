import { describe, expect, it } from 'vitest';
import { NAV_ITEMS, visibleNavItems } from './nav-items';

describe('nav-items', () => {
  describe('visibleNavItems', () => {
    it('should show only Home and Profile when the person holds no admin role', () => {
      expect(visibleNavItems(NAV_ITEMS, ['researcher', 'pi']).map((i) => i.testId)).toEqual(['nav-home', 'nav-profile']);
    });

    it('should add People, Institutions and Audit log when the person is an admin', () => {
      expect(visibleNavItems(NAV_ITEMS, ['admin']).map((i) => i.testId)).toEqual([
        'nav-home',
        'nav-profile',
        'nav-people',
        'nav-institutions',
        'nav-audit',
      ]);
    });
  });
});
