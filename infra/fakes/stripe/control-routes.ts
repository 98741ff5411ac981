import express, { type NextFunction, type Request, type Response } from 'express';
import type { WebhookSender } from './webhook-sender';

const LOOPBACK = new Set(['127.0.0.1', '::1', '::ffff:127.0.0.1']);

function loopbackOnly(req: Request, res: Response, next: NextFunction): void {
  if (LOOPBACK.has(req.socket.remoteAddress ?? '')) return next();
  res.status(403).json({ error: { type: 'invalid_request_error', message: 'The fake control routes answer loopback callers only.' } });
}

/**
 * Test controls under `/_fake` (no API key, loopback only): the events with their delivery
 * attempts, resending one (to test duplicate deliveries), pointing webhooks elsewhere, and
 * forgetting everything.
 */
export function controlRouter(webhooks: WebhookSender, reset: () => Promise<void>, defaultWebhookUrl: string | undefined): express.Router {
  const router = express.Router();
  router.use(loopbackOnly);
  router.use(express.json({ limit: '10kb' }), express.urlencoded({ extended: false, limit: '10kb' }));

  router.get('/health', (_req, res) => {
    res.json({ ok: true });
  });

  /** Oldest first; `?type=invoice.paid` narrows the list. */
  router.get('/events', (req, res) => {
    const type = typeof req.query.type === 'string' ? req.query.type : undefined;
    const data = webhooks.list().filter((e) => type === undefined || e.type === type);
    res.json({ object: 'list', data, webhook_url: webhooks.url ?? null });
  });

  /** Delivers the event again (same id and body); answers with that delivery's first attempt. */
  router.post('/events/:id/resend', async (req, res) => {
    if (!webhooks.has(req.params.id)) {
      res.status(404).json({ error: { type: 'invalid_request_error', code: 'resource_missing', message: `No such event: '${req.params.id}'` } });
      return;
    }
    const delivery = webhooks.resend(req.params.id);
    if (!delivery) {
      res.status(409).json({ error: { type: 'invalid_request_error', message: 'No webhook URL is set; nothing to deliver to.' } });
      return;
    }
    res.json({ id: req.params.id, attempt: await delivery });
  });

  /** `{ "url": "http://127.0.0.1:PORT/…" }` sends later events there; an empty url stops sending. */
  router.post('/webhook-url', (req, res) => {
    const url = typeof req.body?.url === 'string' ? req.body.url.trim() : undefined;
    if (url === undefined || (url !== '' && !URL.canParse(url))) {
      res.status(400).json({ error: { type: 'invalid_request_error', message: 'Send { "url": "<absolute URL>" } (or an empty url to stop sending).' } });
      return;
    }
    webhooks.url = url || undefined;
    res.json({ webhook_url: webhooks.url ?? null });
  });

  /** Forgets every object, event and idempotency key (data file included); webhooks go to the configured URL again. */
  router.post('/reset', async (_req, res) => {
    await reset();
    webhooks.url = defaultWebhookUrl;
    res.json({ ok: true });
  });

  return router;
}
