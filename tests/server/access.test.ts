import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { User, UserToken } from '../../server/db/associations';
import { ROLES, type Role } from '../../shared/schemas/auth.schema';
import { Caller, startTestApp, uniqueEmail, type TestApp } from '../helpers/app';
import { TEST_PASSWORD, makeWorld, type World } from '../helpers/factory';
import { acceptInvitation, addInvitedPerson, anonymousPost, invitationTokenIn } from '../helpers/people';
import {
  KINDS,
  MODELS,
  createBody,
  idOf,
  rowOf,
  tag,
  updateBody,
  type Kind,
  type Side,
} from '../helpers/register';

let t: TestApp;
/** The workspace under test. */
let w: World;
/** Another workspace, whose ids must never reach anything in `w`. */
let other: World;
/** Invited people (no password yet) that the people routes act on. */
let invitedHere: User;
let invitedThere: User;

beforeAll(async () => {
  t = await startTestApp();
  w = await makeWorld(t.app, 'access');
  other = await makeWorld(t.app, 'access-other');
  invitedHere = await addInvitedPerson(w);
  invitedThere = await addInvitedPerson(other);
});
afterAll(() => t.close());

const LONG_AGO = '2001-02-03T04:05:06.000Z';

/** What a route answered, as a status class and the error code: 'ok' for any 2xx. */
type Cell = 'ok' | '401 unauthenticated' | '403 forbidden' | '404 not_found';
const cellOf = (res: request.Response) =>
  res.status >= 200 && res.status < 300 ? 'ok' : `${res.status} ${res.body?.error?.code as string}`;

const OK: Cell = 'ok';
const NO: Cell = '403 forbidden';
const HIDDEN: Cell = '404 not_found';
const everyone = { admin: OK, agronomist: OK, farmer: OK, consultant: OK };
const officeOnly = { admin: OK, agronomist: OK, farmer: NO, consultant: NO };
const adminOnly = { admin: OK, agronomist: NO, farmer: NO, consultant: NO };
/** Grower B's rows: the farmer and the consultant belong to (read) grower A only. */
const readOfB = { admin: OK, agronomist: OK, farmer: HIDDEN, consultant: HIDDEN };
const planterWriteOfA = { admin: OK, agronomist: OK, farmer: OK, consultant: NO };
const planterWriteOfB = { admin: OK, agronomist: OK, farmer: HIDDEN, consultant: NO };

type Route = {
  label: string;
  expect: Record<Role, Cell>;
  send: (c: Caller) => Promise<request.Response> | request.Test;
};

function registerRoutes(kind: Kind): Route[] {
  const sides: Side[] = ['a', 'b'];
  const path = (side: Side) => `/api/${kind}/${idOf(w, kind, side)}`;
  const write = (side: Side) =>
    kind === 'planters' ? (side === 'a' ? planterWriteOfA : planterWriteOfB) : officeOnly;
  const creates: Route[] =
    kind === 'growers'
      ? [
          {
            label: 'POST /api/growers',
            expect: officeOnly,
            send: (c) => c.post('/api/growers', createBody(w, kind, 'a')),
          },
        ]
      : sides.map((side) => ({
          label: `POST /api/${kind} under grower ${side.toUpperCase()}`,
          expect: write(side),
          send: (c) => c.post(`/api/${kind}`, createBody(w, kind, side)),
        }));
  return [
    { label: `GET /api/${kind}`, expect: everyone, send: (c) => c.get(`/api/${kind}`) },
    ...sides.map((side) => ({
      label: `GET /api/${kind}/:id of grower ${side.toUpperCase()}`,
      expect: side === 'a' ? everyone : readOfB,
      send: (c: Caller) => c.get(path(side)),
    })),
    ...creates,
    ...sides.flatMap((side): Route[] => [
      {
        label: `PUT /api/${kind}/:id of grower ${side.toUpperCase()}`,
        expect: write(side),
        send: async (c) => c.put(path(side), await updateBody(kind, idOf(w, kind, side))),
      },
      {
        label: `POST /api/${kind}/:id/archive of grower ${side.toUpperCase()}`,
        expect: write(side),
        send: (c) => c.post(`${path(side)}/archive`),
      },
      {
        label: `POST /api/${kind}/:id/restore of grower ${side.toUpperCase()}`,
        expect: write(side),
        send: (c) => c.post(`${path(side)}/restore`),
      },
    ]),
  ];
}

