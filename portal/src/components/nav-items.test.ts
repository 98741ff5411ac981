import { describe, expect, it } from 'vitest';
import { routes } from '../router/routes';
import { NAV_ITEMS, visibleNavItems } from './nav-items';

const ids = (roles: Parameters<typeof visibleNavItems>[1]) => visibleNavItems(NAV_ITEMS, roles).map((i) => i.testId);

describe('nav-items', () => {
  describe('visibleNavItems', () => {
    it('should show Home, Campaigns and Profile when the person is a researcher or PI', () => {
      expect(ids(['researcher', 'pi'])).toEqual(['nav-home', 'nav-campaigns', 'nav-profile']);
    });

    it('should show Campaigns and the Committee queue to the committee when the person only reviews', () => {
      expect(ids(['committee'])).toEqual(['nav-home', 'nav-campaigns', 'nav-committee', 'nav-profile']);
    });

    it('should show Invoices and leave Campaigns out when the person is only a billing contact', () => {
      expect(ids(['billing'])).toEqual(['nav-home', 'nav-invoices', 'nav-profile']);
    });

    it('should add the Committee queue, Invoices, Rounds, People, Institutions and Audit log when the person is an admin', () => {
      expect(ids(['admin'])).toEqual([
        'nav-home',
        'nav-campaigns',
        'nav-committee',
        'nav-invoices',
        'nav-profile',
        'nav-rounds',
        'nav-people',
        'nav-institutions',
        'nav-audit',
      ]);
    });

    it('should show each item to the same roles its route lets in when both are declared', () => {
      for (const item of NAV_ITEMS) {
        const name = (item.to as { name: string }).name;
        const route = routes.find((r) => r.name === name);
        expect(route, name).toBeDefined();
        expect([...(item.roles ?? [])].sort(), name).toEqual([...(route?.meta?.roles ?? [])].sort());
      }
    });
  });
});
