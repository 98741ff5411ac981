import Stripe from 'stripe';
import type { Settings } from '@localis/shared';

/**
 * The Stripe SDK in test mode, pointed at STRIPE_API_URL (locally our fake on STRIPE_PORT). No SDK
 * retries: our callers retry with the same idempotency keys, so a retried call never acts twice.
 */
export function createStripeClient(s: Pick<Settings, 'STRIPE_API_URL' | 'STRIPE_PORT' | 'STRIPE_SECRET_KEY'>): Stripe {
  const url = new URL(s.STRIPE_API_URL || `http://127.0.0.1:${s.STRIPE_PORT}`);
  return new Stripe(s.STRIPE_SECRET_KEY, {
    host: url.hostname,
    port: Number(url.port || (url.protocol === 'https:' ? 443 : 80)),
    protocol: url.protocol === 'https:' ? 'https' : 'http',
    maxNetworkRetries: 0,
    telemetry: false,
  });
}