const peopleRoutes: Route[] = [
  { label: 'GET /api/users', expect: adminOnly, send: (c) => c.get('/api/users') },
  { label: 'GET /api/users/:id', expect: adminOnly, send: (c) => c.get(`/api/users/${invitedHere.id}`) },
  {
    label: 'POST /api/users',
    expect: adminOnly,
    send: (c) =>
      c.post('/api/users', { email: uniqueEmail('matrix'), name: 'Matrix invitee', role: 'agronomist' }),
  },
  {
    label: 'PUT /api/users/:id',
    expect: adminOnly,
    send: async (c) => {
      const row = await User.findByPk(invitedHere.id);
      return c.put(`/api/users/${invitedHere.id}`, {
        name: `Renamed ${tag()}`,
        role: 'agronomist',
        version: row!.version,
      });
    },
  },
  {
    label: 'POST /api/users/:id/resend-invitation',
    expect: adminOnly,
    send: (c) => c.post(`/api/users/${invitedHere.id}/resend-invitation`),
  },
  { label: 'GET /api/mail', expect: adminOnly, send: (c) => c.get('/api/mail') },
];

const ROUTES: Route[] = [...KINDS.flatMap(registerRoutes), ...peopleRoutes];

describe('role × route matrix (allowed → 2xx, forbidden role → 403, out of scope → 404, signed out → 401)', () => {
  it.each(ROUTES)('$label', async (route) => {
    const actual: Record<string, string> = {};
    for (const role of ROLES) actual[role] = cellOf(await route.send(w.callers[role]));
    actual.anonymous = cellOf(await route.send(new Caller(t.app, '')));
    expect(actual).toEqual({ ...route.expect, anonymous: '401 unauthenticated' });
  });
});

describe("another workspace's ids", () => {
  it.each(KINDS)(
    '%s: read, edit, archive and restore with ids of another workspace answer 404 and change nothing',
    async (kind) => {
      const admin = w.callers.admin;
      const live = idOf(other, kind, 'a');
      // Grower B's row of the other workspace is archived, so that a leaking restore would show.
      const archived = idOf(other, kind, 'b');
      await MODELS[kind].update({ archivedAt: new Date(LONG_AGO) }, { where: { id: archived } });
      const before = { live: await rowOf(kind, live), archived: await rowOf(kind, archived) };
      const answers = [
        await admin.get(`/api/${kind}/${live}`),
        await admin.put(`/api/${kind}/${live}`, await updateBody(kind, live, { name: `Taken ${tag()}` })),
        await admin.post(`/api/${kind}/${live}/archive`),
        await admin.post(`/api/${kind}/${archived}/restore`),
      ];
      expect(answers.map(cellOf)).toEqual([HIDDEN, HIDDEN, HIDDEN, HIDDEN]);
      expect({ live: await rowOf(kind, live), archived: await rowOf(kind, archived) }).toEqual(before);
    },
  );

  it('people: reading, editing and re-inviting a person of another workspace answer 404 and change nothing', async () => {
    const admin = w.callers.admin;
    const target = other.people.agronomist;
    const before = (await User.findByPk(target.id))!.get({ plain: true });
    const tokensBefore = await UserToken.count({ where: { userId: invitedThere.id } });
    const answers = [
      await admin.get(`/api/users/${target.id}`),
      await admin.put(`/api/users/${target.id}`, {
        name: 'Taken over',
        role: 'admin',
        version: before.version,
      }),
      await admin.post(`/api/users/${invitedThere.id}/resend-invitation`),
    ];
    expect(answers.map(cellOf)).toEqual([HIDDEN, HIDDEN, HIDDEN]);
    expect((await User.findByPk(target.id))!.get({ plain: true })).toEqual(before);
    expect(await UserToken.count({ where: { userId: invitedThere.id } })).toBe(tokensBefore);
    await expect(t.mailbox.waitFor((m) => m.to.includes(invitedThere.email), 300)).rejects.toThrow();
  });

  it.each(['farms', 'fields', 'seasons', 'planters'] as const)(
    '%s: creating under a parent of another workspace answers 404 and creates nothing',
    async (kind) => {
      const notes = `cross ${tag()}`;
      const res = await w.callers.admin.post(`/api/${kind}`, { ...createBody(other, kind, 'a'), notes });
      expect(cellOf(res)).toBe(HIDDEN);
      expect(await MODELS[kind].count({ where: { notes } })).toBe(0);
    },
  );

  it("a farmer creating a planter for another grower's id answers 404 and creates nothing", async () => {
    const notes = `farmer cross ${tag()}`;
    const res = await w.callers.farmer.post('/api/planters', { ...createBody(w, 'planters', 'b'), notes });
    expect(cellOf(res)).toBe(HIDDEN);
    expect(await MODELS.planters.count({ where: { notes } })).toBe(0);
  });
});

