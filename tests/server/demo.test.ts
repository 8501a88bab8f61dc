import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { startTestApp, signIn, type TestApp } from '../helpers/app';
import { DEMO_USERS, DEMO_WORKSPACE } from '../../server/db/seeders/20261202-0001-demo';
import type { Diagnostics } from '../../shared/schemas/as-applied.schema';

// `npm test` seeds the demo into its throwaway database, as `npm start` does.
let t: TestApp;
beforeAll(async () => {
  t = await startTestApp();
});
afterAll(() => t.close());

describe('the demo', () => {
  it('has one person per role who can sign in with the password the README gives', async () => {
    expect(DEMO_USERS.map((u) => u.role).sort()).toEqual(['admin', 'agronomist', 'consultant', 'farmer']);
    for (const u of DEMO_USERS) {
      const caller = await signIn(t.app, u.email, u.password);
      const me = await caller.get('/api/auth/me');
      expect(me.body.role).toBe(u.role);
      expect(me.body.workspace.name).toBe(DEMO_WORKSPACE);
    }
  });

  it('gives every demo field a valid boundary and a zone map whose zones add up to it', async () => {
    const rows = await t.sequelize.query<{
      field: string;
      valid: boolean;
      field_m2: number;
      zones_m2: number;
      n: number;
    }>(
      `SELECT f.name AS field, ST_IsValid(f.boundary) AS valid, f.area_m2 AS field_m2,
              sum(z.area_m2) AS zones_m2, count(z.id)::int AS n
         FROM fields f
         JOIN workspaces w ON w.id = f.workspace_id AND w.name = :ws
         JOIN zone_maps m ON m.field_id = f.id AND m.name = 'Yield history zones'
         JOIN zones z ON z.zone_map_id = m.id
        GROUP BY f.name, f.boundary, f.area_m2`,
      { replacements: { ws: DEMO_WORKSPACE }, type: QueryTypes.SELECT },
    );
    expect(rows).toHaveLength(6);
    for (const r of rows) {
      expect(r.valid).toBe(true);
      expect(r.n).toBe(3);
      // Zones are cut from the boundary, so their ellipsoidal areas add up to it (derived; 0.01 % allows rounding).
      expect(Math.abs(r.zones_m2 - r.field_m2) / r.field_m2).toBeLessThan(1e-4);
    }
  });

  it('gives every demo field an approved prescription whose planter check passes or was accepted with a reason', async () => {
    const agronomist = DEMO_USERS.find((u) => u.role === 'agronomist')!;
    const caller = await signIn(t.app, agronomist.email, agronomist.password);
    const list = (await caller.get('/api/prescriptions?status=approved')).body.items as {
      id: string;
      fieldId: string;
    }[];
    expect(new Set(list.map((i) => i.fieldId)).size).toBe(6);
    let accepted = 0;
    for (const item of list) {
      const rx = (await caller.get(`/api/prescriptions/${item.id}`)).body;
      expect(rx.zones).toHaveLength(3);
      // Rates by rule: every zone within the bounds, and the zones do not all share one rate.
      for (const z of rx.zones) {
        expect(z.rateSi).toBeGreaterThanOrEqual(rx.minRateSi - 1e-12);
        expect(z.rateSi).toBeLessThanOrEqual(rx.maxRateSi + 1e-12);
      }
      expect(new Set(rx.zones.map((z: { rateSi: number }) => z.rateSi)).size).toBeGreaterThan(1);
      if (rx.check?.blocking) {
        expect(rx.acceptance?.reason.length).toBeGreaterThan(20);
        accepted++;
      }
      expect(rx.totals.field.unitsToOrder).toBeGreaterThan(0);
    }
    expect(accepted).toBeLessThan(6);
  });

  it('gives every demo field a log whose audit names its injected fault', async () => {
    const agronomist = DEMO_USERS.find((u) => u.role === 'agronomist')!;
    const caller = await signIn(t.app, agronomist.email, agronomist.password);
    const logs = (await caller.get('/api/logs')).body.items as {
      id: string;
      fieldName: string;
      status: string;
    }[];
    expect(new Set(logs.map((l) => l.fieldName)).size).toBe(6);
    const findings: Record<string, { kind: string; text: string }[]> = {};
    const diagnostics: Record<string, Diagnostics> = {};
    for (const l of logs) {
      expect(l.status).toBe('ready');
      const result = (await caller.get(`/api/logs/${l.id}/audit`)).body.result;
      findings[l.fieldName] = result.findings;
      diagnostics[l.fieldName] = result.diagnostics;
    }
    // server/db/seeders/20261202-0004-demo-logs.ts: 8 % wheel slip → 1 / 0.92 − 1 = 8.7 % hidden (DOMAIN.md §5).
    const nq = findings['North quarter'][0];
    expect(nq.kind).toBe('speed-source');
    expect(nq.text).toMatch(/wheel speed: about 8\.7 % more seed/);
    // A radar reading 4 % fast over the field → 1 / 0.96 − 1 = 4.2 % (derived).
    expect(findings['Long strip'][0].text).toMatch(/about 4\.2 % more seed/);
    // The disc at its top speed in the highest-rate zone: about 8 % short there.
    const short = findings['Schoolhouse forty'].find((f) => f.kind === 'zone-off');
    expect(short?.text).toMatch(/Better ground got [78]\.\d % less than prescribed/);
    expect(findings['Schoolhouse forty'].find((f) => f.kind === 'disc-limit')?.text).toMatch(
      /^In Better ground the seed disc was at its top speed/,
    );
    // Controller lag of 3 s at the planned 5.5 mph: 2.4587 m/s × 3 s = 7.38 m = 24 ft (DOMAIN.md §6, derived).
    expect(findings['Creek bend'].find((f) => f.kind === 'lag')?.text).toMatch(
      /about 3\.0 s to follow a change of rate .*about 24 ft/,
    );
    // Row 7 at 0.9 × the others (the demo's injected fault).
    expect(findings['Pond field'].find((f) => f.kind === 'row')?.text).toMatch(
      /^Row 7 stands apart in population: 10\.0 % below/,
    );
    // Passes 1.5 m closer than the swath: about 1.5 / (swath − 1.5) of the field doubled.
    expect(findings['West slope'].find((f) => f.kind === 'coverage')?.text).toMatch(
      /planted twice .* Sections of/,
    );
    // An erratic rate: more alarms after 2 s than after 30 s, and out-of-band time no 30 s alarm reports.
    const [quick, slow] = diagnostics['West slope'].alarms;
    expect(quick.count).toBeGreaterThan(slow.count);
    expect(slow.unreportedTimeS).toBeGreaterThan(quick.unreportedTimeS);
    expect(findings['West slope'].some((f) => f.kind === 'alarm')).toBe(true);
  });

  it('is seeded once: running the seeders again adds nothing', async () => {
    const count = async () =>
      (
        await t.sequelize.query<{ n: number }>(
          `SELECT (SELECT count(*) FROM workspaces WHERE name = :ws)::int + (SELECT count(*) FROM zone_maps m JOIN workspaces w ON w.id = m.workspace_id WHERE w.name = :ws AND m.name = 'Yield history zones')::int AS n`,
          { replacements: { ws: DEMO_WORKSPACE }, type: QueryTypes.SELECT },
        )
      )[0].n;
    const before = await count();
    const { up: demo } = await import('../../server/db/seeders/20261202-0001-demo');
    const { up: zones } = await import('../../server/db/seeders/20261202-0002-demo-zones');
    await demo({ context: t.sequelize });
    await zones({ context: t.sequelize });
    const prescriptions = async () =>
      (
        await t.sequelize.query<{ n: number }>(
          'SELECT count(*)::int AS n FROM prescriptions p JOIN workspaces w ON w.id = p.workspace_id WHERE w.name = :ws',
          { replacements: { ws: DEMO_WORKSPACE }, type: QueryTypes.SELECT },
        )
      )[0].n;
    const rxBefore = await prescriptions();
    const { up: rx } = await import('../../server/db/seeders/20261202-0003-demo-prescriptions');
    await rx({ context: t.sequelize });
    expect(await prescriptions()).toBe(rxBefore);
    expect(await count()).toBe(before);
    expect(before).toBe(7);
  });
});
