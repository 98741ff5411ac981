import { ApiTokenInput, ApiTokenList, CreatedApiToken, IdParams } from '@localis/shared';
import { access, defineRoutes } from '../http/route-registry';
import type { TokensService } from './tokens.service';
import { createTokensController } from './tokens.controller';

export function tokensRoutes(service: TokensService) {
  const c = createTokensController(service);
  return defineRoutes([
    {
      method: 'get', path: '/me/tokens', tag: 'profile', summary: 'Your personal API tokens (never their secrets)',
      access: access.read(), responses: { 200: { description: 'Tokens', schema: ApiTokenList } }, handler: c.list,
    },
    {
      method: 'post', path: '/me/tokens', tag: 'profile', summary: 'Create a personal API token; the secret is returned once',
      access: access.write(), request: { body: ApiTokenInput },
      // The secret is shown once: it is never stored for an Idempotency-Key replay.
      idempotency: false,
      responses: { 201: { description: 'Created; keep the secret now', schema: CreatedApiToken } }, handler: c.create,
    },
    {
      method: 'delete', path: '/me/tokens/:id', tag: 'profile', summary: 'Revoke one of your API tokens',
      access: access.write(), request: { params: IdParams }, responses: { 204: { description: 'Revoked' } }, handler: c.revoke,
    },
  ]);
}
