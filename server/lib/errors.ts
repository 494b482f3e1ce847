/**
 * Typed errors; one error handler maps them to HTTP statuses and the JSON body
 * `{ error: { code, message, details? } }`. Messages say what is wrong and how to fix it.
 */
export class AppError extends Error {
  readonly status: number;
  readonly code: string;
  readonly details?: unknown;
  constructor(status: number, code: string, message: string, details?: unknown) {
    super(message);
    this.name = new.target.name;
    this.status = status;
    this.code = code;
    this.details = details;
  }
}

export class ValidationError extends AppError {
  constructor(message: string, details?: unknown) {
    super(400, 'invalid_request', message, details);
  }
}
export class UnauthenticatedError extends AppError {
  constructor(message = 'Sign in to use this. Your session may have expired: sign in again.') {
    super(401, 'unauthenticated', message);
  }
}
export class ForbiddenError extends AppError {
  constructor(message: string, code = 'forbidden') {
    super(403, code, message);
  }
}
export class NotFoundError extends AppError {
  constructor(message: string) {
    super(404, 'not_found', message);
  }
}
export class ConflictError extends AppError {
  constructor(message: string, details?: unknown) {
    super(409, 'conflict', message, details);
  }
}
export class PayloadTooLargeError extends AppError {
  constructor(message: string) {
    super(413, 'payload_too_large', message);
  }
}
export class UnsupportedMediaTypeError extends AppError {
  constructor(message: string) {
    super(415, 'unsupported_media_type', message);
  }
}
export class UnprocessableError extends AppError {
  constructor(message: string, details?: unknown) {
    super(422, 'unprocessable', message, details);
  }
}
export class TooManyRequestsError extends AppError {
  constructor(message: string) {
    super(429, 'too_many_requests', message);
  }
}
/** PostgreSQL is unreachable (restarting, failing over): the request may be repeated after Retry-After seconds. */
export class DatabaseUnavailableError extends AppError {
  readonly retryAfterSeconds: number;
  constructor(retryAfterSeconds = 5) {
    super(
      503,
      'database_unavailable',
      `The database is not reachable just now (it may be restarting). Try again in ${retryAfterSeconds} seconds.`,
    );
    this.retryAfterSeconds = retryAfterSeconds;
  }
}
