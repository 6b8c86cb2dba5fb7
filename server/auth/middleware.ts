import type { NextFunction, Request, RequestHandler, Response } from 'express';
import { AppError } from '../errors';
import type { Role } from './roles';
import type { Sessions, SessionUser } from './sessions';

export type SignedInUser = SessionUser;

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace -- Express augments its Request this way.
  namespace Express {
    interface Request {
      user?: SignedInUser;
      sessionId?: string;
    }
  }
}

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * Refuses state-changing requests whose Origin is not this site, scheme included (cookie sessions need
 * it against CSRF; https://host and http://host are different sites). This site is the configured
 * public URL, or the scheme and host the request arrived with (the scheme as a trusted proxy reports it).
 */
export function originCheck(publicUrl: string | null): RequestHandler {
  const configured = publicUrl ? new URL(publicUrl).origin : null;
  return (req, _res, next) => {
    if (SAFE_METHODS.has(req.method)) return next();
    const origin = req.headers.origin?.toLowerCase();
    const own = req.host ? `${req.protocol}://${req.host}`.toLowerCase() : null;
    if (!origin || (origin !== own && origin !== configured)) {
      return next(new AppError(403, 'origin_rejected', 'This request did not come from a Voltfall page.'));
    }
    next();
  };
}

/**
 * The Cookie header without pairs whose percent-escapes are malformed: the cookie parser throws on one,
 * and another site's stray cookie on this host must not turn every request into a 500.
 */
function decodableCookies(header: string): string {
  return header
    .split(';')
    .filter((pair) => {
      try {
        decodeURIComponent(pair);
        return true;
      } catch {
        return false;
      }
    })
    .join(';');
}

/** Reads the session cookie; sets req.user while the session lives, and clears a cookie that no longer works. */
export function sessionMiddleware(sessions: Sessions): RequestHandler {
  return async (req, res, next) => {
    try {
      const token = sessions.readToken(decodableCookies(req.headers.cookie ?? ''));
      if (!token) return next();
      const valid = await sessions.validate(token);
      if (!valid) {
        res.appendHeader('Set-Cookie', sessions.blankCookie());
        return next();
      }
      req.user = valid.user;
      req.sessionId = valid.sessionId;
      next();
    } catch (err) {
      next(err);
    }
  };
}

export function currentUser(req: Request): SignedInUser {
  if (!req.user) throw new AppError(401, 'not_signed_in', 'Sign in to continue.');
  return req.user;
}

/** The role guard every route uses: `allow('engineer', 'admin')`, or `allow()` for any signed-in user. */
export function allow(...roles: Role[]): RequestHandler {
  return (req: Request, _res: Response, next: NextFunction) => {
    if (!req.user) return next(new AppError(401, 'not_signed_in', 'Sign in to continue.'));
    if (roles.length && !roles.includes(req.user.role)) {
      return next(new AppError(403, 'forbidden', `This needs the ${roles.join(' or ')} role.`));
    }
    next();
  };
}
