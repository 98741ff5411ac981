import type { ApiToken, ApiTokenInput, CreatedApiToken } from '@localis/shared';
import { http } from './http-client';

export const tokensApi = {
  /** GET /me/tokens: the signed-in person's own API tokens, revoked and expired ones included. */
  list: () => http.get<{ items: ApiToken[] }>('/me/tokens'),
  /** POST /me/tokens: the answer carries the secret, the only time it is ever sent. */
  create: (input: ApiTokenInput) => http.post<CreatedApiToken>('/me/tokens', input),
  /** DELETE /me/tokens/:id (204). */
  revoke: (id: string) => http.delete(`/me/tokens/${encodeURIComponent(id)}`),
};
