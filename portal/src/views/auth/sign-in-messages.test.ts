import { describe, expect, it } from 'vitest';
import { signInErrorMessage } from './sign-in-messages';

describe('signInErrorMessage', () => {
  describe('words for ?error=', () => {
    it('should explain signin_failed when the sign-in did not complete', () => {
      expect(signInErrorMessage('signin_failed')).toBe('Sign-in did not complete. Try again.');
    });

    it('should fall back to the general message when the code is unknown', () => {
      expect(signInErrorMessage('<script>')).toBe('Sign-in did not complete. Try again.');
    });

    it('should say nothing when there is no error', () => {
      expect(signInErrorMessage(undefined)).toBeNull();
      expect(signInErrorMessage('')).toBeNull();
    });
  });
});
