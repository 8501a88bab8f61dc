import jwt from 'jsonwebtoken';
import { createSecretKey, type KeyObject } from 'node:crypto';

export const ISSUER = 'sowright';
export const AUDIENCE = 'sowright-web';
/** Idle lifetime: a session unused this long ends (OWASP ASVS 5.0 7.3.1). */
export const IDLE_SECONDS = 60 * 60;
/** Absolute lifetime: a session ends this long after sign-in, used or not (ASVS 7.3.2). */
export const ABSOLUTE_SECONDS = 12 * 60 * 60;
/** Re-issue the cookie (sliding idle expiry) when the token is older than this. */
export const REFRESH_AFTER_SECONDS = 5 * 60;

export type SessionClaims = { sub: string; ws: string; tv: number; at: number; iat: number; exp: number };

export class SessionKeys {
  readonly key: KeyObject;
  constructor(secret: string) {
    // A KeyObject built once: a string secret made verification about 40 times slower (RELIABILITY.md).
    this.key = createSecretKey(Buffer.from(secret, 'utf8'));
  }

  sign(
    claims: { sub: string; ws: string; tv: number; at: number },
    nowSeconds = Math.floor(Date.now() / 1000),
  ) {
    const exp = Math.min(nowSeconds + IDLE_SECONDS, claims.at + ABSOLUTE_SECONDS);
    return jwt.sign({ ws: claims.ws, tv: claims.tv, at: claims.at, iat: nowSeconds, exp }, this.key, {
      algorithm: 'HS256',
      subject: claims.sub,
      issuer: ISSUER,
      audience: AUDIENCE,
    });
  }

  /** Verifies algorithm, issuer, audience and expiry; a token without `exp` is refused. */
  verify(token: string): SessionClaims | null {
    try {
      const payload = jwt.verify(token, this.key, {
        algorithms: ['HS256'],
        issuer: ISSUER,
        audience: AUDIENCE,
      });
      if (typeof payload !== 'object' || payload === null) return null;
      const { sub, ws, tv, at, iat, exp } = payload as Record<string, unknown>;
      if (typeof exp !== 'number' || typeof iat !== 'number') return null;
      if (
        typeof sub !== 'string' ||
        typeof ws !== 'string' ||
        typeof tv !== 'number' ||
        typeof at !== 'number'
      ) {
        return null;
      }
      if (Date.now() / 1000 > at + ABSOLUTE_SECONDS) return null;
      return { sub, ws, tv, at, iat, exp };
    } catch {
      return null;
    }
  }
}
