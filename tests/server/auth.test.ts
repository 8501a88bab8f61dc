import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import jwt from 'jsonwebtoken';
import { User } from '../../server/db/associations';
import { ABSOLUTE_SECONDS, AUDIENCE, ISSUER } from '../../server/lib/session';
import { Caller, sessionCookieOf, signIn, startTestApp, uniqueEmail, type TestApp } from '../helpers/app';
import { TEST_PASSWORD, makeWorld, type World } from '../helpers/factory';

let t: TestApp;
let w: World;
beforeAll(async () => {
  t = await startTestApp({ trustProxy: 1 });
  w = await makeWorld(t.app, 'auth');
});
afterAll(() => t.close());

const post = (url: string, body: object, ip = '198.51.100.7') =>
  request(t.app).post(url).set('X-Sowright-Request', '1').set('X-Forwarded-For', ip).send(body);

/** A fresh active person of the world, so throttling and session tests do not disturb each other. */
async function freshPerson(role: 'agronomist' | 'farmer' = 'agronomist') {
  const admin = w.callers.admin;
  const email = uniqueEmail('p');
  const invited = await admin.post('/api/users', {
    email,
    name: 'Fresh person',
    role,
    growerId: role === 'farmer' ? w.a.grower.id : null,
  });
  expect(invited.status).toBe(201);
  const mail = await t.mailbox.waitFor((m) => m.to.includes(email));
  const token = /invitation\?token=([\w-]+)/.exec(mail.text)![1];
  const accepted = await post('/api/auth/accept-invitation', { token, password: TEST_PASSWORD });
  expect(accepted.status).toBe(200);
  return { email, id: invited.body.id as string, caller: new Caller(t.app, sessionCookieOf(accepted)) };
}

describe('sign-in', () => {
  it('signs in with the right password and sets an HttpOnly, SameSite=Strict session cookie', async () => {
    const res = await post('/api/auth/sign-in', {
      email: w.people.agronomist.email,
      password: TEST_PASSWORD,
    });
    expect(res.status).toBe(200);
    expect(res.body.role).toBe('agronomist');
    const cookie = ([] as string[]).concat(res.headers['set-cookie'] as unknown as string[]).join(';');
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Strict/i);
    expect(cookie).toMatch(/Path=\//);
  });

  it('checks the e-mail case-insensitively but the password exactly as typed', async () => {
    const upper = await post('/api/auth/sign-in', {
      email: w.people.agronomist.email.toUpperCase(),
      password: TEST_PASSWORD,
    });
    expect(upper.status).toBe(200);
    const padded = await post(
      '/api/auth/sign-in',
      { email: w.people.agronomist.email, password: ` ${TEST_PASSWORD} ` },
      '198.51.100.8',
    );
    expect(padded.status).toBe(401);
  });

  it('answers a wrong password and an unknown e-mail alike, in status and body', async () => {
    const wrong = await post(
      '/api/auth/sign-in',
      { email: w.people.farmer.email, password: 'not the password' },
      '198.51.100.9',
    );
    const unknown = await post(
      '/api/auth/sign-in',
      { email: uniqueEmail('nobody'), password: 'not the password' },
      '198.51.100.9',
    );
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(unknown.body).toEqual(wrong.body);
    expect(wrong.body.error.code).toBe('invalid_credentials');
    expect(wrong.headers['set-cookie']).toBeUndefined();
  });

  it('takes about as long for an unknown e-mail as for a wrong password (both verify an argon2id hash)', async () => {
    const time = async (email: string) => {
      const t0 = performance.now();
      await post('/api/auth/sign-in', { email, password: 'still not the password' }, '198.51.100.10');
      return performance.now() - t0;
    };
    await time(uniqueEmail('warm')); // the dummy hash is built once
    const known: number[] = [];
    const unknown: number[] = [];
    // Four of each, the fastest compared: a busy machine slows single requests by 2× and more.
    for (let i = 0; i < 4; i++) {
      known.push(await time(w.people.consultant.email));
      unknown.push(await time(uniqueEmail('ghost')));
    }
    const k = Math.min(...known);
    const u = Math.min(...unknown);
    // Without the dummy hash an unknown e-mail answers in ~1 ms against tens of ms (a ratio near 0.05): a
    // ratio, not a timing target. Both verify one argon2id hash of the same cost, so neither is far slower.
    expect(u / k).toBeGreaterThan(0.5);
    expect(u / k).toBeLessThan(2);
  });

  it('refuses state-changing requests without the anti-forgery header or from another origin', async () => {
    const bare = await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: w.people.agronomist.email, password: TEST_PASSWORD });
    expect(bare.status).toBe(403);
    expect(bare.body.error.code).toBe('csrf');
    const foreign = await post('/api/auth/sign-in', {
      email: w.people.agronomist.email,
      password: TEST_PASSWORD,
    }).set('Origin', 'https://elsewhere.example');
    expect(foreign.status).toBe(403);
  });
});

