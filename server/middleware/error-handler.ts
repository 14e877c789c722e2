import type { ErrorRequestHandler, RequestHandler } from 'express';
import { AppError } from '../lib/errors.js';
import { logger } from '../lib/logger.js';
import { StorageUnavailableError } from '../lib/object-storage.js';

export const notFoundHandler: RequestHandler = (req) => {
  throw new AppError('NOT_FOUND', 404, `No route for ${req.method} ${req.path}`);
};

const PG_UNIQUE_VIOLATION = '23505';
const PG_CHECK_VIOLATION = '23514';
const PG_FK_VIOLATION = '23503';

/** The one place errors become responses: `{ error: { code, message, fields? } }`, never a stack trace. */
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  const requestId = res.locals.requestId as string | undefined;
  let appError: AppError;
  if (err instanceof AppError) {
    appError = err;
  } else if (err instanceof StorageUnavailableError) {
    logger.error('object storage unavailable', { requestId, method: req.method, path: req.path, err: String(err) });
    appError = new AppError('SERVICE_UNAVAILABLE', 503, 'File storage is unavailable right now; try again in a moment');
  } else if (err?.type === 'entity.too.large') {
    appError = new AppError('PAYLOAD_TOO_LARGE', 413, 'The request body is too large');
  } else if (err?.type === 'entity.parse.failed') {
    appError = new AppError('VALIDATION_FAILED', 400, 'The request body is not valid JSON');
  } else if (err?.code === 'EBADCSRFTOKEN' || err?.code === 'ERR_BAD_CSRF_TOKEN' || err?.message === 'invalid csrf token') {
    appError = new AppError('CSRF_INVALID', 403, 'Missing or invalid CSRF token; reload the page');
  } else if (err?.cause?.code === PG_UNIQUE_VIOLATION || err?.code === PG_UNIQUE_VIOLATION) {
    appError = AppError.conflict('A record with the same name or address already exists');
  } else if (err?.cause?.code === PG_CHECK_VIOLATION || err?.code === PG_CHECK_VIOLATION) {
    appError = AppError.unprocessable(`A value breaks a rule: ${err.cause?.constraint ?? err.constraint ?? 'check'}`);
  } else if (err?.cause?.code === PG_FK_VIOLATION || err?.code === PG_FK_VIOLATION) {
    appError = AppError.unprocessable('A referenced record does not exist');
  } else {
    logger.error('unhandled error', { requestId, method: req.method, path: req.path, err: String(err?.stack ?? err) });
    appError = new AppError('INTERNAL', 500, `Something went wrong on our side (request ${requestId ?? 'unknown'})`);
  }
  res.status(appError.status).json({
    error: { code: appError.code, message: appError.message, ...(appError.fields ? { fields: appError.fields } : {}) },
  });
};
