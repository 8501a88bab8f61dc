import type { Request, RequestHandler, Response } from 'express';
import { ConsultantGrower, User } from '../db/associations';
import { ForbiddenError, UnauthenticatedError } from '../errors';
import { REFRESH_AFTER_SECONDS, type SessionKeys, type SessionClaims } from '../lib/session';
import type { Actor } from '../types';
import type { Role } from '../../shared/schemas/auth.schema';

export type CookieSettings = { name: string; secure: boolean };

export function cookieSettings(secure: boolean): CookieSettings {
  // The __Host- prefix needs Secure, so it is used only when served over HTTPS (RELIABILITY.md).
  return { name: secure ? '__Host-sowright' : 'sowright_session', secure };
}

export function setSessionCookie(res: Response, cookie: CookieSettings, token: string, claims: { exp: number }) {
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

export async function actorFor(user: User): Promise<Actor> {
  let growerScope: string[] | null = null;
  if (user.role === 'farmer') growerScope = user.growerId ? [user.growerId] : [];
  if (user.role === 'consultant') {
    const rows = await ConsultantGrower.findAll({ where: { userId: user.id }, attributes: ['growerId'] });
    growerScope = rows.map((r) => r.growerId);
  }
  return { userId: user.id, workspaceId: user.workspaceId, role: user.role, growerScope };
}

/**
 * Reads the session cookie, verifies the token and loads the user on every request: a changed token
 * version (sign-out, password change, role change, disabling) ends the session at once.
 */
export function authenticate(keys: SessionKeys, cookie: CookieSettings): RequestHandler {
  return async (req: Request, res: Response, next) => {
    try {
      const token = req.cookies?.[cookie.name];
      if (typeof token !== 'string' || !token) return next();
      const claims = keys.verify(token);
      if (!claims) {
        clearSessionCookie(res, cookie);
        return next();
      }
      const user = await User.findByPk(claims.sub);
      if (!user || user.workspaceId !== claims.ws || user.tokenVersion !== claims.tv || user.status !== 'active') {
        clearSessionCookie(res, cookie);
        return next();
      }
      req.actor = await actorFor(user);
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
