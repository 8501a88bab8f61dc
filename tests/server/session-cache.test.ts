import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { startTestApp, type TestApp } from '../helpers/app';
import { makeWorld, type World } from '../helpers/factory';
import { addPerson } from '../helpers/people';
import { SessionCache, forgetSession } from '../../server/lib/session-cache';
import { loadSessionUser, type SessionRow } from '../../server/middleware/authenticate';

let t: TestApp;
let w: World;
beforeAll(async () => {
  t = await startTestApp();
  w = await makeWorld(t.app, 'sessions');
});
afterAll(() => t.close());

/** A cache over the real loader that counts its trips to the database. */
async function countingCache(ttlMs = 60_000) {
  const loads: string[] = [];
  const cache = new SessionCache<SessionRow>(
    t.sequelize,
    (id) => {
      loads.push(id);
      return loadSessionUser(id);
    },
    { ttlMs },
  );
  await cache.start();
  expect(cache.active).toBe(true);
  return { cache, loads };
}

const sql = (q: string, bind: unknown[]) => t.sequelize.query(q, { bind, type: QueryTypes.RAW });

describe('the people behind sessions, kept in memory', () => {
  it('loads a person once, then answers from memory', async () => {
    const { cache, loads } = await countingCache();
    try {
      const p = await addPerson(t, w, 'agronomist');
      const first = await cache.get(p.user.id);
      const second = await cache.get(p.user.id);
      expect(first?.token_version).toBe(p.user.tokenVersion);
      expect(second).toEqual(first);
      expect(loads).toEqual([p.user.id]);
    } finally {
      await cache.stop();
    }
  });

  it('drops a person when PostgreSQL says they changed, even by SQL outside the app', async () => {
    const { cache, loads } = await countingCache();
    try {
      const p = await addPerson(t, w, 'agronomist');
      await cache.get(p.user.id);
      await sql('UPDATE users SET token_version = token_version + 1 WHERE id = $1', [p.user.id]);
      // The TTL is a minute: only the notification can make the next read go to the database.
      await expect
        .poll(async () => (await cache.get(p.user.id))?.token_version, { timeout: 3000 })
        .toBe(p.user.tokenVersion + 1);
      expect(loads.length).toBeGreaterThanOrEqual(2);

      // Status, role and the farmer's grower likewise; a sign-in time or a new name does not.
      const before = loads.length;
      await sql('UPDATE users SET last_sign_in_at = now(), name = $2 WHERE id = $1', [p.user.id, 'Renamed']);
      await sql('UPDATE users SET status = $2 WHERE id = $1', [p.user.id, 'disabled']);
      await expect.poll(async () => (await cache.get(p.user.id))?.status, { timeout: 3000 }).toBe('disabled');
      expect(loads.length).toBe(before + 1);
    } finally {
      await cache.stop();
    }
  });

  it('drops a consultant when their growers change', async () => {
    const { cache } = await countingCache();
    try {
      const c = await addPerson(t, w, 'consultant');
      expect((await cache.get(c.user.id))?.consultant_growers).toEqual([]);
      await sql('INSERT INTO consultant_growers (user_id, grower_id, workspace_id) VALUES ($1, $2, $3)', [
        c.user.id,
        w.a.grower.id,
        w.ws.id,
      ]);
      await expect
        .poll(async () => (await cache.get(c.user.id))?.consultant_growers, { timeout: 3000 })
        .toEqual([w.a.grower.id]);
      await sql('DELETE FROM consultant_growers WHERE user_id = $1', [c.user.id]);
      await expect
        .poll(async () => (await cache.get(c.user.id))?.consultant_growers, { timeout: 3000 })
        .toEqual([]);
    } finally {
      await cache.stop();
    }
  });

  it('does not keep a row loaded while the person was being changed', async () => {
    let release!: () => void;
    const gate = new Promise<void>((r) => (release = r));
    let calls = 0;
    const cache = new SessionCache<SessionRow>(t.sequelize, async (id) => {
      calls++;
      const row = await loadSessionUser(id);
      if (calls === 1) await gate; // the first load is slow: a change lands while it runs
      return row;
    });
    await cache.start();
    try {
      const p = await addPerson(t, w, 'agronomist');
      const slow = cache.get(p.user.id);
      await new Promise((r) => setTimeout(r, 50));
      forgetSession(p.user.id);
      release();
      await slow;
      await cache.get(p.user.id);
      expect(calls).toBe(2);
    } finally {
      await cache.stop();
    }
  });

  it('keeps nothing while its listening connection is down, and listens again', async () => {
    const { cache, loads } = await countingCache();
    try {
      const p = await addPerson(t, w, 'agronomist');
      await cache.get(p.user.id);
      await t.sequelize.query(
        `SELECT pg_terminate_backend(pid) FROM pg_stat_activity
          WHERE pid <> pg_backend_pid() AND query ILIKE 'LISTEN sowright_sessions%'`,
      );
      await expect.poll(() => cache.active, { timeout: 3000 }).toBe(false);
      const before = loads.length;
      await cache.get(p.user.id);
      await cache.get(p.user.id);
      expect(loads.length).toBe(before + 2);
      await expect.poll(() => cache.active, { timeout: 5000 }).toBe(true);
      await cache.get(p.user.id);
      await cache.get(p.user.id);
      expect(loads.length).toBe(before + 3);
    } finally {
      await cache.stop();
    }
  });

  it('a session ends at once through the app: sign-out, then a change made in SQL', async () => {
    const p = await addPerson(t, w, 'agronomist');
    expect((await p.caller.get('/api/auth/me')).status).toBe(200);
    expect((await p.caller.get('/api/auth/me')).status).toBe(200);
    expect((await p.caller.post('/api/auth/sign-out')).status).toBe(204);
    expect((await p.caller.get('/api/auth/me')).status).toBe(401);

    const q = await addPerson(t, w, 'agronomist');
    expect((await q.caller.get('/api/auth/me')).status).toBe(200);
    await sql('UPDATE users SET status = $2 WHERE id = $1', [q.user.id, 'disabled']);
    await expect.poll(async () => (await q.caller.get('/api/auth/me')).status, { timeout: 3000 }).toBe(401);
  });
});

describe('API answers', () => {
  it('are never stored by a browser or a proxy, and carry no ETag', async () => {
    const res = await w.callers.agronomist.get(`/api/growers/${w.a.grower.id}`);
    expect(res.status).toBe(200);
    expect(res.body.id).toBe(w.a.grower.id);
    expect(res.headers['cache-control']).toBe('no-store');
    expect(res.headers.etag).toBeUndefined();
  });
});
