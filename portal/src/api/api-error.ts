import { ERROR_STATUS, type ErrorCode, type ErrorDetail } from '@localis/shared';

/** What a failed API call throws: the server's own code, message and per-field details. */
export class ApiError extends Error {
  readonly status: number;
  readonly code: ErrorCode;
  readonly details: ErrorDetail[];

  constructor(status: number, code: ErrorCode, message: string, details: ErrorDetail[] = []) {
    super(message);
    this.name = 'ApiError';
    this.status = status;
    this.code = code;
    this.details = details;
  }
}

export function isApiError(value: unknown): value is ApiError {
  return value instanceof ApiError;
}

const CODES = Object.keys(ERROR_STATUS) as ErrorCode[];

export function isErrorCode(value: unknown): value is ErrorCode {
  return typeof value === 'string' && (CODES as string[]).includes(value);
}

/** The code to use when the body is not ours (a proxy's page, an empty 502): guessed from the status. */
export function codeForStatus(status: number): ErrorCode {
  const exact = CODES.find((code) => ERROR_STATUS[code] === status);
  if (exact) return exact;
  if (status >= 500) return status === 502 || status === 504 ? 'unavailable' : 'internal';
  return 'malformed';
}
