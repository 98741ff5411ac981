import Stripe from 'stripe';
import { newId, nowSeconds } from './ids';
import type { StripeObject } from './stripe-objects';

export interface StripeEvent {
  id: string;
  object: 'event';
  api_version: string;
  created: number;
  data: { object: StripeObject; previous_attributes?: Record<string, unknown> };
  livemode: false;
  pending_webhooks: number;
  /** The API request that caused the event; `id: null` for payments made on the hosted page. */
  request: { id: string | null; idempotency_key: string | null };
  type: string;
}

export interface DeliveryAttempt {
  /** 1 for the first delivery, 2 for the first resend, … */
  delivery: number;
  /** 1 for the first try of a delivery, then the retries. */
  attempt: number;
  at: string;
  /** The receiver's HTTP status; null when it could not be reached. */
  status: number | null;
  error: string | null;
  ms: number;
}

export interface EventDeliveryView {
  id: string;
  type: string;
  created: number;
  object_id: string;
  delivered: boolean;
  last_status: number | null;
  attempts: DeliveryAttempt[];
  event: StripeEvent;
}

/** An event with its delivery log, as the data file keeps it. */
export interface SavedEvent {
  event: StripeEvent;
  attempts: DeliveryAttempt[];
  /** How many deliveries were started (the first and every resend). */
  deliveries: number;
}

interface EventEntry extends SavedEvent {
  /** The exact bytes every delivery sends (and signs). */
  payload: string;
}

/** The payload text of an event; the same text again for an event read back from JSON. */
function payloadOf(event: StripeEvent): string {
  return JSON.stringify(event, null, 2);
}

export interface WebhookSenderOptions {
  /** Where events go; undefined records them without sending. */
  url: string | undefined;
  secret: string;
  /** The waits before each retry; their count is the number of retries. */
  retryDelaysMs: readonly number[];
  timeoutMs: number;
  /** Called when an event is recorded or an attempt is logged (the data file saves then). */
  onChange?: () => void;
}

/**
 * Records every event and posts it, signed like Stripe signs them, to the webhook URL in the
 * background, retrying with backoff on errors and non-2xx answers; redirects count as failures,
 * as they do at Stripe. Each attempt is signed afresh (a new timestamp), like Stripe's retries.
 */
export class WebhookSender {
  url: string | undefined;
  private entries = new Map<string, EventEntry>();
  private readonly waits = new Set<{ timer: NodeJS.Timeout; resolve: () => void }>();
  private readonly requests = new Set<AbortController>();
  private readonly running = new Set<Promise<unknown>>();
  /** Bumped by reset and close: deliveries of an older generation stop retrying. */
  private generation = 0;

  constructor(private readonly opts: WebhookSenderOptions) {
    this.url = opts.url;
  }

  publish(type: string, object: StripeObject, extra: { previous_attributes?: Record<string, unknown>; request?: StripeEvent['request'] } = {}): StripeEvent {
    const event: StripeEvent = {
      id: newId('evt'),
      object: 'event',
      api_version: Stripe.API_VERSION,
      created: nowSeconds(),
      // A snapshot: later changes to the object do not change the event.
      data: { object: structuredClone(object), ...(extra.previous_attributes ? { previous_attributes: extra.previous_attributes } : {}) },
      livemode: false,
      pending_webhooks: this.url ? 1 : 0,
      request: extra.request ?? { id: null, idempotency_key: null },
      type,
    };
    const entry: EventEntry = { event, payload: payloadOf(event), attempts: [], deliveries: 0 };
    this.entries.set(event.id, entry);
    this.opts.onChange?.();
    if (this.url) this.track(this.deliver(entry));
    return event;
  }

  /** Delivers a recorded event once more (same id, same body); resolves with its first attempt. */
  resend(eventId: string): Promise<DeliveryAttempt> | undefined {
    const entry = this.entries.get(eventId);
    if (!entry || !this.url) return undefined;
    return new Promise((resolve) => this.track(this.deliver(entry, resolve)));
  }