describe('throttling', () => {
  it('answers 429 with Retry-After after five failures for one account from one address', async () => {
    const p = await freshPerson();
    const ip = '203.0.113.50';
    for (let i = 0; i < 5; i++) {
      const res = await post('/api/auth/sign-in', { email: p.email, password: `wrong-${i}-password` }, ip);
      expect(res.status).toBe(401);
    }
    const blocked = await post('/api/auth/sign-in', { email: p.email, password: TEST_PASSWORD }, ip);
    expect(blocked.status).toBe(429);
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
    expect(blocked.body.error.code).toBe('too_many_attempts');
  });

  it('does not let a stranger elsewhere lock the person out', async () => {
    const p = await freshPerson();
    for (let i = 0; i < 8; i++) {
      await post('/api/auth/sign-in', { email: p.email, password: `guess-${i}-password` }, '203.0.113.99');
    }
    const own = await post('/api/auth/sign-in', { email: p.email, password: TEST_PASSWORD }, '203.0.113.1');
    expect(own.status).toBe(200);
  });

  it('throttles reset requests per account', async () => {
    const p = await freshPerson();
    const statuses: number[] = [];
    for (let i = 0; i < 4; i++)
      statuses.push((await post('/api/auth/reset-request', { email: p.email }, '203.0.113.60')).status);
    expect(statuses).toEqual([202, 202, 202, 429]);
  });
});

describe('sessions', () => {
  it('sign-out ends the session: the old cookie no longer works', async () => {
    const p = await freshPerson();
    expect((await p.caller.get('/api/auth/me')).status).toBe(200);
    expect((await p.caller.post('/api/auth/sign-out')).status).toBe(204);
    expect((await p.caller.get('/api/auth/me')).status).toBe(401);
  });

  it('refuses a token without expiry, with another algorithm, issuer or key', async () => {
    const user = w.people.consultant;
    const claims = { ws: user.workspaceId, tv: user.tokenVersion, at: Math.floor(Date.now() / 1000) };
    const base = { subject: user.id, issuer: ISSUER, audience: AUDIENCE };
    const forged = [
      jwt.sign(claims, t.jwtSecret, { ...base, algorithm: 'HS256' }), // no exp
      jwt.sign(claims, t.jwtSecret, { ...base, algorithm: 'HS512', expiresIn: 600 }),
      jwt.sign(claims, t.jwtSecret, { ...base, issuer: 'someone-else', algorithm: 'HS256', expiresIn: 600 }),
      jwt.sign(claims, 'another secret of enough length to sign with', {
        ...base,
        algorithm: 'HS256',
        expiresIn: 600,
      }),
      jwt.sign({ ...claims, at: claims.at - ABSOLUTE_SECONDS - 10 }, t.jwtSecret, {
        ...base,
        algorithm: 'HS256',
        expiresIn: 600,
      }),
    ];
    const good = jwt.sign(claims, t.jwtSecret, { ...base, algorithm: 'HS256', expiresIn: 600 });
    expect((await new Caller(t.app, `sowright_session=${good}`).get('/api/auth/me')).status).toBe(200);
    for (const token of forged) {
      expect((await new Caller(t.app, `sowright_session=${token}`).get('/api/auth/me')).status).toBe(401);
    }
  });

  it('a password change needs the current one and ends other sessions, not this one', async () => {
    const p = await freshPerson();
    const other = await signIn(t.app, p.email, TEST_PASSWORD);
    const wrong = await p.caller.post('/api/auth/password', {
      currentPassword: 'nope-nope-nope',
      newPassword: 'a new long passphrase',
    });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.details[0].path).toEqual(['currentPassword']);
    const res = await p.caller.post('/api/auth/password', {
      currentPassword: TEST_PASSWORD,
      newPassword: 'a new long passphrase',
    });
    expect(res.status).toBe(204);
    p.caller.cookie = sessionCookieOf(res);
    expect((await p.caller.get('/api/auth/me')).status).toBe(200);
    expect((await other.get('/api/auth/me')).status).toBe(401);
    expect(
      (
        await post(
          '/api/auth/sign-in',
          { email: p.email, password: 'a new long passphrase' },
          '198.51.100.77',
        )
      ).status,
    ).toBe(200);
  });

  it('refuses short and common new passwords', async () => {
    const p = await freshPerson();
    const short = await p.caller.post('/api/auth/password', {
      currentPassword: TEST_PASSWORD,
      newPassword: 'short12',
    });
    const common = await p.caller.post('/api/auth/password', {
      currentPassword: TEST_PASSWORD,
      newPassword: 'password123',
    });
    for (const res of [short, common]) {
      expect(res.status).toBe(400);
      expect(res.body.error.details[0].path).toEqual(['newPassword']);
    }
  });

  it('stores only an argon2id hash of the password', async () => {
    const p = await freshPerson();
    const row = await User.findByPk(p.id);
    expect(row!.passwordHash).toMatch(/^\$argon2id\$v=19\$m=19456,t=2,p=1\$/);
  });
});

