import { createHash, generateKeyPairSync, randomBytes } from 'node:crypto';
import type { Server } from 'node:http';
import express from 'express';
import Provider, { type Configuration, type KoaContextWithOIDC } from 'oidc-provider';
import { DEMO_PASSWORD, OUTSIDER, PEOPLE } from '@localis/seeds/scenario';

export interface OidcFakeOptions {
  issuer: string;
  host: string;
  port: number;
  clientId: string;
  clientSecret: string;
  /** Where the app may send people back after sign-out (exact URLs). */
  postLogoutRedirectUris: string[];
  /** Also accept any address at this domain (tests create people on the fly). */
  openDomain?: string;
}

interface Account {
  email: string;
  name: string;
}

/** A stable subject per e-mail, as a real provider keeps one per account. */
export function subjectFor(email: string): string {
  return 'idp-' + createHash('sha256').update(email.toLowerCase()).digest('hex').slice(0, 20);
}

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

const PAGE_STYLE = `body{font-family:system-ui,sans-serif;background:#f4f1ec;color:#2b2622;display:flex;justify-content:center;padding-top:8vh}
main{background:#fff;border:1px solid #d9d2c7;border-radius:8px;padding:28px 32px;width:340px}
h1{font-size:1.2rem;margin:0 0 4px}p{color:#5b534b;font-size:.9rem}label{display:block;margin:14px 0 4px;font-size:.9rem}
input{width:100%;box-sizing:border-box;padding:8px;border:1px solid #8c8378;border-radius:4px;font-size:1rem}
button{margin-top:18px;width:100%;padding:10px;background:#3b3a6b;color:#fff;border:0;border-radius:4px;font-size:1rem;cursor:pointer}
.err{color:#a3201a;font-size:.9rem}`;