describe('scope of the farmer and the consultant', () => {
  const growerIdOf = (kind: Kind, item: { id: string; growerId?: string }) =>
    kind === 'growers' ? item.id : item.growerId;

  it.each(KINDS.flatMap((kind) => (['farmer', 'consultant'] as const).map((role) => ({ kind, role }))))(
    '$role sees only grower A in /api/$kind, archived or not',
    async ({ kind, role }) => {
      const caller = w.callers[role];
      for (const query of ['', '?archived=true']) {
        const res = await caller.get(`/api/${kind}${query}`);
        expect(res.status).toBe(200);
        const items = res.body.items as { id: string; growerId?: string }[];
        expect(items.map((i) => i.id)).toContain(idOf(w, kind, 'a'));
        expect(new Set(items.map((i) => growerIdOf(kind, i)))).toEqual(new Set([w.a.grower.id]));
      }
      if (kind !== 'growers') {
        const asked = await caller.get(`/api/${kind}?growerId=${w.b.grower.id}`);
        expect(asked.status).toBe(200);
        expect(asked.body.items).toEqual([]);
      }
    },
  );
});

describe('mass assignment', () => {
  const PROTECTED = ['id', 'workspaceId', 'growerId', 'farmId', 'fieldId', 'archivedAt', 'createdAt'];
  const pick = (row: Record<string, unknown>, keys: string[]) =>
    Object.fromEntries(keys.filter((k) => k in row).map((k) => [k, row[k]]));

  it.each(KINDS)(
    '%s: a create ignores id, workspaceId, version, archivedAt and createdAt in the body',
    async (kind) => {
      const startedAt = Date.now();
      const sentId = randomUUID();
      const res = await w.callers.admin.post(`/api/${kind}`, {
        ...createBody(w, kind, 'a'),
        // Fields and seasons take their grower from the parent: a growerId in the body is not theirs to set.
        ...(kind === 'fields' || kind === 'seasons' ? { growerId: w.b.grower.id } : {}),
        id: sentId,
        workspaceId: other.ws.id,
        version: 999,
        archivedAt: LONG_AGO,
        createdAt: LONG_AGO,
        updatedAt: LONG_AGO,
      });
      expect(res.status).toBe(201);
      expect(res.body.id).not.toBe(sentId);
      expect(await MODELS[kind].count({ where: { id: sentId } })).toBe(0);
      const row = await rowOf(kind, res.body.id);
      expect(row).toMatchObject({ workspaceId: w.ws.id, version: 0, archivedAt: null });
      if (kind !== 'growers') expect(row.growerId).toBe(w.a.grower.id);
      // Allow a minute of clock difference between this process and the database.
      expect((row.createdAt as Date).getTime()).toBeGreaterThan(startedAt - 60_000);
    },
  );

  it.each(KINDS)(
    '%s: an update ignores id, workspaceId, growerId, parent ids, archivedAt and createdAt',
    async (kind) => {
      const created = await w.callers.admin.post(`/api/${kind}`, createBody(w, kind, 'a'));
      expect(created.status).toBe(201);
      const id = created.body.id as string;
      const before = await rowOf(kind, id);
      const res = await w.callers.admin.put(
        `/api/${kind}/${id}`,
        await updateBody(kind, id, {
          id: randomUUID(),
          workspaceId: other.ws.id,
          growerId: w.b.grower.id,
          farmId: w.b.farm.id,
          fieldId: w.b.field.id,
          archivedAt: LONG_AGO,
          createdAt: LONG_AGO,
        }),
      );
      expect(res.status).toBe(200);
      const after = await rowOf(kind, id);
      expect(pick(after, PROTECTED)).toEqual(pick(before, PROTECTED));
      expect(after.version).toBe((before.version as number) + 1);
    },
  );

  it("{ role: 'admin' } sent to the preferences leaves a farmer a farmer", async () => {
    const farmer = w.callers.farmer;
    const res = await farmer.put('/api/auth/preferences', {
      unitSystem: 'metric',
      role: 'admin',
      growerId: w.b.grower.id,
    });
    expect(res.status).toBe(200);
    expect(res.body.role).toBe('farmer');
    const row = await User.findByPk(w.people.farmer.id);
    expect({ role: row!.role, growerId: row!.growerId }).toEqual({ role: 'farmer', growerId: w.a.grower.id });
    expect((await farmer.get('/api/users')).status).toBe(403);
  });

  /** A JSON body sent as text, so that `__proto__` arrives as a key (an object literal would not carry it). */
  const sendJson = (caller: Caller, method: 'post' | 'put', url: string, json: string) => {
    const agent = request(t.app);
    return (method === 'post' ? agent.post(url) : agent.put(url))
      .set('Cookie', caller.cookie)
      .set('X-Sowright-Request', '1')
      .set('Content-Type', 'application/json')
      .send(json);
  };

  it('__proto__ in a JSON body sets nothing and pollutes no prototype', async () => {
    const name = `Proto ${tag()}`;
    const poison = {
      workspaceId: other.ws.id,
      archivedAt: LONG_AGO,
      version: 999,
      role: 'admin',
      status: 'active',
    };
    const grower = await sendJson(
      w.callers.admin,
      'post',
      '/api/growers',
      `{"name":"${name}","__proto__":${JSON.stringify(poison)}}`,
    );
    expect(grower.status).toBe(201);
    expect(await rowOf('growers', grower.body.id)).toMatchObject({
      name,
      workspaceId: w.ws.id,
      archivedAt: null,
      version: 0,
    });

    const email = uniqueEmail('proto');
    const invite = await sendJson(
      w.callers.admin,
      'post',
      '/api/users',
      `{"email":"${email}","name":"Proto person","role":"agronomist","__proto__":${JSON.stringify(poison)}}`,
    );
    expect(invite.status).toBe(201);
    const person = await User.findOne({ where: { email } });
    expect({ role: person!.role, status: person!.status, workspaceId: person!.workspaceId }).toEqual({
      role: 'agronomist',
      status: 'invited',
      workspaceId: w.ws.id,
    });

    const prefs = await sendJson(
      w.callers.farmer,
      'put',
      '/api/auth/preferences',
      `{"unitSystem":"metric","__proto__":{"role":"admin"}}`,
    );
    expect(prefs.status).toBe(200);
    expect((await User.findByPk(w.people.farmer.id))!.role).toBe('farmer');

    for (const key of Object.keys(poison)) expect(Object.prototype).not.toHaveProperty(key);
  });

  it.each(['farms', 'fields', 'seasons', 'planters'] as const)(
    '%s: a duplicated growerId query parameter counts only its first value',
    async (kind) => {
      const { a, b } = { a: w.a.grower.id, b: w.b.grower.id };
      const growersOf = async (caller: Caller, query: string) => {
        const res = await caller.get(`/api/${kind}?${query}`);
        expect(res.status).toBe(200);
        return [...new Set((res.body.items as { growerId: string }[]).map((i) => i.growerId))];
      };
      expect(await growersOf(w.callers.admin, `growerId=${a}&growerId=${b}`)).toEqual([a]);
      expect(await growersOf(w.callers.admin, `growerId=${b}&growerId=${a}`)).toEqual([b]);
      expect(await growersOf(w.callers.farmer, `growerId=${a}&growerId=${b}`)).toEqual([a]);
      expect(await growersOf(w.callers.farmer, `growerId=${b}&growerId=${a}`)).toEqual([]);
    },
  );

  it('a duplicated archived query parameter counts only its first value', async () => {
    const archived = await w.callers.admin.post('/api/growers', createBody(w, 'growers', 'a'));
    expect((await w.callers.admin.post(`/api/growers/${archived.body.id}/archive`)).status).toBe(200);
    const res = await w.callers.admin.get('/api/growers?archived=only&archived=false');
    expect(res.status).toBe(200);
    const items = res.body.items as { archivedAt: string | null }[];
    expect(items.length).toBeGreaterThan(0);
    expect(items.every((i) => i.archivedAt !== null)).toBe(true);
  });
});

