import type { z } from 'zod';
import { AppError, type ErrorDetail } from './app-error';

/** Turn zod issues into the `details` of an error body, one message per field. */
export function detailsFromZod(error: z.ZodError): ErrorDetail[] {
  return error.issues.map((issue) => ({
    path: issue.path.map((p) => (typeof p === 'symbol' ? String(p) : p)),
    message: issue.message,
  }));
}

/** The one error factory: every error Localis raises on purpose comes from here. */
export const errors = {
  malformed: (message = 'The request could not be read. Check that the body is valid JSON.') =>
    new AppError('malformed', message),
  notSignedIn: (message = 'You are not signed in. Sign in and try again.') => new AppError('not_signed_in', message),
  tokenInvalid: (message: string) => new AppError('token_invalid', message),
  forbidden: (message = 'Your roles do not allow this.') => new AppError('forbidden', message),
  csrfInvalid: () =>
    new AppError(
      'csrf_invalid',
      'This request is missing its CSRF token or the token is stale. Reload the page and try again.',
    ),
  notFound: (what = 'The resource') => new AppError('not_found', `${what} was not found.`),
  noRoute: (method: string, path: string) =>
    new AppError('not_found', `There is no ${method} ${path} in the Localis API; /api/v1/openapi.json lists the routes.`),
  conflict: (message: string) => new AppError('conflict', message),
  tooLarge: (limit: string) => new AppError('too_large', `The request body is larger than the limit of ${limit}.`),
  invalid: (message: string, details?: ErrorDetail[]) => new AppError('invalid', message, details),
  fromZod: (error: z.ZodError, where = 'request') =>
    new AppError('invalid', `Some fields of the ${where} are not valid.`, detailsFromZod(error)),
  rateLimited: (retryAfterSeconds?: number) =>
    new AppError(
      'rate_limited',
      retryAfterSeconds
        ? `Too many requests. Wait ${retryAfterSeconds} s and try again.`
        : 'Too many requests. Wait a moment and try again.',
    ),
  internal: () => new AppError('internal', 'Something went wrong on our side. It has been logged; try again later.'),
  unavailable: (what: string) => new AppError('unavailable', `${what} is not reachable right now.`),
};
