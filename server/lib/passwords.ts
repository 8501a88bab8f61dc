import argon2 from 'argon2';

/** argon2id with m = 19 MiB, t = 2, p = 1 (OWASP ASVS 5.0 11.4.2 minimum). */
const OPTIONS = { type: argon2.argon2id, memoryCost: 19_456, timeCost: 2, parallelism: 1 } as const;

export const hashPassword = (password: string) => argon2.hash(password, OPTIONS);

export async function verifyPassword(hash: string, password: string): Promise<boolean> {
  try {
    return await argon2.verify(hash, password);
  } catch {
    return false;
  }
}

let dummy: Promise<string> | null = null;
/**
 * A hash to verify against when the e-mail is unknown, so that an unknown e-mail and a wrong password
 * take the same time (OWASP ASVS 5.0 6.3.8).
 */
export function dummyHash(): Promise<string> {
  dummy ??= hashPassword('not-a-real-password-' + Math.random());
  return dummy;
}
