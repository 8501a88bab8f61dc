import type { Request, RequestHandler, Response } from 'express';
import { QueryTypes } from 'sequelize';
import { User } from '../db/associations';
import { ForbiddenError, UnauthenticatedError } from '../errors';
import { REFRESH_AFTER_SECONDS, type SessionKeys, type SessionClaims } from '../lib/session';
import type { Role } from '../../shared/schemas/auth.schema';
import type { SessionCache } from '../lib/session-cache';

export type CookieSettings = { name: string; secure: boolean };

export function cookieSettings(secure: boolean): CookieSettings {
  // The __Host- prefix needs Secure, so it is used only when served over HTTPS (RELIABILITY.md).
  return { name: secure ? '__Host-sowright' : 'sowright_session', secure };
}

export function setSessionCookie(
  res: Response,
  cookie: CookieSettings,
  token: string,
  claims: { exp: number },
) {
  res.cookie(cookie.name, token, {
    httpOnly: true,
    secure: cookie.secure,
    sameSite: 'strict',
    path: '/',
    expires: new Date(claims.exp * 1000),
  });
}

export function clearSessionCookie(res: Response, cookie: CookieSettings) {
  res.clearCookie(cookie.name, { httpOnly: true, secure: cookie.secure, sameSite: 'strict', path: '/' });
}

export type SessionRow = {
  id: string;
  workspace_id: string;
  role: Role;
  status: string;
  token_version: number;
  grower_id: string | null;
  consultant_growers: string[];
};

/** One round trip: the person, and for a consultant the growers they read. */
export async function loadSessionUser(id: string): Promise<SessionRow | null> {
  const rows = await User.sequelize!.query<SessionRow>(
    `SELECT u.id, u.workspace_id, u.role, u.status, u.token_version, u.grower_id,
            coalesce(array(SELECT cg.grower_id::text FROM consultant_growers cg WHERE cg.user_id = u.id), '{}') AS consultant_growers
       FROM users u WHERE u.id = $1`,
    { bind: [id], type: QueryTypes.SELECT },
  );
  return rows[0] ?? null;
}

/**
 * Reads the session cookie, verifies the token and checks the person on every request: a changed token
 * version (sign-out, password change, role change, disabling) ends the session at once. The person comes
 * from `sessions` (kept in memory, dropped when the database says they changed) or from the database.
 */
export function authenticate(
  keys: SessionKeys,
  cookie: CookieSettings,
  sessions?: SessionCache<SessionRow>,
): RequestHandler {
  return async (req: Request, res: Response, next) => {
    try {
      const token = req.cookies?.[cookie.name];
      if (typeof token !== 'string' || !token) return next();
      const claims = keys.verify(token);
      if (!claims) {
        clearSessionCookie(res, cookie);
        return next();
      }
      const row = sessions ? await sessions.get(claims.sub) : await loadSessionUser(claims.sub);
      if (
        !row ||
        row.workspace_id !== claims.ws ||
        row.token_version !== claims.tv ||
        row.status !== 'active'
      ) {
        clearSessionCookie(res, cookie);
        return next();
      }
      req.actor = {
        userId: row.id,
        workspaceId: row.workspace_id,
        role: row.role,
        growerScope:
          row.role === 'farmer'
            ? row.grower_id
              ? [row.grower_id]
              : []
            : row.role === 'consultant'
              ? row.consultant_growers
              : null,
      };
      refreshIfOld(res, keys, cookie, claims);
      next();
    } catch (err) {
      next(err);
    }
  };
}

function refreshIfOld(res: Response, keys: SessionKeys, cookie: CookieSettings, claims: SessionClaims) {
  const now = Math.floor(Date.now() / 1000);
  if (now - claims.iat < REFRESH_AFTER_SECONDS) return;
  const token = keys.sign({ sub: claims.sub, ws: claims.ws, tv: claims.tv, at: claims.at }, now);
  const fresh = keys.verify(token);
  if (fresh) setSessionCookie(res, cookie, token, fresh);
}

export const requireSignIn: RequestHandler = (req, _res, next) => {
  next(req.actor ? undefined : new UnauthenticatedError());
};

/** Deny by default: only the listed roles pass. */
export function requireRole(...roles: Role[]): RequestHandler {
  return (req, _res, next) => {
    if (!req.actor) return next(new UnauthenticatedError());
    if (!roles.includes(req.actor.role)) return next(new ForbiddenError());
    next();
  };
}

/** State-changing requests need our own header (and a same-site Origin when one is sent). */
export const csrfGuard: RequestHandler = (req, res, next) => {
  if (['GET', 'HEAD', 'OPTIONS'].includes(req.method)) return next();
  const origin = req.get('origin');
  if (origin) {
    let host: string | null = null;
    try {
      host = new URL(origin).host;
    } catch {
      host = null;
    }
    if (host !== req.get('host')) {
      res.status(403).json({ error: { code: 'csrf', message: 'Cross-site request refused' } });
      return;
    }
  }
  if (req.get('x-sowright-request') !== '1') {
    res.status(403).json({ error: { code: 'csrf', message: 'Missing the X-Sowright-Request header' } });
    return;
  }
  next();
};
