import { ApiTokenInput, DisorderGrid, InstitutionInput } from '@localis/shared';
import { z } from 'zod';
import { describe, expect, it } from 'vitest';
import { nextTick } from 'vue';
import { ApiError } from '../api/api-error';
import { errorKey, fieldErrors, useZodForm } from './use-zod-form';

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

  describe('nested paths', () => {
    const Spec = z.object({ title: z.string().min(3, 'title needs at least 3 characters'), spec: z.object({ disorder: DisorderGrid, sizes: z.array(z.number({ message: 'each size must be a number' }).int()).min(1) }) });
    const fromText = (v: { title: string; step: string; sizes: string }) => ({
      title: v.title,
      spec: { disorder: { from: 15, to: 18, step: v.step === '' ? undefined : Number(v.step) }, sizes: v.sizes.split(',').map(Number) },
    });

    it('should key an issue by its dotted path up to the first list index when the form is nested', () => {
      expect(errorKey(['spec', 'disorder', 'step'], true)).toBe('spec.disorder.step');
      expect(errorKey(['spec', 'sizes', 2], true)).toBe('spec.sizes');
      expect(errorKey(['spec', 'pilotTimings', 0, 'seconds'], true)).toBe('spec.pilotTimings');
      expect(errorKey([], true)).toBe('_form');
      expect(errorKey(['spec', 'disorder', 'step'])).toBe('spec');
    });

    it('should put each nested message under its own field when the values are invalid', () => {
      const form = useZodForm(Spec, () => ({ title: 'Anderson 3D', step: '0', sizes: '8, x, 16' }), { nested: true, toInput: fromText });

      expect(form.validate()).toBeNull();
      expect(form.errors.value).toEqual({ 'spec.disorder.step': 'step must be greater than 0', 'spec.sizes': 'each size must be a number' });
    });

    it('should follow a nested field as it is fixed after a failed attempt', async () => {
      const form = useZodForm(Spec, () => ({ title: 'Anderson 3D', step: '0', sizes: '8, 16' }), { nested: true, toInput: fromText });
      form.validate();

      form.values.value.step = '0.25';
      await nextTick();

      expect(form.errors.value['spec.disorder.step']).toBeUndefined();
    });

    it('should say the form\'s words for an empty field when the schema has none of its own', () => {
      const Node = z.object({ cores: z.number().int() });
      const form = useZodForm(Node, () => ({ cores: '' }), {
        nested: true,
        toInput: (v) => ({ cores: v.cores === '' ? undefined : Number(v.cores) }),
        typeMessages: { blank: 'fill this in', notANumber: 'must be a number' },
      });
      expect(form.validate()).toBeNull();
      expect(form.errors.value).toEqual({ cores: 'fill this in' });

      form.values.value.cores = 'many';
      expect(form.validate()).toBeNull();
      expect(form.errors.value).toEqual({ cores: 'must be a number' });
    });

    it('should put the server details beside nested fields when a 422 names their paths', () => {
      const form = useZodForm(Spec, () => ({ title: 'Anderson 3D', step: '0.25', sizes: '8' }), { nested: true, toInput: fromText });
      const error = new ApiError(422, 'invalid', 'Some fields are not valid.', [
        { path: ['spec', 'disorder', 'step'], message: 'this grid has 300,001 points; take a larger step' },
        { path: ['spec', 'sizes', 0], message: 'sizes above 100 000 are not supported' },
      ]);

      expect(form.applyServerErrors(error)).toBe(true);
      expect(form.errors.value).toEqual({
        'spec.disorder.step': 'this grid has 300,001 points; take a larger step',
        'spec.sizes': 'sizes above 100 000 are not supported',
      });
    });
  });
});
