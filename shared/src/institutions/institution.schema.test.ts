import { describe, expect, it } from 'vitest';
import { InstitutionInput, InstitutionPatch } from './institution.schema';

describe('institution schemas', () => {
  describe('InstitutionPatch', () => {
    it('should leave out fields the patch did not send, so nothing is erased', () => {
      expect(InstitutionPatch.parse({ country: 'nl' })).toEqual({ country: 'NL' });
    });
  });

  describe('InstitutionInput', () => {
    it('should default the billing e-mail to none and upper-case the country', () => {
      expect(InstitutionInput.parse({ name: 'Kestrel University', kind: 'member', country: 'gb' })).toEqual({ name: 'Kestrel University', kind: 'member', country: 'GB', billingEmail: null });
    });

    it('should refuse a country that is not two letters', () => {
      expect(InstitutionInput.safeParse({ name: 'X Institute', kind: 'member', country: 'GBR' }).error?.issues[0].message).toMatch(/two-letter ISO 3166/);
    });
  });
});