describe('secrets never leave the server', () => {
  const SECRET_KEYS = ['password', 'passwordHash', 'password_hash', 'tokenVersion', 'token_version'];
  const keysIn = (value: unknown): string[] =>
    Array.isArray(value)
      ? value.flatMap(keysIn)
      : value && typeof value === 'object'
        ? Object.entries(value).flatMap(([k, v]) => [k, ...keysIn(v)])
        : [];
  const expectNoSecrets = (res: request.Response) => {
    expect(res.status).toBeLessThan(300);
    expect(keysIn(res.body).filter((k) => SECRET_KEYS.includes(k))).toEqual([]);
    expect(res.text).not.toContain('$argon2');
  };

  it('in the people list, a person, an invitation and an edit', async () => {
    const admin = w.callers.admin;
    const list = await admin.get('/api/users');
    expect(list.body.items.length).toBeGreaterThanOrEqual(4);
    expectNoSecrets(list);
    expectNoSecrets(await admin.get(`/api/users/${w.people.farmer.id}`));
    expectNoSecrets(
      await admin.post('/api/users', {
        email: uniqueEmail('secret'),
        name: 'Secret check',
        role: 'consultant',
      }),
    );
    // An invited person, so that the edit (which ends their sessions) disturbs none of the signed-in callers.
    const row = await User.findByPk(invitedHere.id);
    expectNoSecrets(
      await admin.put(`/api/users/${row!.id}`, {
        name: row!.name,
        role: 'consultant',
        growerIds: [w.a.grower.id],
        version: row!.version,
      }),
    );
  });

  it('in /api/auth/me for every role, the sign-in answer and the answer to an accepted invitation', async () => {
    for (const role of ROLES) expectNoSecrets(await w.callers[role].get('/api/auth/me'));
    expectNoSecrets(
      await anonymousPost(t, '/api/auth/sign-in', {
        email: w.people.agronomist.email,
        password: TEST_PASSWORD,
      }),
    );
    const email = uniqueEmail('accept');
    expect(
      (await w.callers.admin.post('/api/users', { email, name: 'Accepting person', role: 'agronomist' }))
        .status,
    ).toBe(201);
    const token = invitationTokenIn(await t.mailbox.waitFor((m) => m.to.includes(email)));
    const { res, caller } = await acceptInvitation(t, token, 'a long fresh passphrase');
    expectNoSecrets(res);
    expectNoSecrets(await caller!.get('/api/auth/me'));
  });
});
