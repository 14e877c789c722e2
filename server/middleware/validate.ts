import type { RequestHandler } from 'express';
import type { z } from 'zod';
import { AppError, type FieldError } from '../lib/errors.js';

export function zodFields(error: z.ZodError): FieldError[] {
  return error.issues.map((i) => ({ field: i.path.join('.') || '(body)', message: i.message }));
}

type Parts = { body?: z.ZodType; query?: z.ZodType; params?: z.ZodType };

/**
 * Validates and replaces req.body / req.query / req.params with the parsed values.
 * A failure answers 400 naming every failing field; the handler never runs.
 */
export function validate(parts: Parts): RequestHandler {
  return (req, _res, next) => {
    for (const key of ['params', 'query', 'body'] as const) {
      const schema = parts[key];
      if (!schema) continue;
      const result = schema.safeParse(req[key] ?? {});
      if (!result.success) {
        const fields = zodFields(result.error);
        throw new AppError('VALIDATION_FAILED', 400, `Invalid ${key}: ${fields.map((f) => f.field).join(', ')}`, fields);
      }
      // Express 5 exposes req.query as a getter; define the parsed value over it.
      Object.defineProperty(req, key, { value: result.data, writable: true, configurable: true, enumerable: true });
    }
    next();
  };
}
