import { existsSync } from 'node:fs';
import { join, resolve } from 'node:path';
import express, { type NextFunction, type Request, type Response } from 'express';
import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import helmet from 'helmet';
import pg from 'pg';
import { pinoHttp } from 'pino-http';
import type { Logger } from 'pino';
import type { Redis } from 'ioredis';
import { databaseUrl, type Settings } from '@localis/shared';
import type { Database } from './db';
import { createServices } from './services';
import { authenticate } from './http/authenticate';
import { authorize } from './http/authorize';
import { csrfProtection } from './http/csrf';
import { errorHandler, notFoundHandler } from './http/error-handler';
import { buildOpenApi } from './http/openapi';
import { createRateLimits } from './http/rate-limits';
import { API_PREFIX, fullPath, type RouteSpec } from './http/route-registry';
import { validate } from './http/validate';
import { createAuthController, SESSION_COOKIE } from './auth/auth.controller';
import { authRoutes } from './auth/auth.router';
import { auditRoutes } from './audit/audit.router';
import { groupsRoutes } from './groups/groups.router';
import { healthRoutes } from './health/health.router';
import { institutionsRoutes } from './institutions/institutions.router';
import { peopleRoutes } from './people/people.router';
import { profileRoutes } from './profile/profile.router';
import { tokensRoutes } from './tokens/tokens.router';
import { roundsRoutes } from './rounds/rounds.router';
import { campaignsRoutes } from './campaigns/campaigns.router';
import { reviewsRoutes } from './reviews/reviews.router';
import { ledgerRoutes } from './ledger/ledger.router';
import { runsRoutes } from './runs/runs.router';
import { archivesRoutes } from './archives/archives.router';
import { provenanceRoutes } from './provenance/provenance.router';
import { analysesRoutes } from './analyses/analyses.router';
import { spotChecksRoutes } from './spot-checks/spot-checks.router';
import { rateCardsRoutes } from './rate-cards/rate-cards.router';
import { invoicesRoutes } from './invoices/invoices.router';
import { notificationsRoutes } from './notifications/notifications.router';
import { idempotency } from './http/idempotency';

export const PORTAL_DIST = resolve(import.meta.dirname, '..', '..', '..', 'portal', 'dist');
const VERSION = '0.1.0';

export interface AppDeps {
  settings: Settings;
  db: Database;
  redis: Redis;
  logger: Logger;
}

/** Every route of the API, in one table: mounted, authorized, validated and documented from it. */
export function buildRoutes(deps: AppDeps, authController: ReturnType<typeof createAuthController>): RouteSpec[] {
  const services = createServices(deps.db, deps.settings);
  const routes: RouteSpec[] = [
    ...healthRoutes(deps.db, deps.redis),
    ...authRoutes(authController),
    ...profileRoutes(),
    ...tokensRoutes(services.tokens),
    ...peopleRoutes(services.people),
    ...institutionsRoutes(services.institutions),
    ...groupsRoutes(services.groups),
    ...auditRoutes(),
    ...roundsRoutes(services.rounds),
    ...campaignsRoutes(services.campaigns),
    ...reviewsRoutes(services.reviews),
    ...ledgerRoutes(services.ledger),
    ...runsRoutes(services.runs),
    ...notificationsRoutes(services.notifications),
    ...archivesRoutes(services.archives),
    ...provenanceRoutes(services.provenance, services.archives.verifiedIdBySha256),
    ...analysesRoutes(services.analyses),
    ...spotChecksRoutes(services.spotChecks),
    ...rateCardsRoutes(services.rateCards),
    ...invoicesRoutes(services.invoices, services.stripeWebhook),
  ];
  let openapi: unknown;
  routes.push({
    method: 'get', path: '/openapi.json', tag: 'meta', summary: 'This description of the API (OpenAPI 3.1)',
    access: { kind: 'public' }, responses: { 200: { description: 'OpenAPI document' } },
    handler: (_req, res) => res.json((openapi ??= buildOpenApi(routes, VERSION))),
  });
  return routes;
}

/** Room for MAX_IMPORT_BYTES of CSV with JSON escaping and the mapping around it. */
const IMPORT_BODY_LIMIT = '6mb';

