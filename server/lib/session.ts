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

/** How many verified tokens `SessionKeys.verify` remembers. */
export const VERIFIED_KEEP = 10_000;

export type SessionClaims = { sub: string; ws: string; tv: number; at: number; iat: number; exp: number };

export class SessionKeys {
  readonly key: KeyObject;
  private readonly verified = new Map<string, SessionClaims>();
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

  /**
   * Verifies algorithm, issuer, audience and expiry; a token without `exp` is refused. A token whose
   * signature and claims were checked once is remembered (at most `VERIFIED_KEEP` of them, the oldest
   * forgotten first), so the next request with it only checks the clock: the signature check and the
   * two JSON parses cost about a third of an authenticated read (measured on this machine, see
   * DEVELOPERS.md). Only tokens that passed are kept; a changed byte is another key, checked in full.
   */
  verify(token: string, nowMs = Date.now()): SessionClaims | null {
    const known = this.verified.get(token);
    if (known) {
      if (nowMs / 1000 < known.exp && nowMs / 1000 <= known.at + ABSOLUTE_SECONDS) return known;
      this.verified.delete(token);
      return null;
    }
    const claims = this.verifyFully(token, nowMs);
    if (claims) {
      if (this.verified.size >= VERIFIED_KEEP) {
        this.verified.delete(this.verified.keys().next().value as string);
      }
      this.verified.set(token, claims);
    }
    return claims;
  }

  private verifyFully(token: string, nowMs: number): SessionClaims | null {
    try {
      const payload = jwt.verify(token, this.key, {
        algorithms: ['HS256'],
        issuer: ISSUER,
        audience: AUDIENCE,
        clockTimestamp: Math.floor(nowMs / 1000),
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
      if (nowMs / 1000 > at + ABSOLUTE_SECONDS) return null;
      return Object.freeze({ sub, ws, tv, at, iat, exp });
    } catch {
      return null;
    }
  }
}
