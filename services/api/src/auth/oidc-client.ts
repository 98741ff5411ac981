import * as client from 'openid-client';
import { Strategy, type AuthenticateOptions } from 'openid-client/passport';
import type { Request } from 'express';
import type { Settings } from '@localis/shared';

/**
 * The passport strategy of openid-client sends state only when the provider lacks PKCE; we
 * always send PKCE, state and nonce (OpenID Connect Core 1.0, RFC 7636). The strategy stores
 * them in the session and checks all three at the callback.
 */
export class LocalisOidcStrategy extends Strategy {
  override authorizationRequestParams(req: Request, options: AuthenticateOptions): URLSearchParams {
    const params = super.authorizationRequestParams(req, options) as URLSearchParams;
    params.set('state', client.randomState());
    params.set('nonce', client.randomNonce());
    return params;
  }
}

export interface OidcHandle {
  config: client.Configuration;
  endSessionUrl(idTokenHint: string | undefined, postLogoutRedirect: string): string | null;
}

/** Discover the provider; over plain http only on loopback (the local fake). */
export async function discoverProvider(s: Settings): Promise<OidcHandle> {
  const issuer = new URL(s.OIDC_ISSUER);
  const insecureOk = issuer.protocol === 'http:' && ['127.0.0.1', 'localhost', '[::1]'].includes(issuer.hostname);
  const config = await client.discovery(
    issuer,
    s.OIDC_CLIENT_ID,
    s.OIDC_CLIENT_SECRET,
    client.ClientSecretBasic(s.OIDC_CLIENT_SECRET),
    insecureOk ? { execute: [client.allowInsecureRequests], timeout: 5 } : { timeout: 5 },
  );
  return {
    config,
    endSessionUrl(idTokenHint, postLogoutRedirect) {
      if (!config.serverMetadata().end_session_endpoint) return null;
      const params: Record<string, string> = { post_logout_redirect_uri: postLogoutRedirect, client_id: s.OIDC_CLIENT_ID };
      if (idTokenHint) params.id_token_hint = idTokenHint;
      return client.buildEndSessionUrl(config, params).href;
    },
  };
}
