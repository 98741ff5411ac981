import { describe, expect, it } from 'vitest';
import { tokenState } from './token-state';

const now = new Date('2026-03-01T12:00:00Z');

describe('tokenState', () => {
  describe('state of a token', () => {
    it('should be active when it is neither revoked nor past its expiry', () => {
      expect(tokenState({ expiresAt: '2026-03-02T00:00:00Z', revokedAt: null }, now)).toBe('active');
    });

    it('should be expired when the expiry has passed', () => {
      expect(tokenState({ expiresAt: '2026-03-01T11:59:59Z', revokedAt: null }, now)).toBe('expired');
    });

    it('should be revoked when it was revoked, even after it expired', () => {
      expect(tokenState({ expiresAt: '2026-02-01T00:00:00Z', revokedAt: '2026-01-15T00:00:00Z' }, now)).toBe('revoked');
    });
  });
});
