import { describe, expect, it } from 'vitest';
import { ABSOLUTE_SECONDS, IDLE_SECONDS, SessionKeys, VERIFIED_KEEP } from '../../server/lib/session';

const SECRET = 'a-test-secret-of-enough-length-for-hs256-0123456789';
const claims = (at: number) => ({ sub: 'u1', ws: 'w1', tv: 3, at });

describe('session tokens remembered after their first check', () => {
  it('a remembered token still expires: idle lifetime, then absolute lifetime', () => {
    const keys = new SessionKeys(SECRET);
    const t0 = 1_800_000_000; // seconds
    const token = keys.sign(claims(t0), t0);
    expect(keys.verify(token, t0 * 1000)?.tv).toBe(3);
    expect(keys.verify(token, (t0 + IDLE_SECONDS - 1) * 1000)?.sub).toBe('u1'); // remembered, in time
    expect(keys.verify(token, (t0 + IDLE_SECONDS) * 1000)).toBeNull(); // exp reached
    expect(keys.verify(token, t0 * 1000)).not.toBeNull(); // checked in full again, signature still good

    // Re-issued near the end of the absolute lifetime: exp is capped at at + ABSOLUTE_SECONDS.
    const late = t0 + ABSOLUTE_SECONDS - 60;
    const reissued = keys.sign(claims(t0), late);
    expect(keys.verify(reissued, late * 1000)).not.toBeNull();
    expect(keys.verify(reissued, (t0 + ABSOLUTE_SECONDS + 1) * 1000)).toBeNull();
  });

  it('a token changed by one character, or signed with another key, is refused', () => {
    const keys = new SessionKeys(SECRET);
    const now = Math.floor(Date.now() / 1000);
    const token = keys.sign(claims(now), now);
    expect(keys.verify(token)).not.toBeNull();
    const [h, p, sig] = token.split('.');
    const flipped = `${h}.${p}.${sig.slice(0, -2)}${sig.at(-2) === 'A' ? 'B' : 'A'}${sig.at(-1)}`;
    expect(keys.verify(flipped)).toBeNull();
    expect(new SessionKeys(`${SECRET}-other`).verify(token)).toBeNull();
  });

  it('remembers a bounded number of tokens, the oldest forgotten first', () => {
    const keys = new SessionKeys(SECRET);
    const now = Math.floor(Date.now() / 1000);
    const first = keys.sign(claims(now), now);
    keys.verify(first);
    const verified = (keys as unknown as { verified: Map<string, unknown> }).verified;
    for (let i = 1; i < VERIFIED_KEEP; i++) verified.set(`filler-${i}`, {} as never);
    keys.verify(keys.sign({ ...claims(now), sub: 'u2' }, now));
    expect(verified.size).toBe(VERIFIED_KEEP); // full: one added, the oldest (the first) dropped
    expect(verified.has(first)).toBe(false);
    expect(keys.verify(first)).not.toBeNull(); // still valid: checked in full again
  });
});
