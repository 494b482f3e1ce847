import type { ErrorRequestHandler } from 'express';
import { isDatabaseUnavailable } from '../db/client';
import { AppError, DatabaseUnavailableError } from '../lib/errors';
import { logger } from '../lib/logger';

/** The one place that maps errors to HTTP: `{ error: { code, message, details? } }`. */
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  if (res.headersSent) return;
  // A database outage is not the client's fault nor a bug: 503 with Retry-After, so clients and load balancers wait and retry.
  if (err instanceof DatabaseUnavailableError || (!(err instanceof AppError) && isDatabaseUnavailable(err))) {
    const e = err instanceof DatabaseUnavailableError ? err : new DatabaseUnavailableError();
    logger.warn({ url: req.originalUrl }, 'database unavailable');
    res.set('Retry-After', String(e.retryAfterSeconds));
    res.status(503).json({ error: { code: e.code, message: e.message } });
    return;
  }
  if (err instanceof AppError) {
    res.status(err.status).json({ error: { code: err.code, message: err.message, ...(err.details ? { details: err.details } : {}) } });
    return;
  }
  // body-parser and multer errors carry a status and a type.
  const status = typeof err?.status === 'number' ? err.status : typeof err?.statusCode === 'number' ? err.statusCode : 500;
  if (status === 400 && err?.type === 'entity.parse.failed') {
    res.status(400).json({ error: { code: 'invalid_json', message: 'The request body is not valid JSON. Check quotes, commas and brackets.' } });
    return;
  }
  if (status === 413) {
    res.status(413).json({ error: { code: 'payload_too_large', message: 'The request body is too large. Send a smaller file or body.' } });
    return;
  }
  if (status === 415) {
    res.status(415).json({ error: { code: 'unsupported_media_type', message: 'This content type is not accepted here. Send JSON (application/json).' } });
    return;
  }
  if (status >= 400 && status < 500) {
    res.status(status).json({ error: { code: 'bad_request', message: String(err?.message ?? 'Bad request') } });
    return;
  }
  logger.error({ err, url: req.originalUrl }, 'unhandled error');
  res.status(500).json({ error: { code: 'internal', message: 'Something went wrong on the server. Try again; if it persists, tell the administrator.' } });
};
