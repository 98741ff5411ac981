import { describe, expect, it } from 'vitest';
import type { RouteMeta } from 'vue-router';
import { decideNavigation, pageTitle, safeRedirect, type SessionView } from './decide-navigation';

const signedOut: SessionView = { signedIn: false, roles: [] };
const researcher: SessionView = { signedIn: true, roles: ['researcher'] };
const admin: SessionView = { signedIn: true, roles: ['researcher', 'admin'] };

function to(meta: RouteMeta, fullPath = '/somewhere', query: Record<string, unknown> = {}) {
  return { meta, fullPath, query };
}

describe('decideNavigation', () => {
  describe('public pages', () => {
    it('should allow anyone when the route does not require sign-in', () => {
      expect(decideNavigation(to({}), signedOut)).toEqual({ kind: 'allow' });
      expect(decideNavigation(to({ title: 'Signed out' }), admin)).toEqual({ kind: 'allow' });
    });

    it('should send a signed-in person to the redirect when the page is for guests', () => {
      expect(decideNavigation(to({ guestOnly: true }, '/sign-in', { redirect: '/admin/people?page=2' }), admin)).toEqual({
        kind: 'go',
        path: '/admin/people?page=2',
      });
    });

    it('should send a signed-in person home when the guest page has no usable redirect', () => {
      expect(decideNavigation(to({ guestOnly: true }, '/sign-in', { redirect: '//evil.example' }), admin)).toEqual({
        kind: 'go',
        path: '/',
      });
    });

    it('should allow a signed-out person on a guest page', () => {
      expect(decideNavigation(to({ guestOnly: true }, '/sign-in'), signedOut)).toEqual({ kind: 'allow' });
    });
  });

  describe('pages that require sign-in', () => {
    it('should ask for sign-in with the full path as redirect when nobody is signed in', () => {
      expect(decideNavigation(to({ requiresAuth: true }, '/admin/audit?action=role.grant'), signedOut)).toEqual({
        kind: 'sign-in',
        redirect: '/admin/audit?action=role.grant',
      });
    });

    it('should allow any signed-in person when the route names no roles', () => {
      expect(decideNavigation(to({ requiresAuth: true }), researcher)).toEqual({ kind: 'allow' });
    });

    it('should allow a person when they hold one of the roles', () => {
      expect(decideNavigation(to({ requiresAuth: true, roles: ['billing', 'admin'] }), admin)).toEqual({ kind: 'allow' });
    });

    it('should refuse with not-allowed when the person lacks every role', () => {
      expect(decideNavigation(to({ requiresAuth: true, roles: ['admin'] }, '/admin/people'), researcher)).toEqual({
        kind: 'not-allowed',
        from: '/admin/people',
      });
    });

    it('should ask for sign-in rather than refuse when nobody is signed in on a role page', () => {
      expect(decideNavigation(to({ requiresAuth: true, roles: ['admin'] }, '/admin/people'), signedOut).kind).toBe('sign-in');
    });
  });
});

describe('safeRedirect', () => {
  describe('what it accepts', () => {
    it('should keep a path of this site when given one', () => {
      expect(safeRedirect('/profile?tab=tokens')).toBe('/profile?tab=tokens');
    });

    it('should fall back when given another origin, a protocol-relative URL or nothing', () => {
      expect(safeRedirect('https://evil.example/')).toBe('/');
      expect(safeRedirect('//evil.example/')).toBe('/');
      expect(safeRedirect('/\\evil.example')).toBe('/');
      expect(safeRedirect(undefined)).toBe('/');
    });

    it('should take the first value when the query repeats the key', () => {
      expect(safeRedirect(['/a', '/b'])).toBe('/a');
    });
  });
});

describe('pageTitle', () => {
  describe('format', () => {
    it('should append the product name when the route has a title', () => {
      expect(pageTitle('People')).toBe('People · Localis');
    });

    it('should be the product name alone when there is no title', () => {
      expect(pageTitle(undefined)).toBe('Localis');
    });
  });
});
