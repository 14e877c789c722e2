import { randomUUID } from 'node:crypto';
import type { RequestHandler } from 'express';
import { logger } from '../lib/logger.js';

export const requestId: RequestHandler = (req, res, next) => {
  const id = randomUUID();
  res.locals.requestId = id;
  res.setHeader('X-Request-Id', id);
  const started = process.hrtime.bigint();
  res.on('finish', () => {
    if (!req.path.startsWith('/api')) return;
    const ms = Number(process.hrtime.bigint() - started) / 1e6;
    logger.debug('request', { id, method: req.method, path: req.path, status: res.statusCode, ms: Math.round(ms * 10) / 10 });
  });
  next();
};