describe('password reset by e-mail', () => {
  it('mails a one-time link that sets a new password and ends old sessions', async () => {
    const p = await freshPerson('farmer');
    const res = await post('/api/auth/reset-request', { email: p.email }, '198.51.100.20');
    expect(res.status).toBe(202);
    const mail = await t.mailbox.waitFor((m) => m.to.includes(p.email) && /reset/i.test(m.subject));
    const token = /reset-password\?token=([\w-]+)/.exec(mail.text)![1];
    const done = await post(
      '/api/auth/reset',
      { token, password: 'fresh furrow passphrase' },
      '198.51.100.20',
    );
    expect(done.status).toBe(204);
    expect((await p.caller.get('/api/auth/me')).status).toBe(401);
    expect(
      (await post('/api/auth/sign-in', { email: p.email, password: TEST_PASSWORD }, '198.51.100.21')).status,
    ).toBe(401);
    expect(
      (
        await post(
          '/api/auth/sign-in',
          { email: p.email, password: 'fresh furrow passphrase' },
          '198.51.100.21',
        )
      ).status,
    ).toBe(200);
    const again = await post(
      '/api/auth/reset',
      { token, password: 'another furrow passphrase' },
      '198.51.100.20',
    );
    expect(again.status).toBe(404);
  });

  it('answers an unknown e-mail the same and sends nothing', async () => {
    const email = uniqueEmail('unknown');
    const res = await post('/api/auth/reset-request', { email }, '198.51.100.30');
    expect(res.status).toBe(202);
    await expect(t.mailbox.waitFor((m) => m.to.includes(email), 700)).rejects.toThrow();
  });
});

describe('preferences', () => {
  it('keeps the unit system per person', async () => {
    const p = await freshPerson();
    const res = await p.caller.put('/api/auth/preferences', { unitSystem: 'metric' });
    expect(res.status).toBe(200);
    expect(res.body.unitSystem).toBe('metric');
    expect((await p.caller.get('/api/auth/me')).body.unitSystem).toBe('metric');
  });
});

describe('GET /api/auth/session', () => {
  it('answers 200 with null when signed out and the person when signed in', async () => {
    const out = await request(t.app).get('/api/auth/session');
    expect(out.status).toBe(200);
    expect(out.body).toEqual({ me: null });
    const inside = await w.callers.consultant.get('/api/auth/session');
    expect(inside.status).toBe(200);
    expect(inside.body.me.role).toBe('consultant');
    expect(inside.body.me).not.toHaveProperty('passwordHash');
  });
});
