import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { startTestApp, type TestApp } from '../helpers/app';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp();
});
afterAll(() => t.close());

describe('GET /api/health', () => {
  it('answers the version, database reachability and the PostGIS version', async () => {
    const res = await request(t.app).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body.version).toBe('test');
    expect(res.body.database).toBe('reachable');
    expect(res.body.postgis).toMatch(/^3\.\d+\.\d+/);
    expect(['starting', 'ready']).toContain(res.body.logReader);
  });

  it("says when the log reader's thread has started and warmed up", async () => {
    await expect
      .poll(async () => (await request(t.app).get('/api/health')).body.logReader, { timeout: 30_000 })
      .toBe('ready');
  });

  it('answers unknown API routes with a 404 in the error shape', async () => {
    const res = await request(t.app).get('/api/nothing-here');
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
  });

  it('runs on a database that will not lose committed data', async () => {
    const [rows] = await t.sequelize.query(
      "SELECT current_setting('fsync') f, current_setting('synchronous_commit') s, current_setting('full_page_writes') p",
    );
    expect(rows).toEqual([{ f: 'on', s: 'on', p: 'on' }]);
  });
});