export function createApp(deps: AppDeps) {
  const { settings: s, logger } = deps;
  const services = createServices(deps.db, s);
  const secure = s.PUBLIC_URL.startsWith('https:');
  const app = express();
  app.disable('x-powered-by');
  // Believe X-Forwarded-For only from a reverse proxy on this machine, and only when configured.
  app.set('trust proxy', s.TRUST_PROXY === 'loopback' ? 'loopback' : false);

  app.use(
    pinoHttp({
      logger,
      redact: { paths: ['req.headers.authorization', 'req.headers.cookie', 'req.headers["x-csrf-token"]', 'res.headers["set-cookie"]'], censor: '[removed]' },
      autoLogging: { ignore: (req) => req.url === '/healthz' || req.url === '/readyz' || !!req.url?.startsWith('/assets/') },
      customLogLevel: (_req, res, err) => (err || res.statusCode >= 500 ? 'error' : res.statusCode >= 400 ? 'info' : 'debug'),
    }),
  );
  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          defaultSrc: ["'self'"],
          // hash-wasm computes an upload's SHA-256 in WebAssembly.
          scriptSrc: ["'self'", "'wasm-unsafe-eval'"],
          // PrimeVue's styled mode writes its theme into <style> elements at run time.
          styleSrc: ["'self'", "'unsafe-inline'"],
          imgSrc: ["'self'", 'data:'],
          fontSrc: ["'self'", 'data:'],
          // Parts go straight to the object store through presigned URLs.
          connectSrc: ["'self'", new URL(s.S3_ENDPOINT).origin],
          objectSrc: ["'none'"],
          baseUri: ["'self'"],
          frameAncestors: ["'none'"],
          formAction: ["'self'", new URL(s.OIDC_ISSUER).origin],
          ...(secure ? { upgradeInsecureRequests: [] } : {}),
        },
      },
      strictTransportSecurity: secure,
      crossOriginEmbedderPolicy: false,
    }),
  );
  // Scheduler accounting exports are larger than any other body (MAX_IMPORT_BYTES of CSV in JSON).
  app.use(`${API_PREFIX}/campaigns/:id/runs/import`, express.json({ limit: IMPORT_BODY_LIMIT }));
  // Stripe signs the exact bytes it sends: its webhook keeps the raw body.
  app.use(`${API_PREFIX}/webhooks/stripe`, express.raw({ type: () => true, limit: '1mb' }));
  app.use(express.json({ limit: s.BODY_LIMIT }));

  const PgStore = connectPgSimple(session);
  const sessionPool = new pg.Pool({ connectionString: databaseUrl(s), max: 5 });
  app.use(
    session({
      name: SESSION_COOKIE,
      secret: s.SESSION_SECRET,
      store: new PgStore({ pool: sessionPool, tableName: 'sessions', createTableIfMissing: false, pruneSessionInterval: 15 * 60 }),
      resave: false,
      saveUninitialized: false,
      cookie: { httpOnly: true, sameSite: 'lax', secure, maxAge: s.SESSION_HOURS * 3600_000, path: '/' },
    }),
  );

  const authController = createAuthController(s, services.signIn, logger);
  const limits = createRateLimits(deps.redis, s);
  app.use(...authController.passportMiddleware);
  app.use(limits.failedTokens);
  app.use(authenticate(services.tokens));

  const routes = buildRoutes(deps, authController);
  for (const route of routes) {
    const chain = [
      ...(route.signIn ? [limits.signIn] : []),
      limits.token,
      authorize(route.access),
      ...(route.csrf === false ? [] : [csrfProtection]),
      validate(route.request),
      ...(route.idempotency === false ? [] : [idempotency]),
      route.handler as (req: Request, res: Response, next: NextFunction) => unknown,
    ];
    app[route.method](fullPath(route), ...chain);
  }
  app.use(API_PREFIX, notFoundHandler);

  // The built portal, with the single-page app's own routes answered by index.html.
  if (existsSync(join(PORTAL_DIST, 'index.html'))) {
    app.use(express.static(PORTAL_DIST, { index: false, maxAge: '1h', setHeaders: (res, path) => path.includes('/assets/') && res.setHeader('Cache-Control', 'public, max-age=31536000, immutable') }));
    app.get('/{*spa}', (_req, res) => {
      res.set('Cache-Control', 'no-cache').sendFile(join(PORTAL_DIST, 'index.html'));
    });
  }
  app.use(notFoundHandler);
  app.use(errorHandler(logger, s.BODY_LIMIT));

  return { app, routes, close: () => sessionPool.end() };
}
