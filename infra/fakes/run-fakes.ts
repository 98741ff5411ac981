import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { loadSettings } from '@localis/shared';
import { startOidcFake } from './oidc/oidc-fake';
import { startS3Fake } from './s3/s3-fake';
import { startMailFake } from './mail/mail-fake';
import { startStripeFake } from './stripe/stripe-fake';

/**
 * Runs the local stand-ins for the hosted services, each a real server on loopback:
 * identity provider (OIDC), object store (S3), mail (SMTP + inbox) and payments (Stripe API,
 * hosted payment pages, webhooks to the app).
 */
const s = loadSettings(process.env);
const closers: Array<() => Promise<void>> = [];

async function main() {
  const oidc = await startOidcFake({
    issuer: s.OIDC_ISSUER,
    host: '127.0.0.1',
    port: s.OIDC_PORT,
    clientId: s.OIDC_CLIENT_ID,
    clientSecret: s.OIDC_CLIENT_SECRET,
    postLogoutRedirectUris: [`${s.PUBLIC_URL}/signed-out`],
    openDomain: s.LOCALIS_PROFILE === 'test' ? 'test.example' : undefined,
  });
  closers.push(oidc.close);
  const s3 = await startS3Fake({ host: '127.0.0.1', port: s.S3_PORT, directory: join(s.DATA_DIR, 's3'), buckets: [s.S3_BUCKET], corsOrigins: [new URL(s.PUBLIC_URL).origin] });
  closers.push(s3.close);
  const mail = await startMailFake({ host: s.SMTP_HOST, smtpPort: s.SMTP_PORT, inboxPort: s.MAIL_INBOX_PORT });
  closers.push(mail.close);
  const stripe = await startPaymentsFake();
  console.log(
    `fakes ready: oidc ${s.OIDC_ISSUER}, s3 ${s.S3_ENDPOINT}, smtp ${s.SMTP_HOST}:${s.SMTP_PORT} (inbox http://${s.SMTP_HOST}:${s.MAIL_INBOX_PORT}), ` +
      (stripe ? `stripe ${stripe.url} (webhooks to ${stripe.webhookUrl})` : `stripe not started (STRIPE_API_URL is ${s.STRIPE_API_URL})`),
  );
}

/** The Stripe fake, unless STRIPE_API_URL points the app at a Stripe elsewhere (its test mode). */
async function startPaymentsFake(): Promise<{ url: string; webhookUrl: string } | undefined> {
  const apiUrl = s.STRIPE_API_URL || `http://127.0.0.1:${s.STRIPE_PORT}`;
  if (!['127.0.0.1', 'localhost', '[::1]'].includes(new URL(apiUrl).hostname)) return undefined;
  const webhookUrl = `${s.PUBLIC_URL.replace(/\/+$/, '')}/api/v1/webhooks/stripe`;
  // The app's database outlives restarts; the Stripe ids it holds must too, as s3 keeps its objects.
  const dataDir = join(s.DATA_DIR, 'stripe');
  mkdirSync(dataDir, { recursive: true });
  const stripe = await startStripeFake({
    host: '127.0.0.1',
    port: s.STRIPE_PORT,
    secretKey: s.STRIPE_SECRET_KEY,
    webhookUrl,
    webhookSecret: s.STRIPE_WEBHOOK_SECRET,
    publicUrl: apiUrl,
    dataFile: join(dataDir, 'state.json'),
  });
  closers.push(stripe.close);
  return { url: stripe.url, webhookUrl };
}

async function shutdown() {
  for (const close of closers.reverse()) await close().catch(() => undefined);
  process.exit(0);
}
process.on('SIGTERM', shutdown);
process.on('SIGINT', shutdown);

main().catch((e) => {
  console.error('fakes failed to start:', e);
  process.exit(1);
});
