import type { NextFunction, Request, Response } from 'express';
import { invalidRequest, StripeFakeError } from './stripe-errors';

export interface StoredResponse {
  fingerprint: string;
  endpoint: string;
  status: number;
  body: string;
}

/** The same parameters in any key order give the same text. */
function canonical(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonical).join(',')}]`;
  if (value && typeof value === 'object') {
    const entries = Object.entries(value).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonical(v)}`).join(',')}}`;
  }
  return JSON.stringify(value ?? null);
}

/** Stripe saves no result for requests whose parameters failed validation: they may be corrected. */
function failedValidation(body: unknown): boolean {
  const code = (body as { error?: { code?: unknown } } | null)?.error?.code;
  return typeof code === 'string' && code.startsWith('parameter_');
}

/**
 * Stripe's idempotent requests: a POST repeated with its `Idempotency-Key` gets the stored answer
 * (status and body, with `Idempotent-Replayed: true`) and changes nothing; the key with other
 * parameters or on another endpoint is a 400 `idempotency_error`. Answers of 5xx and parameter
 * errors are not stored, so a retry runs again. Handlers here finish synchronously, so no two requests with one key
 * can overlap (Stripe's 409 for that case is not needed).
 */
export class IdempotencyStore {
  private responses = new Map<string, StoredResponse>();

  reset(): void {
    this.responses.clear();
  }

  /** Every stored answer with its key, oldest first (for the data file). */
  snapshot(): Array<StoredResponse & { key: string }> {
    return [...this.responses].map(([key, stored]) => ({ key, ...stored }));
  }

  restore(saved: Array<StoredResponse & { key: string }>): void {
    this.responses = new Map(saved.map(({ key, ...stored }) => [key, stored]));
  }

  middleware() {
    return (req: Request, res: Response, next: NextFunction): void => {
      const key = req.get('Idempotency-Key');
      if (req.method !== 'POST' || key === undefined) return next();
      if (key.length > 255) throw invalidRequest('Idempotency keys can be at most 255 characters.', { param: 'Idempotency-Key' });
      const endpoint = `${req.method} ${req.path}`;
      const fingerprint = canonical(req.body ?? {});
      const stored = this.responses.get(key);
      if (stored) {
        if (stored.endpoint !== endpoint) {
          throw new StripeFakeError(400, 'idempotency_error', `Keys for idempotent requests can only be used for the same endpoint they were first used for ('${stored.endpoint}'). Try using a key other than '${key}' if you meant to execute a different request.`);
        }
        if (stored.fingerprint !== fingerprint) {
          throw new StripeFakeError(400, 'idempotency_error', `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${key}' if you meant to execute a different request.`);
        }
        res.status(stored.status).set('Idempotent-Replayed', 'true').type('application/json').send(stored.body);
        return;
      }
      const send = res.json.bind(res);
      res.json = (body: unknown) => {
        if (res.statusCode < 500 && !failedValidation(body)) this.responses.set(key, { fingerprint, endpoint, status: res.statusCode, body: JSON.stringify(body) });
        return send(body);
      };
      next();
    };
  }
}
