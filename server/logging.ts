import type { RequestHandler } from 'express';
import { pino, type DestinationStream, type Logger } from 'pino';
import type { Config } from './config';

declare module 'http' {
  interface IncomingMessage {
    log: Logger;
  }
}

// Names of fields that hold secrets, wherever they sit in a logged object (pino's redact needs a path per depth).
const SECRET_NAMES = [
  'password',
  'newPassword',
  'currentPassword',
  'password_hash',
  'passwordHash',
  'token',
  'resetToken',
  'inviteToken',
  'token_hash',
  'sessionId',
  'cookie',
  'set-cookie',
  'authorization',
  'p12Password',
];
const REDACT_PATHS = SECRET_NAMES.flatMap((name) => {
  const key = /^[A-Za-z_$][\w$]*$/.test(name) ? `.${name}` : `["${name}"]`;
  return ['', '*', '*.*', '*.*.*'].map((depth) => `${depth}${key}`.replace(/^\./, ''));
});

/** The server's logger: secrets are censored in whatever is logged, as a second line behind logging no headers or bodies. */
export function createLogger(config: Pick<Config, 'logLevel'>, destination?: DestinationStream): Logger {
  return pino({ level: config.logLevel, redact: { paths: REDACT_PATHS, censor: '[redacted]' } }, destination);
}

/**
 * The matched route's pattern under its mount point ("/api/revisions/:id/diff"). Express has restored
 * `baseUrl` by the time an error has been answered, so the mount point is read off the path instead:
 * the pattern stands for the path's last segments.
 */
function routePattern(path: string, pattern: unknown): string {
  if (typeof pattern !== 'string') return path;
  const parts = path.split('/');
  const tail = pattern.split('/').filter(Boolean).length;
  return `${parts.slice(0, parts.length - tail).join('/')}${pattern === '/' ? '' : pattern}` || '/';
}

/**
 * One line per API request with its method, route (the pattern, never the query string, which can
 * carry a one-time token), status, time and user id; no headers, no bodies.
 */
export function requestLog(log: Logger): RequestHandler {
  return (req, res, next) => {
    const started = process.hrtime.bigint();
    req.log = log;
    res.once('finish', () => {
      const route = routePattern(req.originalUrl.split('?')[0], req.route?.path);
      const ms = Number(process.hrtime.bigint() - started) / 1e6;
      const line = { method: req.method, route, status: res.statusCode, ms: Math.round(ms * 10) / 10, userId: req.user?.id ?? null };
      if (res.statusCode >= 500) log.error(line, 'request');
      else log.info(line, 'request');
    });
    next();
  };
}
