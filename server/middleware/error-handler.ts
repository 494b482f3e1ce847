import type { ErrorRequestHandler } from 'express';
import { AppError } from '../lib/errors';
import { logger } from '../lib/logger';

/** The one place that maps errors to HTTP: `{ error: { code, message, details? } }`. */
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  if (res.headersSent) return;
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
