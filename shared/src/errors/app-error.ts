import { z } from 'zod';

/** Every error code the API may answer with, and the HTTP status it carries. */
export const ERROR_STATUS = {
  malformed: 400,
  not_signed_in: 401,
  token_invalid: 401,
  forbidden: 403,
  csrf_invalid: 403,
  not_found: 404,
  conflict: 409,
  too_large: 413,
  invalid: 422,
  rate_limited: 429,
  internal: 500,
  unavailable: 503,
} as const;

export type ErrorCode = keyof typeof ERROR_STATUS;

/** One issue of a failed validation: where (a zod path) and what is wrong, in words. */
export const ErrorDetail = z.object({
  path: z.array(z.union([z.string(), z.number()])),
  message: z.string(),
});
export type ErrorDetail = z.infer<typeof ErrorDetail>;

/** The one error shape every endpoint answers with. */
export const ErrorBody = z
  .object({
    error: z.object({
      code: z.enum(Object.keys(ERROR_STATUS) as [ErrorCode, ...ErrorCode[]]),
      message: z.string(),
      details: z.array(ErrorDetail).optional(),
    }),
  })
  .meta({ id: 'ErrorBody' });
export type ErrorBody = z.infer<typeof ErrorBody>;

export class AppError extends Error {
  readonly code: ErrorCode;
  readonly status: number;
  readonly details?: ErrorDetail[];

  constructor(code: ErrorCode, message: string, details?: ErrorDetail[]) {
    super(message);
    this.name = 'AppError';
    this.code = code;
    this.status = ERROR_STATUS[code];
    this.details = details;
  }

  toBody(): ErrorBody {
    return { error: { code: this.code, message: this.message, ...(this.details ? { details: this.details } : {}) } };
  }
}

export function isAppError(value: unknown): value is AppError {
  return value instanceof AppError;
}