  has(eventId: string): boolean {
    return this.entries.has(eventId);
  }

  list(): EventDeliveryView[] {
    return [...this.entries.values()].map((e) => {
      const last = e.attempts.at(-1);
      return structuredClone({
        id: e.event.id,
        type: e.event.type,
        created: e.event.created,
        object_id: e.event.data.object.id,
        delivered: e.attempts.some((a) => a.status !== null && a.status >= 200 && a.status < 300),
        last_status: last ? last.status : null,
        attempts: e.attempts,
        event: e.event,
      });
    });
  }

  /** The live entries, not copies: serialize them at once. */
  snapshot(): SavedEvent[] {
    return [...this.entries.values()].map(({ event, attempts, deliveries }) => ({ event, attempts, deliveries }));
  }

  /**
   * Takes back the events of an earlier run, oldest first. Events that were never delivered are
   * not sent again on their own (the app was likely down with the fake, and a surprise burst of old
   * events would make tests flaky); `POST /_fake/events/:id/resend` delivers one by hand.
   */
  restore(saved: SavedEvent[]): void {
    this.reset();
    this.entries = new Map(saved.map((e) => [e.event.id, { ...e, payload: payloadOf(e.event) }]));
  }

  /** Forgets every event and stops pending retries. */
  reset(): void {
    this.stopAll();
    this.entries = new Map();
  }

  async close(): Promise<void> {
    this.stopAll();
    await Promise.allSettled([...this.running]);
  }

  private stopAll(): void {
    this.generation++;
    for (const w of this.waits) {
      clearTimeout(w.timer);
      w.resolve();
    }
    this.waits.clear();
    for (const c of this.requests) c.abort();
  }

  private track(p: Promise<unknown>): void {
    this.running.add(p);
    void p.finally(() => this.running.delete(p));
  }

  private async deliver(entry: EventEntry, onFirstAttempt?: (a: DeliveryAttempt) => void): Promise<void> {
    const generation = this.generation;
    const delivery = ++entry.deliveries;
    for (let attempt = 1; this.url; attempt++) {
      const result = await this.attempt(entry, this.url, delivery, attempt);
      if (attempt === 1) onFirstAttempt?.(result);
      if (generation !== this.generation) return;
      entry.attempts.push(result);
      this.opts.onChange?.();
      const ok = result.status !== null && result.status >= 200 && result.status < 300;
      if (ok || attempt > this.opts.retryDelaysMs.length) return;
      await this.wait(this.opts.retryDelaysMs[attempt - 1]);
      if (generation !== this.generation) return;
    }
  }

  private async attempt(entry: EventEntry, url: string, delivery: number, attempt: number): Promise<DeliveryAttempt> {
    const started = Date.now();
    const controller = new AbortController();
    const timer = setTimeout(() => controller.abort(), this.opts.timeoutMs);
    this.requests.add(controller);
    const at = new Date(started).toISOString();
    try {
      const signature = Stripe.webhooks.generateTestHeaderString({ payload: entry.payload, secret: this.opts.secret });
      const res = await fetch(url, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json; charset=utf-8', 'Stripe-Signature': signature, 'User-Agent': 'Localis-Stripe-Fake/1.0' },
        body: entry.payload,
        redirect: 'manual',
        signal: controller.signal,
      });
      await res.arrayBuffer().catch(() => undefined);
      return { delivery, attempt, at, status: res.status, error: null, ms: Date.now() - started };
    } catch (e) {
      const error = e instanceof Error ? (e.cause instanceof Error ? e.cause.message : e.message) : String(e);
      return { delivery, attempt, at, status: null, error, ms: Date.now() - started };
    } finally {
      clearTimeout(timer);
      this.requests.delete(controller);
    }
  }

  private wait(ms: number): Promise<void> {
    return new Promise((resolve) => {
      const w = {
        timer: setTimeout(() => {
          this.waits.delete(w);
          resolve();
        }, ms),
        resolve,
      };
      this.waits.add(w);
    });
  }
}
