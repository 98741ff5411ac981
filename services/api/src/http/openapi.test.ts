import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../../test/harness';
import { fullPath } from './route-registry';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp();
});
afterAll(async () => t.close());

describe('OpenAPI description', () => {
  describe('content', () => {
    it('should describe every route in OpenAPI 3.1 from the zod schemas', async () => {
      const res = await fetch(`${t.url}/api/v1/openapi.json`);
      expect(res.status).toBe(200);
      const doc = (await res.json()) as { openapi: string; paths: Record<string, Record<string, { responses: Record<string, unknown> }>>; components: { schemas: Record<string, unknown> } };
      expect(doc.openapi).toBe('3.1.0');
      for (const r of t.routes) {
        const path = fullPath(r).replace(/:(\w+)/g, '{$1}');
        expect(doc.paths[path]?.[r.method], `${r.method} ${path}`).toBeDefined();
      }
      expect(doc.components.schemas).toHaveProperty('Person');
      expect(doc.components.schemas).toHaveProperty('ErrorBody');
      expect(Object.keys(doc.paths['/api/v1/people'].post.responses)).toEqual(expect.arrayContaining(['201', '401', '403', '422']));
    });
  });
});
