import type { NextFunction, Request, RequestHandler, Response } from 'express';
import { verifyRequestOrigin } from 'oslo/request';
import { AppError } from '../errors';
import type { AuthLucia, Role } from './lucia';

export interface SignedInUser {
  id: string;
  email: string;
  name: string;
  role: Role;
}

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

/** Refuses state-changing requests whose Origin is not this host (cookie sessions need it against CSRF). */
export const originCheck: RequestHandler = (req, _res, next) => {
  if (SAFE_METHODS.has(req.method)) return next();
  const origin = req.headers.origin;
  const host = req.headers.host;
  if (!origin || !host || !verifyRequestOrigin(origin, [host])) {
    return next(new AppError(403, 'origin_rejected', 'This request did not come from a Voltfall page.'));
  }
  next();
};

/**
 * The Cookie header without pairs whose percent-escapes are malformed: the session library's parser
 * throws on one, and another site's stray cookie on this host must not turn every request into a 500.
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

/** Reads the session cookie; sets req.user for active users and refreshes the cookie when lucia asks. */
export function sessionMiddleware(lucia: AuthLucia): RequestHandler {
  return async (req, res, next) => {
    try {
      const sessionId = lucia.readSessionCookie(decodableCookies(req.headers.cookie ?? ''));
      if (!sessionId) return next();
      const { session, user } = await lucia.validateSession(sessionId);
      if (!session || !user || user.disabled) {
        if (session) await lucia.invalidateSession(session.id);
        res.appendHeader('Set-Cookie', lucia.createBlankSessionCookie().serialize());
        return next();
      }
      if (session.fresh) res.appendHeader('Set-Cookie', lucia.createSessionCookie(session.id).serialize());
      req.user = { id: user.id, email: user.email, name: user.name, role: user.role };
      req.sessionId = session.id;
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
