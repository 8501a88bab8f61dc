import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { User } from '../../server/db/associations';
import { mailListSchema, userSchema } from '../../shared/schemas/user.schema';
import type { Role } from '../../shared/schemas/auth.schema';
import { signIn, uniqueEmail, type Caller, type TestApp, startTestApp } from '../helpers/app';
import { TEST_PASSWORD, makeWorld, type World } from '../helpers/factory';
import { acceptInvitation, addPerson, anonymousPost, invitationTokenIn } from '../helpers/people';

let t: TestApp;
let w: World;
let admin: Caller;
beforeAll(async () => {
  t = await startTestApp();
  w = await makeWorld(t.app, 'users');
  admin = w.callers.admin;
});
afterAll(() => t.close());

const NEW_PASSWORD = 'a quiet headland at dusk';

/** Invites a person as `by` and answers the response and the invitation mail's token (when one is sent). */
async function invite(
  by: Caller,
  body: { role: Role; growerId?: string | null; growerIds?: string[] },
  email = uniqueEmail('invitee'),
) {
  const res = await by.post('/api/users', { email, name: 'Invited person', ...body });
  const token =
    res.status === 201 ? invitationTokenIn(await t.mailbox.waitFor((m) => m.to.includes(email))) : null;
  return { res, email, token };
}

/** The admin's edit of a person: name, role and grower assignments as stored now, with `change` on top. */
async function editPerson(by: Caller, id: string, change: Record<string, unknown>) {
  const row = (await User.findByPk(id))!;
  return by.put(`/api/users/${id}`, {
    name: row.name,
    role: row.role,
    growerId: row.growerId,
    version: row.version,
    ...change,
  });
}

const expectError = (res: request.Response, status: number, code: string) => {
  expect(res.status, JSON.stringify(res.body)).toBe(status);
  expect(res.body.error.code).toBe(code);
};
const pathsOf = (res: request.Response) =>
  (res.body.error.details ?? []).map((d: { path: string[] }) => d.path);

describe('invitations', () => {
  it('invites by e-mail; the link describes the invitation and signs the person in, once', async () => {
    const { res, email, token } = await invite(admin, { role: 'agronomist' });
    expect(res.status).toBe(201);
    userSchema.parse(res.body);
    expect(res.body).toMatchObject({ email, role: 'agronomist', status: 'invited', lastSignInAt: null });
    const mail = await t.mailbox.waitFor((m) => m.to.includes(email));
    expect(mail.text).toContain(`http://sowright.test/invitation?token=${token}`);

    const described = await request(t.app).get(`/api/auth/invitation/${token}`);
    expect(described.status).toBe(200);
    expect(described.body).toEqual({ email, name: 'Invited person', workspaceName: w.ws.name });

    const { res: accepted, caller } = await acceptInvitation(t, token!, NEW_PASSWORD);
    expect(accepted.status).toBe(200);
    const me = await caller!.get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body).toMatchObject({ email, role: 'agronomist', workspace: { id: w.ws.id } });
    expect((await User.findOne({ where: { email } }))!.status).toBe('active');
    expect((await signIn(t.app, email, NEW_PASSWORD)).cookie).toMatch(/^sowright_session=/);

    expectError((await acceptInvitation(t, token!, 'another long passphrase')).res, 404, 'not_found');
    expectError(await request(t.app).get(`/api/auth/invitation/${token}`), 404, 'not_found');
  });

  it('a resent invitation carries a new link and the old one stops working; an active person gets none', async () => {
    const first = await invite(admin, { role: 'consultant', growerIds: [w.a.grower.id] });
    const id = first.res.body.id as string;
    const resent = await admin.post(`/api/users/${id}/resend-invitation`);
    expect(resent.status).toBe(202);
    const mail = await t.mailbox.waitFor((m) => m.to.includes(first.email) && !m.text.includes(first.token!));
    const token = invitationTokenIn(mail);
    expectError(await request(t.app).get(`/api/auth/invitation/${first.token}`), 404, 'not_found');
    expect((await acceptInvitation(t, token, NEW_PASSWORD)).res.status).toBe(200);
    expectError(await admin.post(`/api/users/${id}/resend-invitation`), 409, 'conflict');
  });

  it('a farmer needs a grower: 400 naming growerId, nobody created', async () => {
    const { res, email } = await invite(admin, { role: 'farmer' });
    expectError(res, 400, 'validation_failed');
    expect(pathsOf(res)).toContainEqual(['growerId']);
    expect(await User.count({ where: { email } })).toBe(0);
  });

  it('growers of another workspace answer 404 and create nobody; own growers are assigned', async () => {
    const other = await makeWorld(t.app, 'users-other');
    const consultant = await invite(admin, {
      role: 'consultant',
      growerIds: [w.a.grower.id, other.b.grower.id],
    });
    expectError(consultant.res, 404, 'not_found');
    const farmer = await invite(admin, { role: 'farmer', growerId: other.a.grower.id });
    expectError(farmer.res, 404, 'not_found');
    expect(await User.count({ where: { email: [consultant.email, farmer.email] } })).toBe(0);

    const own = await invite(admin, { role: 'consultant', growerIds: [w.a.grower.id, w.b.grower.id] });
    expect(own.res.status).toBe(201);
    expect(new Set(own.res.body.growerIds)).toEqual(new Set([w.a.grower.id, w.b.grower.id]));
  });

  it('an e-mail that already has an account answers 409 duplicate naming email, in any case', async () => {
    const taken = w.people.farmer.email;
    for (const email of [taken, taken.toUpperCase()]) {
      const res = await admin.post('/api/users', { email, name: 'Second account', role: 'agronomist' });
      expectError(res, 409, 'duplicate');
      expect(pathsOf(res)).toEqual([['email']]);
    }
    expect(await User.count({ where: { email: taken } })).toBe(1);
  });
});

