import { createDocument, type ZodOpenApiPathsObject } from 'zod-openapi';
import { ErrorBody } from '@localis/shared';
import { fullPath, type RouteSpec } from './route-registry';

const COMMON_ERRORS = {
  400: 'Malformed request',
  401: 'Not signed in, or the API token is not valid',
  403: 'Wrong role, not yours, or a missing CSRF token',
  404: 'Not found',
  409: 'Conflict',
  413: 'Body too large',
  422: 'Invalid input; `details` carries the zod issue paths',
  429: 'Rate-limited',
};

/** The OpenAPI 3.1 description, generated from the same route table and zod schemas the server runs. */
export function buildOpenApi(routes: RouteSpec[], version: string) {
  const paths: ZodOpenApiPathsObject = {};
  for (const r of routes) {
    const path = fullPath(r).replace(/:(\w+)/g, '{$1}');
    const responses: Record<string, unknown> = {};
    for (const [status, spec] of Object.entries(r.responses)) {
      responses[status] = { description: spec.description, ...(spec.schema ? { content: { [spec.contentType ?? 'application/json']: { schema: spec.schema } } } : {}) };
    }
    for (const [status, description] of Object.entries(COMMON_ERRORS)) {
      if (r.access.kind === 'public' && (status === '401' || status === '403')) continue;
      responses[status] ??= { description, content: { 'application/json': { schema: ErrorBody } } };
    }
    (paths[path] ??= {})[r.method] = {
      summary: r.summary,
      tags: [r.tag],
      security: r.access.kind === 'public' ? [] : [{ session: [] }, { apiToken: [] }],
      ...(r.access.kind === 'signed-in'
        ? { description: `Needs ${r.access.roles ? `the role ${r.access.roles.join(' or ')}` : 'a signed-in person'}; API tokens need the "${r.access.scope}" scope.` }
        : {}),
      ...(r.request?.params || r.request?.query
        ? { requestParams: { ...(r.request.params ? { path: r.request.params } : {}), ...(r.request.query ? { query: r.request.query } : {}) } }
        : {}),
      ...(r.request?.body ? { requestBody: { content: { 'application/json': { schema: r.request.body } } } } : {}),
      responses,
    } as never;
  }
  return createDocument({
    openapi: '3.1.0',
    info: {
      title: 'Localis API',
      version,
      description: 'Allocation rounds, campaigns, core-hour ledger, result archives, provenance, scaling analyses and invoices of the consortium.',
    },
    servers: [{ url: '/' }],
    components: {
      securitySchemes: {
        session: { type: 'apiKey', in: 'cookie', name: 'localis.sid', description: 'Browser session; writes also need the x-csrf-token header' },
        apiToken: { type: 'http', scheme: 'bearer', description: 'Personal API token from the profile page' },
      },
    },
    paths,
  });
}
