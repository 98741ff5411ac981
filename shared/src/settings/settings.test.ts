import { describe, expect, it } from 'vitest';
import { SafeRedirect } from '../auth/session.schema';
import { databaseUrl, loadSettings, TEST_PROFILE } from './settings';

describe('settings', () => {
  describe('defaults', () => {
    it('should use the documented loopback ports when nothing is set', () => {
      const s = loadSettings({});
      expect([s.APP_PORT, s.PG_PORT, s.REDIS_PORT, s.S3_PORT, s.OIDC_PORT, s.STRIPE_PORT, s.SMTP_PORT, s.MAIL_INBOX_PORT]).toEqual([4100, 54329, 63790, 9100, 9400, 12111, 1025, 1080]);
      expect(databaseUrl(s)).toBe('postgres://postgres@127.0.0.1:54329/localis');
    });

    it('should keep every test port apart from the demo ports', () => {
      const demo = loadSettings({});
      const test = loadSettings(TEST_PROFILE);
      for (const key of ['APP_PORT', 'PG_PORT', 'REDIS_PORT', 'S3_PORT', 'OIDC_PORT', 'STRIPE_PORT', 'SMTP_PORT', 'MAIL_INBOX_PORT'] as const) {
        expect(test[key], key).not.toBe(demo[key]);
      }
      expect(test.PG_DATABASE).not.toBe(demo.PG_DATABASE);
    });
  });

  describe('validation', () => {
    it('should refuse the shipped secrets when the address is public https', () => {
      expect(() => loadSettings({ PUBLIC_URL: 'https://localis.example.org' })).toThrow(/SESSION_SECRET, OIDC_CLIENT_SECRET: set your own secret/);
      expect(loadSettings({ PUBLIC_URL: 'https://localis.example.org', SESSION_SECRET: 'a'.repeat(32), OIDC_CLIENT_SECRET: 'b'.repeat(32) }).PUBLIC_URL).toBe('https://localis.example.org');
    });

    it('should refuse to bind a service beyond loopback, saying why', () => {
      expect(() => loadSettings({ APP_HOST: '0.0.0.0' })).toThrow(/loopback only/);
    });
  });
});

describe('SafeRedirect', () => {
  describe('paths', () => {
    it('should accept own paths and refuse other sites when given a return address', () => {
      expect(SafeRedirect.safeParse('/admin/people?role=pi').success).toBe(true);
      for (const bad of ['//evil.example/', 'https://evil.example/', '/\\evil.example', 'javascript:alert(1)']) {
        expect(SafeRedirect.safeParse(bad).success, bad).toBe(false);
      }
    });
  });
});
