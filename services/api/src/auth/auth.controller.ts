import type { NextFunction, Request, Response } from 'express';
import passport from 'passport';
import * as client from 'openid-client';
import type { Logger } from 'pino';
import { SafeRedirect, type SessionInfo, type Settings, type SignOutResult } from '@localis/shared';
import { contextOf } from '../http/principal';
import { generateCsrfToken } from '../http/csrf';
import { discoverProvider, LocalisOidcStrategy, type OidcHandle } from './oidc-client';
import { IdentityClaims, type SignInService } from './sign-in.service';

interface SessionUser {
  personId: string;
  idToken?: string;
}

const CALLBACK_PATH = '/api/v1/auth/callback';

/** Sign-in with the identity provider (OIDC code flow), sign-out, and the session summary. */
export function createAuthController(s: Settings, signIn: SignInService, logger: Logger) {
  const auth = new passport.Passport();
  auth.serializeUser((user, done) => done(null, user));
  auth.deserializeUser((user: SessionUser, done) => done(null, user));

  // Discovery is lazy and retried: the api may start before the provider is up.
  let provider: Promise<OidcHandle> | undefined;
  function ready(): Promise<OidcHandle> {
    provider ??= discoverProvider(s).then((handle) => {
      auth.use(
        'oidc',
        new LocalisOidcStrategy(
          { config: handle.config, scope: 'openid email profile', callbackURL: new URL(CALLBACK_PATH, s.PUBLIC_URL).href, name: 'oidc', passReqToCallback: true },
          async (req: Request, tokens, done) => {
            try {
              let raw: Record<string, unknown> = { ...tokens.claims() };
              // Providers may keep e-mail claims out of the ID token; then ask userinfo.
              if (raw.email === undefined || raw.email_verified === undefined) {
                raw = { ...raw, ...(await client.fetchUserInfo(handle.config, tokens.access_token, String(raw.sub))) };
              }
              const claims = IdentityClaims.parse(raw);
              const outcome = await signIn.signIn(claims, contextOf(req));
              if (outcome.kind !== 'signed-in') return done(null, false, outcome);
              done(null, { personId: outcome.personId, idToken: tokens.id_token } satisfies SessionUser);
            } catch (e) {
              done(e as Error);
            }
          },
        ),
      );
      return handle;
    });
    provider.catch(() => (provider = undefined));
    return provider;
  }

  const portal = (path: string) => new URL(path, s.PUBLIC_URL).href;

  return {
    passportMiddleware: [auth.initialize(), auth.session()],

    async session(req: Request, res: Response) {
      const p = req.principal;
      const signedIn = !!p && p.via === 'session';
      const body: SessionInfo = {
        signedIn,
        person: signedIn ? { id: p.personId, name: p.name, email: p.email, institutionId: p.institutionId, roles: p.roles } : null,
        // Only a signed-in session can write; anonymous visitors get no token, and so no stored session.
        csrfToken: signedIn ? generateCsrfToken(req) : '',
        mailInboxUrl: signedIn && p.roles.includes('admin') ? (s.MAIL_INBOX_URL || null) : null,
      };
      res.set('Cache-Control', 'no-store').json(body);
    },

    async login(req: Request, res: Response, next: NextFunction) {
      const redirect = SafeRedirect.safeParse(req.query.redirect);
      try {
        await ready();
      } catch (e) {
        logger.warn({ err: e }, 'identity provider not reachable');
        return res.redirect(portal('/sign-in?error=provider_unreachable'));
      }
      (req.session as unknown as { returnTo?: string }).returnTo = redirect.success ? redirect.data : '/';
      auth.authenticate('oidc')(req, res, next);
    },

    async callback(req: Request, res: Response, next: NextFunction) {
      try {
        await ready();
      } catch {
        return res.redirect(portal('/sign-in?error=provider_unreachable'));
      }
      const returnTo = (req.session as unknown as { returnTo?: string }).returnTo ?? '/';
      auth.authenticate('oidc', (err: unknown, user: SessionUser | false, info?: { kind?: string; email?: string; message?: string }) => {
        if (err) {
          logger.warn({ err }, 'sign-in callback failed');
          return res.redirect(portal('/sign-in?error=signin_failed'));
        }
        if (!user) {
          if (info?.kind === 'not-a-member') return res.redirect(portal(`/not-a-member?email=${encodeURIComponent(info.email ?? '')}`));
          if (info?.kind === 'inactive') return res.redirect(portal('/sign-in?error=account_inactive'));
          return res.redirect(portal('/sign-in?error=signin_failed'));
        }
        // passport regenerates the session at log-in, so a fixed session id is never reused.
        req.logIn(user, (loginErr) => {
          if (loginErr) return next(loginErr);
          res.redirect(portal(returnTo));
        });
      })(req, res, next);
    },

    async logout(req: Request, res: Response, next: NextFunction) {
      const user = req.user as SessionUser | undefined;
      const ctx = contextOf(req);
      const handle = await ready().catch(() => undefined);
      await signIn.signOut(ctx);
      req.logout((err) => {
        if (err) return next(err);
        req.session.destroy(() => {
          res.clearCookie(SESSION_COOKIE, { path: '/' });
          const body: SignOutResult = { signedOut: true, endSessionUrl: handle?.endSessionUrl(user?.idToken, portal('/signed-out')) ?? null };
          res.json(body);
        });
      });
    },
  };
}
export type AuthController = ReturnType<typeof createAuthController>;

/** Distinct from the provider's cookies: cookies on 127.0.0.1 are shared across ports. */
export const SESSION_COOKIE = 'localis.sid';
