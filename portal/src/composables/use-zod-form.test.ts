import { ApiTokenInput, InstitutionInput } from '@localis/shared';
import { describe, expect, it } from 'vitest';
import { nextTick } from 'vue';
import { ApiError } from '../api/api-error';
import { fieldErrors, useZodForm } from './use-zod-form';

describe('useZodForm', () => {
  describe('fieldErrors', () => {
    it('should keep the first message per top-level field when issues repeat a field', () => {
      expect(
        fieldErrors([
          { path: ['scopes', 0], message: 'not a scope' },
          { path: ['scopes'], message: 'second' },
          { path: [], message: 'whole form' },
        ]),
      ).toEqual({ scopes: 'not a scope', _form: 'whole form' });
    });
  });

  describe('validation with the shared schema', () => {
    it('should give field errors in the schema words when the values are invalid', () => {
      const form = useZodForm(ApiTokenInput, () => ({ name: ' ', scopes: [] as string[], expiresInDays: 0 }));

      expect(form.validate()).toBeNull();
      expect(form.errors.value).toEqual({
        name: 'give the token a name, such as the machine it is for',
        scopes: 'choose at least one scope',
        expiresInDays: 'a token lives at least 1 day',
      });
    });

    it('should return the parsed output when the values are valid', () => {
      const form = useZodForm(InstitutionInput, () => ({ name: ' Kestrel University ', kind: 'member', country: 'gb', billingEmail: null }));

      expect(form.validate()).toEqual({ name: 'Kestrel University', kind: 'member', country: 'GB', billingEmail: null });
      expect(form.errors.value).toEqual({});
    });

    it('should clear an error as the person fixes the field after a failed attempt', async () => {
      const form = useZodForm(ApiTokenInput, () => ({ name: '', scopes: ['read'], expiresInDays: 30 }));
      form.validate();
      expect(form.errors.value.name).toBeDefined();

      form.values.value.name = 'kestrel-login-node';
      await nextTick();

      expect(form.errors.value.name).toBeUndefined();
    });
  });

  describe('dirty state', () => {
    it('should be dirty when a value changes and clean again after reset', () => {
      const form = useZodForm(ApiTokenInput, () => ({ name: '', scopes: ['read'], expiresInDays: 90 }));
      expect(form.dirty.value).toBe(false);

      form.values.value.scopes.push('runs');
      expect(form.dirty.value).toBe(true);

      form.reset();
      expect(form.dirty.value).toBe(false);
      expect(form.values.value.scopes).toEqual(['read']);
    });
  });

  describe('server errors', () => {
    it('should put the server details beside the fields when a 422 has details', () => {
      const form = useZodForm(ApiTokenInput, () => ({ name: 'x', scopes: ['admin'], expiresInDays: 90 }));
      const error = new ApiError(422, 'invalid', 'Some fields are not valid.', [{ path: ['scopes'], message: 'your roles do not allow the admin scope' }]);

      expect(form.applyServerErrors(error)).toBe(true);
      expect(form.errors.value.scopes).toBe('your roles do not allow the admin scope');
    });

    it('should leave the fields alone when the error has no details', () => {
      const form = useZodForm(ApiTokenInput, () => ({ name: 'x', scopes: ['read'], expiresInDays: 90 }));

      expect(form.applyServerErrors(new ApiError(409, 'conflict', 'Exists.'))).toBe(false);
      expect(form.applyServerErrors(new Error('boom'))).toBe(false);
      expect(form.errors.value).toEqual({});
    });
  });
});
