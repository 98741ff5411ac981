/**
 * Errors in the shape Stripe's API answers with (`{ error: { type, code, message, param } }`);
 * the SDK picks its error class from the status and `type` (401 → authentication, 402 → card,
 * 400/404 → invalid request, `idempotency_error` → idempotency).
 */
export interface StripeErrorDetails {
  code?: string;
  param?: string;
  decline_code?: string;
  /** Extra fields Stripe adds to some errors (the payment intent of a declined payment). */
  [field: string]: unknown;
}

export class StripeFakeError extends Error {
  constructor(
    readonly status: number,
    readonly type: 'invalid_request_error' | 'card_error' | 'idempotency_error' | 'api_error',
    message: string,
    readonly details: StripeErrorDetails = {},
  ) {
    super(message);
  }

  toBody(): { error: Record<string, unknown> } {
    return { error: { type: this.type, message: this.message, ...this.details } };
  }
}

export function invalidRequest(message: string, details: StripeErrorDetails = {}): StripeFakeError {
  return new StripeFakeError(400, 'invalid_request_error', message, details);
}

/** "No such invoice: 'in_…'", as Stripe names missing objects. */
export function noSuch(kind: string, id: string, param?: string): StripeFakeError {
  return new StripeFakeError(404, 'invalid_request_error', `No such ${kind}: '${id}'`, { code: 'resource_missing', ...(param ? { param } : {}) });
}

export function authenticationError(message: string): StripeFakeError {
  return new StripeFakeError(401, 'invalid_request_error', message);
}
