import request from 'supertest';
import { User } from '../../server/db/associations';
import { hashPassword } from '../../server/lib/passwords';
import type { CaughtMail } from '../../server/mail/smtp-fake';
import type { Role } from '../../shared/schemas/auth.schema';
import { Caller, sessionCookieOf, signIn, uniqueEmail, type TestApp } from './app';
import { TEST_PASSWORD, type World } from './factory';

let cachedHash: Promise<string> | null = null;

/** One more person in a world's workspace, written straight to the database (a farmer belongs to grower A). */
async function createPerson(world: World, role: Role, status: 'active' | 'invited') {
  return User.create({
    workspaceId: world.ws.id,
    email: uniqueEmail(`extra-${role}`),
    name: `Extra ${role}`,
    role,
    status,
    passwordHash: status === 'active' ? await (cachedHash ??= hashPassword(TEST_PASSWORD)) : null,
    growerId: role === 'farmer' ? world.a.grower.id : null,
    lastSignInAt: null,
  });
}

/** An active person of the world, signed in: for tests that end sessions or change roles. */
export async function addPerson(t: TestApp, world: World, role: Role) {
  const user = await createPerson(world, role, 'active');
  return { user, caller: await signIn(t.app, user.email, TEST_PASSWORD) };
}

/** A person of the world who has been invited and has not accepted yet (no password). */
export const addInvitedPerson = (world: World, role: Role = 'agronomist') =>
  createPerson(world, role, 'invited');

/** The one-time token of the invitation link in an e-mail (`…/invitation?token=…`). */
export function invitationTokenIn(mail: CaughtMail): string {
  const match = /\/invitation\?token=([A-Za-z0-9_-]+)/.exec(mail.text);
  if (!match) throw new Error(`no invitation link in the e-mail: ${mail.text}`);
  return match[1];
}

/** An anonymous state-changing request (carries the anti-forgery header, no session). */
export const anonymousPost = (t: TestApp, url: string, body: object) =>
  request(t.app).post(url).set('X-Sowright-Request', '1').send(body);

/** Accepts an invitation with a password; answers the response and a caller holding the new session. */
export async function acceptInvitation(t: TestApp, token: string, password: string) {
  const res = await anonymousPost(t, '/api/auth/accept-invitation', { token, password });
  return { res, caller: res.status === 200 ? new Caller(t.app, sessionCookieOf(res)) : null };
}
