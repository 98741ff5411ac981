import type { NextFunction, Request, Response } from 'express';
import type { Logger } from 'pino';
import { AppError, errors, isAppError } from '@localis/shared';

interface HttpishError {
  type?: string;
  status?: number;
  statusCode?: number;
  code?: string;
  limit?: number;
}

/** Translate anything thrown into the one error shape; unknown errors are logged, not shown. */
export function toAppError(err: unknown, bodyLimit: string): AppError {
  if (isAppError(err)) return err;
  const e = err as HttpishError;
  if (e?.type === 'entity.parse.failed') return errors.malformed();
  if (e?.type === 'entity.too.large') return errors.tooLarge(bodyLimit);
  if (e?.type === 'encoding.unsupported' || e?.type === 'charset.unsupported') return errors.malformed('The request body uses an encoding we do not accept; send UTF-8 JSON.');
  if (e?.code === 'EBADCSRFTOKEN') return errors.csrfInvalid();
  const status = e?.status ?? e?.statusCode;
  if (status === 400) return errors.malformed();
  return errors.internal();
}

export function errorHandler(logger: Logger, bodyLimit: string) {
  // Express recognises an error handler by its four parameters.
  return (err: unknown, req: Request, res: Response, _next: NextFunction) => {
    const appError = toAppError(err, bodyLimit);
    if (appError.code === 'internal') logger.error({ err, method: req.method, url: req.originalUrl }, 'unhandled error');
    if (res.headersSent) return;
    res.status(appError.status).json(appError.toBody());
  };
}

export function notFoundHandler(req: Request, _res: Response, next: NextFunction) {
  next(errors.noRoute(req.method, req.originalUrl.split('?')[0]));
}
