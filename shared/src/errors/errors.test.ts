import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { ERROR_STATUS, ErrorBody } from './app-error';
import { errors } from './errors';

describe('errors', () => {
  describe('statuses', () => {
    it('should carry the HTTP status of its code', () => {
      expect(errors.malformed().status).toBe(400);
      expect(errors.notSignedIn().status).toBe(401);
      expect(errors.forbidden().status).toBe(403);
      expect(errors.notFound('The campaign').message).toBe('The campaign was not found.');
      expect(errors.conflict('x').status).toBe(409);
      expect(errors.tooLarge('1mb').status).toBe(413);
      expect(errors.rateLimited(60).message).toContain('60 s');
      expect(Object.values(ERROR_STATUS)).toContain(422);
    });
  });

  describe('fromZod', () => {
    it('should give one detail per zod issue with its path', () => {
      const r = z.object({ name: z.string().min(2), sizes: z.array(z.number().int()) }).safeParse({ name: 'x', sizes: [1, 2.5] });
      const e = errors.fromZod(r.error!, 'campaign');
      expect(e.status).toBe(422);
      expect(e.message).toBe('Some fields of the campaign are not valid.');
      expect(e.details?.map((d) => d.path)).toEqual([['name'], ['sizes', 1]]);
    });
  });

  describe('body', () => {
    it('should match the one error shape when serialised', () => {
      const body = errors.invalid('bad', [{ path: ['a'], message: 'm' }]).toBody();
      expect(ErrorBody.parse(body)).toEqual({ error: { code: 'invalid', message: 'bad', details: [{ path: ['a'], message: 'm' }] } });
    });
  });
});