describe('changes that end sessions', () => {
  it('a role change ends the person’s sessions at once; the new role applies at the next sign-in', async () => {
    const { user, caller } = await addPerson(t, w, 'agronomist');
    expect((await caller.get(`/api/growers/${w.b.grower.id}`)).status).toBe(200);
    const res = await editPerson(admin, user.id, { role: 'consultant', growerIds: [w.a.grower.id] });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ role: 'consultant', growerIds: [w.a.grower.id] });
    expectError(await caller.get('/api/auth/me'), 401, 'unauthenticated');

    const again = await signIn(t.app, user.email, TEST_PASSWORD);
    expect((await again.get('/api/auth/me')).body.role).toBe('consultant');
    expectError(await again.get(`/api/growers/${w.b.grower.id}`), 404, 'not_found');
  });

  it('disabling ends the sessions and refuses sign-in; enabling lets the person back in', async () => {
    const { user, caller } = await addPerson(t, w, 'farmer');
    expect((await editPerson(admin, user.id, { status: 'disabled' })).status).toBe(200);
    expectError(await caller.get('/api/auth/me'), 401, 'unauthenticated');
    const refused = await anonymousPost(t, '/api/auth/sign-in', {
      email: user.email,
      password: TEST_PASSWORD,
    });
    expectError(refused, 401, 'invalid_credentials');

    expect((await editPerson(admin, user.id, { status: 'active' })).status).toBe(200);
    expect((await (await signIn(t.app, user.email, TEST_PASSWORD)).get('/api/auth/me')).body.role).toBe(
      'farmer',
    );
  });

  it('an admin cannot change their own role or disable themselves (409), and stays signed in', async () => {
    const self = await addPerson(t, w, 'admin');
    const before = (await User.findByPk(self.user.id))!.get({ plain: true });
    expectError(await editPerson(self.caller, self.user.id, { role: 'agronomist' }), 409, 'conflict');
    expectError(await editPerson(self.caller, self.user.id, { status: 'disabled' }), 409, 'conflict');
    expect((await User.findByPk(self.user.id))!.get({ plain: true })).toEqual(before);
    expect((await self.caller.get('/api/users')).status).toBe(200);
  });
});

describe('changes that keep sessions', () => {
  it('renaming a person (the admin themselves included) keeps their sessions', async () => {
    const self = await editPerson(admin, w.people.admin.id, { name: 'Renamed admin' });
    expect(self.status, JSON.stringify(self.body)).toBe(200);
    expect(self.body.name).toBe('Renamed admin');
    expect((await admin.get('/api/auth/me')).status).toBe(200);
    const consultant = await signIn(t.app, w.people.consultant.email, TEST_PASSWORD);
    const other = await editPerson(admin, w.people.consultant.id, {
      name: 'Renamed consultant',
      growerIds: [w.a.grower.id],
    });
    expect(other.status, JSON.stringify(other.body)).toBe(200);
    expect((await consultant.get('/api/auth/me')).status).toBe(200);
  });

  it('a change of a consultant’s growers ends their sessions (their scope changed)', async () => {
    const consultant = await signIn(t.app, w.people.consultant.email, TEST_PASSWORD);
    const res = await editPerson(admin, w.people.consultant.id, {
      growerIds: [w.a.grower.id, w.b.grower.id],
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect((await consultant.get('/api/auth/me')).status).toBe(401);
    const again = await signIn(t.app, w.people.consultant.email, TEST_PASSWORD);
    const growers = await again.get('/api/growers');
    expect(growers.body.items.map((g: { id: string }) => g.id).sort()).toEqual(
      [w.a.grower.id, w.b.grower.id].sort(),
    );
    await editPerson(admin, w.people.consultant.id, { growerIds: [w.a.grower.id] });
  });
});

describe('the mail outbox', () => {
  it("shows each admin only the messages to their own workspace's people", async () => {
    const other = await makeWorld(t.app, 'users-mail');
    const mine = await invite(admin, { role: 'agronomist' });
    const theirs = await invite(other.callers.admin, { role: 'agronomist' });
    expect([mine.res.status, theirs.res.status]).toEqual([201, 201]);

    for (const [world, own, foreign] of [
      [w, mine.email, theirs.email],
      [other, theirs.email, mine.email],
    ] as const) {
      const res = await world.callers.admin.get('/api/mail');
      expect(res.status).toBe(200);
      const items = mailListSchema.parse(res.body).items;
      const recipients = items.flatMap((m) => m.to);
      expect(recipients).toContain(own);
      expect(recipients).not.toContain(foreign);
      const people = await User.findAll({ where: { workspaceId: world.ws.id }, attributes: ['email'] });
      const ours = new Set(people.map((p) => p.email));
      expect(recipients.filter((r) => !ours.has(r))).toEqual([]);
    }
  });
});
