import pino from 'pino';

/** Structured JSON logs; its own module so nothing imports the app to log. */
export const logger = pino({
  level: process.env.LOG_LEVEL ?? (process.env.NODE_ENV === 'test' ? 'silent' : 'info'),
  base: { app: 'brackline' },
  redact: ['req.headers.cookie', 'req.headers.authorization', '*.password'],
});
