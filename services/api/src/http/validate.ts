import type { NextFunction, Request, Response } from 'express';
import type { z } from 'zod';
import { errors } from '@localis/shared';

/** The one validation middleware: parses params, query and body with the route's shared schemas. */
export function validate(schemas: { params?: z.ZodType; query?: z.ZodType; body?: z.ZodType } = {}) {
  return (req: Request, _res: Response, next: NextFunction) => {
    const valid: Request['valid'] = { params: req.params, query: req.query, body: req.body };
    for (const part of ['params', 'query', 'body'] as const) {
      const schema = schemas[part];
      if (!schema) continue;
      const parsed = schema.safeParse(part === 'body' ? (req.body ?? {}) : req[part]);
      if (!parsed.success) {
        return next(errors.fromZod(parsed.error, part === 'body' ? 'request body' : part === 'query' ? 'query string' : 'address'));
      }
      valid[part] = parsed.data;
    }
    req.valid = valid;
    next();
  };
}
