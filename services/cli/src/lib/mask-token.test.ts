import { describe, expect, it } from 'vitest';
import { maskToken } from './mask-token';

describe('maskToken', () => {
  describe('real tokens', () => {
    it('should show the first 10 characters and an ellipsis when given a full token', () => {
      expect(maskToken('lcs_kzZyaKYfY_lLQp5JBPCLp1I5FMLMM5aKbYRb6QaS4Q8')).toBe('lcs_kzZyaK…');
    });

    it('should match the prefix the profile page shows when the token is a Localis token', () => {
      const token = 'lcs_C0VjYIIg92guLLlzwbpfYebWOyD0zGjy9fND7GhFEPQ';
      expect(maskToken(token).slice(0, -1)).toBe(token.slice(0, 'lcs_'.length + 6));
    });
  });

  describe('short input', () => {
    it('should never reveal the whole string when it is shorter than the shown prefix', () => {
      expect(maskToken('abcdef')).toBe('abc…');
      expect(maskToken('x')).toBe('…');
      expect(maskToken('')).toBe('…');
    });
  });
});
