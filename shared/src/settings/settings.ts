import { z } from 'zod';

const port = z.coerce.number().int().min(1).max(65535);
const loopbackHost = z
  .string()
  .default('127.0.0.1')
  .refine((h) => h === '127.0.0.1' || h === 'localhost' || h === '::1', {
    message: 'Localis binds its local services to loopback only (127.0.0.1)',
  });

/**
 * Every setting Localis reads, with its default. `.env.example` lists the same names; the
 * test profile overrides the ports and the data folder so tests run beside a running demo.
 */
export const Settings = z.object({
  LOCALIS_PROFILE: z.enum(['demo', 'test', 'dev']).default('demo'),
  DATA_DIR: z.string().default('.data'),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),

  APP_HOST: loopbackHost,
  APP_PORT: port.default(4100),
  PUBLIC_URL: z.url().default('http://127.0.0.1:4100'),

  PG_HOST: loopbackHost,
  PG_PORT: port.default(54329),
  PG_DATABASE: z.string().default('localis'),
  PG_USER: z.string().default('postgres'),
  PG_PASSWORD: z.string().default(''),

  REDIS_HOST: loopbackHost,
  REDIS_PORT: port.default(63790),

  S3_ENDPOINT: z.url().default('http://127.0.0.1:9100'),
  S3_PORT: port.default(9100),
  S3_REGION: z.string().default('us-east-1'),
  S3_ACCESS_KEY_ID: z.string().default('S3RVER'),
  S3_SECRET_ACCESS_KEY: z.string().default('S3RVER'),
  S3_BUCKET: z.string().default('localis-archives'),
  /** The Ed25519 key that signs the provenance log's tree heads (PEM); made on first use when missing. */
  PROVENANCE_KEY_FILE: z.string().default(''),

  OIDC_ISSUER: z.url().default('http://127.0.0.1:9400'),
  OIDC_PORT: port.default(9400),
  OIDC_CLIENT_ID: z.string().default('localis-portal'),
  OIDC_CLIENT_SECRET: z.string().min(16).default('local-oidc-client-secret-change-me'),

  SMTP_HOST: loopbackHost,
  SMTP_PORT: port.default(1025),
  MAIL_INBOX_PORT: port.default(1080),
  /** The local mail fake's inbox, linked for admins in the demo and test stacks; unset in production. */
  MAIL_INBOX_URL: z.union([z.url(), z.literal('')]).default(''),
  MAIL_FROM: z.string().default('Localis <office@coldwater-network.example>'),

  STRIPE_PORT: port.default(12111),
  /** The Stripe API (test mode); locally the fake on STRIPE_PORT. Unset: http://127.0.0.1:STRIPE_PORT. */
  STRIPE_API_URL: z.union([z.url(), z.literal('')]).default(''),
  STRIPE_SECRET_KEY: z.string().regex(/^sk_test_/, 'STRIPE_SECRET_KEY must be a test-mode key (sk_test_…)').default('sk_test_localis_fake_key'),
  /** Signs the webhook events Stripe sends to /api/v1/webhooks/stripe. */
  STRIPE_WEBHOOK_SECRET: z.string().regex(/^whsec_/, 'STRIPE_WEBHOOK_SECRET starts with whsec_').default('whsec_localis_fake_webhook_secret'),

  /** Who issues the partners' invoices, as the PDF and the e-mails name them. */
  BILLING_ISSUER_NAME: z.string().min(1).default('Consortium office'),
  /** Postal address lines, separated by "|". */
  BILLING_ISSUER_ADDRESS: z.string().default(''),
  BILLING_ISSUER_VAT_ID: z.string().default(''),

  SESSION_SECRET: z.string().min(16, 'SESSION_SECRET needs at least 16 characters').default('local-session-secret-change-me'),
  SESSION_HOURS: z.coerce.number().min(1).max(24 * 30).default(12),
  SIGNIN_RATE_PER_MINUTE: z.coerce.number().int().min(1).default(30),
  TOKEN_RATE_PER_MINUTE: z.coerce.number().int().min(1).default(600),
  FAILED_TOKEN_RATE_PER_MINUTE: z.coerce.number().int().min(1).default(20),
  /** `loopback` when a reverse proxy on this machine forwards requests (then X-Forwarded-For is believed). */
  TRUST_PROXY: z.enum(['none', 'loopback']).default('none'),
  BODY_LIMIT: z.string().default('1mb'),
});
export type Settings = z.infer<typeof Settings>;

/** Ports and folders of the test profile: apart from the demo's so both can run at once. */
export const TEST_PROFILE: Partial<Record<keyof Settings, string>> = {
  LOCALIS_PROFILE: 'test',
  DATA_DIR: '.data/test',
  LOG_LEVEL: 'warn',
  APP_PORT: '4200',
  PUBLIC_URL: 'http://127.0.0.1:4200',
  PG_PORT: '54339',
  PG_DATABASE: 'localis_test',
  REDIS_PORT: '63791',
  S3_ENDPOINT: 'http://127.0.0.1:9101',
  S3_PORT: '9101',
  OIDC_ISSUER: 'http://127.0.0.1:9401',
  OIDC_PORT: '9401',
  SMTP_PORT: '1026',
  MAIL_INBOX_PORT: '1081',
  STRIPE_PORT: '12112',
  // Every test signs in from 127.0.0.1; the limit itself is tested with its own counter.
  SIGNIN_RATE_PER_MINUTE: '1000',
};

export function loadSettings(env: Record<string, string | undefined>): Settings {
  const parsed = Settings.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Localis settings are not valid:\n${lines.join('\n')}`);
  }
  const s = parsed.data;
  // The shipped secrets are for loopback only; a public https address must bring its own.
  if (s.PUBLIC_URL.startsWith('https:')) {
    const defaults = Settings.parse({});
    const kept = (['SESSION_SECRET', 'OIDC_CLIENT_SECRET'] as const).filter((k) => s[k] === defaults[k]);
    if (kept.length) throw new Error(`Localis settings are not valid:\n  ${kept.join(', ')}: set your own secret when PUBLIC_URL is https`);
  }
  return s;
}

export function databaseUrl(s: Pick<Settings, 'PG_HOST' | 'PG_PORT' | 'PG_DATABASE' | 'PG_USER' | 'PG_PASSWORD'>): string {
  const auth = s.PG_PASSWORD ? `${encodeURIComponent(s.PG_USER)}:${encodeURIComponent(s.PG_PASSWORD)}` : encodeURIComponent(s.PG_USER);
  return `postgres://${auth}@${s.PG_HOST}:${s.PG_PORT}/${s.PG_DATABASE}`;
}