function page(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>${title}</title><style>${PAGE_STYLE}</style></head><body><main>${body}</main></body></html>`;
}

/**
 * A local identity provider (oidc-provider) that knows the demo people. It shows its own plain
 * sign-in form; every account's password is the demo password. Tests and the demo sign in
 * through it with the real authorization code flow.
 */
export async function startOidcFake(opts: OidcFakeOptions): Promise<{ server: Server; close: () => Promise<void> }> {
  const accounts = new Map<string, Account>();
  for (const p of [...PEOPLE, OUTSIDER]) accounts.set(subjectFor(p.email), { email: p.email, name: p.name });
  const findByEmail = (email: string): [string, Account] | undefined => {
    const normal = email.trim().toLowerCase();
    const sub = subjectFor(normal);
    const known = accounts.get(sub);
    if (known) return [sub, known];
    if (opts.openDomain && normal.endsWith(`@${opts.openDomain}`)) {
      const account = { email: normal, name: normal.split('@')[0].replace(/[._-]+/g, ' ') };
      accounts.set(sub, account);
      return [sub, account];
    }
    return undefined;
  };

  // A fresh signing key per start, as the fake keeps no state across starts anyway.
  const signingKey = { ...generateKeyPairSync('rsa', { modulusLength: 2048 }).privateKey.export({ format: 'jwk' }), use: 'sig', alg: 'RS256', kid: randomBytes(8).toString('hex') };

  const configuration: Configuration = {
    jwks: { keys: [signingKey as never] },
    clients: [
      {
        client_id: opts.clientId,
        client_secret: opts.clientSecret,
        // A loopback "native" registration lets the app run on any port (RFC 8252 section 7.3):
        // the api tests listen on a random port.
        application_type: 'native',
        redirect_uris: ['http://127.0.0.1/api/v1/auth/callback'],
        post_logout_redirect_uris: opts.postLogoutRedirectUris,
        grant_types: ['authorization_code'],
        response_types: ['code'],
        token_endpoint_auth_method: 'client_secret_basic',
      },
    ],
    pkce: { required: () => true },
    claims: { openid: ['sub'], email: ['email', 'email_verified'], profile: ['name'] },
    conformIdTokenClaims: false,
    findAccount: async (_ctx, sub) => {
      const account = accounts.get(sub);
      if (!account) return undefined;
      // Test addresses starting with "unverified" stand for accounts whose e-mail the provider never checked.
      const verified = !account.email.startsWith('unverified');
      // Addresses starting with "userinfo-only" stand for providers that keep e-mail out of the ID token.
      const minimalIdToken = account.email.startsWith('userinfo-only');
      return {
        accountId: sub,
        claims: async (use: string) =>
          use === 'id_token' && minimalIdToken ? { sub } : { sub, email: account.email, email_verified: verified, name: account.name },
      };
    },
    interactions: { url: (_ctx, interaction) => `/interaction/${interaction.uid}` },
    cookies: {
      keys: [randomBytes(32).toString('hex')],
      // Cookies on 127.0.0.1 are shared across ports: names distinct from the app's.
      names: { session: 'idp_session', interaction: 'idp_interaction', resume: 'idp_resume' },
    },
    // The portal is a first-party client: grant its scopes without a consent screen.
    loadExistingGrant: async (ctx: KoaContextWithOIDC) => {
      const grantId = ctx.oidc.result?.consent?.grantId || ctx.oidc.session!.grantIdFor(ctx.oidc.client!.clientId);
      if (grantId) return ctx.oidc.provider.Grant.find(grantId);
      const grant = new ctx.oidc.provider.Grant({ clientId: ctx.oidc.client!.clientId, accountId: ctx.oidc.session!.accountId! });
      grant.addOIDCScope('openid email profile');
      await grant.save();
      return grant;
    },
    features: {
      devInteractions: { enabled: false },
      rpInitiatedLogout: {
        enabled: true,
        // Sign-out from Localis ends the provider session too, without a second question.
        logoutSource: async (ctx, form) => {
          const withConfirm = form.replace('</form>', '<input type="hidden" name="logout" value="yes"/></form>');
          ctx.body = page('Signing out', `<h1>Signing out…</h1>${withConfirm}<noscript><button form="op.logoutForm">Continue</button></noscript><script>document.forms[0].submit()</script>`);
        },
        postLogoutSuccessSource: async (ctx) => {
          ctx.body = page('Signed out', '<h1>You have signed out</h1><p>You can close this window.</p>');
        },
      },
    },
    renderError: async (ctx, out) => {
      ctx.type = 'html';
      ctx.body = page('Sign-in problem', `<h1>Sign-in problem</h1><p class="err">${escapeHtml(String(out.error_description ?? out.error))}</p>`);
    },
    ttl: { Session: 8 * 3600, Interaction: 600, Grant: 8 * 3600, AccessToken: 3600, IdToken: 3600, AuthorizationCode: 120 },
  };

  const provider = new Provider(opts.issuer, configuration);
  provider.on('server_error', (_ctx, err) => console.error('oidc fake error:', err));

  const app = express();
  app.disable('x-powered-by');

  const form = (uid: string, email = '', error = '') =>
    page('Coldwater sign-in', `<h1>Coldwater Network sign-in</h1><p>Identity provider for the consortium (local test server).</p>
${error ? `<p class="err" role="alert">${escapeHtml(error)}</p>` : ''}
<form method="post" action="/interaction/${escapeHtml(uid)}/login">
<label for="email">E-mail</label><input id="email" name="email" type="email" autocomplete="username" required value="${escapeHtml(email)}" autofocus>
<label for="password">Password</label><input id="password" name="password" type="password" autocomplete="current-password" required>
<button type="submit" id="submit">Sign in</button></form>`);

  // Browsers ask every site for an icon; answering keeps their consoles free of 404s.
  app.get('/favicon.ico', (_req, res) => res.status(204).end());

  app.get('/interaction/:uid', async (req, res, next) => {
    try {
      const details = await provider.interactionDetails(req, res);
      if (details.prompt.name === 'login') {
        res.type('html').send(form(details.uid, String(details.params.login_hint ?? '')));
        return;
      }
      // Consent is implied for the first-party client (see loadExistingGrant).
      await provider.interactionFinished(req, res, { consent: {} }, { mergeWithLastSubmission: true });
    } catch (e) {
      next(e);
    }
  });

  app.post('/interaction/:uid/login', express.urlencoded({ extended: false }), async (req, res, next) => {
    try {
      const details = await provider.interactionDetails(req, res);
      const email = String(req.body?.email ?? '');
      const found = findByEmail(email);
      if (!found || req.body?.password !== DEMO_PASSWORD) {
        res.status(401).type('html').send(form(details.uid, email, 'That e-mail and password do not match an account.'));
        return;
      }
      await provider.interactionFinished(req, res, { login: { accountId: found[0] } }, { mergeWithLastSubmission: false });
    } catch (e) {
      next(e);
    }
  });

  app.use(provider.callback());

  const server = await new Promise<Server>((resolve, reject) => {
    const s = app.listen(opts.port, opts.host, () => resolve(s));
    s.on('error', reject);
  });
  return { server, close: () => new Promise((r) => server.close(() => r())) };
}
