import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import shp from 'shpjs';
import yauzl from 'yauzl';
import type { Feature, MultiPolygon, Polygon, Position } from 'geojson';
import { geodesicAreaM2 } from '../../shared/geo/geodesic-area';
import type { ZoneMap } from '../../shared/schemas/zone-map.schema';
import {
  WGS84_PRJ,
  dbfFieldNames,
  writePolygonShapefile,
  zipShapefile,
} from '../../server/lib/shapefile-write';
import { startTestApp, type TestApp } from '../helpers/app';
import { makeWorld, type World } from '../helpers/factory';
import { addZone, cell, createMap, getBytes, multi, polygon, rel, tidy } from './zone-maps.helpers';

let t: TestApp;
let w: World;
let map: ZoneMap;
let dir: string;

/** The map every export test reads: a non-ASCII name, a zone with a hole, a two-part zone, a default zone. */
const SOUTH = 'Zone süd – Bäche';
beforeAll(async () => {
  t = await startTestApp();
  w = await makeWorld(t.app, 'zone-export');
  dir = mkdtempSync(path.join(os.tmpdir(), 'sowright-zone-export-'));
  const agro = w.callers.agronomist;
  let m = await createMap(agro, w, 'Spring plan');
  m = await addZone(agro, m, SOUTH, polygon(cell(0, 0, 1, 0.2)), { classValue: 1, productivityIndex: 0.9 });
  m = await addZone(
    agro,
    m,
    'Ring',
    polygon(cell(0.05, 0.25, 0.45, 0.95), cell(0.15, 0.45, 0.35, 0.65).reverse()),
    { classValue: 2 },
  );
  m = await addZone(agro, m, 'Pair', multi([cell(0.6, 0.25, 0.95, 0.5)], [cell(0.6, 0.65, 0.95, 0.95)]), {
    classValue: 3,
    productivityIndex: 1.2,
  });
  map = await tidy(agro, m);
});
afterAll(async () => {
  rmSync(dir, { recursive: true, force: true });
  await t.close();
});

/** 0.01 % (issue 3, "Areas" and "Export"). */
const AREA_TOLERANCE = 1e-4;

/** Twice the signed planar area of a ring: positive when counter-clockwise (shoelace; derived). */
function shoelace(ring: Position[]): number {
  let s = 0;
  for (let i = 0; i + 1 < ring.length; i++) s += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
  return s;
}

function insideRing(p: Position, ring: Position[]): boolean {
  let inside = false;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const [xi, yi] = ring[i];
    const [xj, yj] = ring[j];
    if (yi > p[1] !== yj > p[1] && p[0] < ((xj - xi) * (p[1] - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}

/** Polygons and holes of a geometry, as counts: [[holes of part 1], …] sorted, for comparing readers. */
const shapeOf = (g: Polygon | MultiPolygon) =>
  (g.type === 'Polygon' ? [g.coordinates] : g.coordinates).map((rings) => rings.length - 1).sort();

type Read = { name: string; class: number | null; geometry: Polygon | MultiPolygon };

/** What the map says each zone is, by name. */
function expected() {
  return new Map(
    map.zones.features.map((f) => [
      f.properties.name,
      { class: f.properties.classValue, areaM2: f.properties.areaM2, shape: shapeOf(f.geometry) },
    ]),
  );
}

/** The same zones, names, classes, ellipsoidal areas (within 0.01 %) and holes as the map. */
function expectSameZones(read: Read[]) {
  const want = expected();
  expect(read.map((r) => r.name).sort()).toEqual([...want.keys()].sort());
  for (const r of read) {
    const e = want.get(r.name)!;
    expect(r.class, r.name).toBe(e.class);
    expect(rel(geodesicAreaM2(r.geometry), e.areaM2), r.name).toBeLessThan(AREA_TOLERANCE);
    expect(shapeOf(r.geometry), r.name).toEqual(e.shape);
  }
}

const exportOf = (format: string) =>
  getBytes(w.callers.consultant, `/api/zone-maps/${map.id}/export?format=${format}`);

function unzipEntries(buf: Buffer): Promise<Map<string, Buffer>> {
  return new Promise((resolve, reject) => {
    yauzl.fromBuffer(buf, { lazyEntries: true }, (err, zip) => {
      if (err || !zip) return reject(err);
      const out = new Map<string, Buffer>();
      zip.on('entry', (entry: yauzl.Entry) => {
        zip.openReadStream(entry, (e, stream) => {
          if (e || !stream) return reject(e);
          const chunks: Buffer[] = [];
          stream.on('data', (c: Buffer) => chunks.push(c));
          stream.on('end', () => {
            out.set(entry.fileName, Buffer.concat(chunks));
            zip.readEntry();
          });
        });
      });
      zip.on('end', () => resolve(out));
      zip.readEntry();
    });
  });
}

describe('the map to export', () => {
  it('has its zones adding up to the boundary', () => {
    expect(map.zones.features.length).toBe(4);
    expect(map.analysis.overlaps).toEqual([]);
    const total = map.zones.features.reduce((s, f) => s + f.properties.areaM2, 0);
    expect(rel(total, map.analysis.boundaryAreaM2)).toBeLessThan(AREA_TOLERANCE);
  });
});

describe('GeoJSON export', () => {
  it('is RFC 7946: media type, no crs, 7 decimals, counter-clockwise outer rings, the agreed properties', async () => {
    const res = await exportOf('geojson');
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^application\/geo\+json/);
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="[A-Za-z0-9_-]+\.geojson"$/);
    const doc = JSON.parse((res.body as Buffer).toString('utf8'));
    expect(doc.type).toBe('FeatureCollection');
    expect(doc.crs).toBeUndefined();
    for (const f of doc.features as Feature<MultiPolygon>[]) {
      expect(Object.keys(f.properties!).sort()).toEqual(['area_ac', 'area_ha', 'class', 'index', 'name']);
      for (const rings of f.geometry.coordinates) {
        rings.forEach((ring, i) => {
          expect(Math.sign(shoelace(ring)), `${f.properties!.name} ring ${i}`).toBe(i === 0 ? 1 : -1);
          for (const c of ring.flat()) expect(Math.abs(c * 1e7 - Math.round(c * 1e7))).toBeLessThan(1e-6);
        });
      }
      const area = geodesicAreaM2(f.geometry);
      expect(rel(f.properties!.area_ha * 10_000, area)).toBeLessThan(AREA_TOLERANCE);
      // International acre = 4046.8564224 m² (DOMAIN.md §1, NIST SP 811).
      expect(rel(f.properties!.area_ac * 4046.8564224, area)).toBeLessThan(AREA_TOLERANCE);
    }
    expectSameZones(
      doc.features.map((f: Feature<MultiPolygon>) => ({
        name: f.properties!.name,
        class: f.properties!.class,
        geometry: f.geometry,
      })),
    );
    expect(doc.features.find((f: Feature) => f.properties!.name === SOUTH).properties.index).toBe(0.9);
  });
});

describe('shapefile export', () => {
  let zip: Buffer;
  let fileName: string;
  beforeAll(async () => {
    const res = await exportOf('shapefile');
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/zip');
    fileName = /filename="([^"]+)"/.exec(res.headers['content-disposition'])![1];
    zip = res.body as Buffer;
    writeFileSync(path.join(dir, fileName), zip);
  });

  it('names the file by grower, field, zone map and version, safely on every system', async () => {
    expect(fileName).toMatch(/^[A-Za-z0-9_-]+\.zip$/);
    expect(fileName).toBe('grower-a_grower-a-field_spring-plan_v1.zip');
    const entries = await unzipEntries(zip);
    const base = fileName.replace(/\.zip$/, '');
    expect([...entries.keys()].sort()).toEqual(
      ['cpg', 'dbf', 'prj', 'shp', 'shx'].map((e) => `${base}.${e}`),
    );
    expect(entries.get(`${base}.prj`)!.toString('ascii')).toBe(
      // FORMATS.md, "WGS84 .prj", byte for byte.
      'GEOGCS["GCS_WGS_1984",DATUM["D_WGS_1984",SPHEROID["WGS_1984",6378137.0,298.257223563]],PRIMEM["Greenwich",0.0],UNIT["Degree",0.0174532925199433]]',
    );
    expect(entries.get(`${base}.cpg`)!.toString('ascii')).toBe('UTF-8');
  });

  it('winds outer rings clockwise and holes counter-clockwise in the .shp itself', async () => {
    const entries = await unzipEntries(zip);
    const shpFile = entries.get(fileName.replace(/\.zip$/, '.shp'))!;
    expect(shpFile.readInt32BE(0)).toBe(9994);
    expect(shpFile.readInt32LE(28)).toBe(1000);
    expect(shpFile.readInt32BE(24) * 2).toBe(shpFile.length);
    let at = 100;
    let records = 0;
    let holesSeen = 0;
    while (at < shpFile.length) {
      const len = shpFile.readInt32BE(at + 4) * 2;
      const c = at + 8;
      expect(shpFile.readInt32LE(c)).toBe(5);
      const nParts = shpFile.readInt32LE(c + 36);
      const nPoints = shpFile.readInt32LE(c + 40);
      const starts = Array.from({ length: nParts }, (_, i) => shpFile.readInt32LE(c + 44 + 4 * i));
      const pts = Array.from({ length: nPoints }, (_, i) => {
        const o = c + 44 + 4 * nParts + 16 * i;
        return [shpFile.readDoubleLE(o), shpFile.readDoubleLE(o + 8)];
      });
      const rings = starts.map((s, i) => pts.slice(s, starts[i + 1] ?? nPoints));
      rings.forEach((ring, i) => {
        // A hole lies inside an odd number of the record's other rings (an island in a hole, inside two, is outer).
        const depth = rings.filter((other, j) => j !== i && insideRing(ring[0], other)).length;
        const hole = depth % 2 === 1;
        if (hole) holesSeen++;
        expect(Math.sign(shoelace(ring))).toBe(hole ? 1 : -1);
        expect(ring[0]).toEqual(ring[ring.length - 1]);
      });
      at = c + len;
      records++;
    }
    expect(records).toBe(map.zones.features.length);
    expect(holesSeen).toBeGreaterThanOrEqual(4);
  });

  it('reads back the same in shpjs: zones, names (non-ASCII intact), classes, areas and holes', async () => {
    const read = await shp(zip);
    expect(Array.isArray(read)).toBe(false);
    const fc = read as GeoJSON.FeatureCollection<Polygon | MultiPolygon>;
    expectSameZones(
      fc.features.map((f) => ({
        name: f.properties!.name as string,
        // parsedbf reads a blank number as NaN; the field is empty, which is null.
        class: Number.isNaN(f.properties!.class) ? null : (f.properties!.class as number),
        geometry: f.geometry,
      })),
    );
    expect(fc.features.map((f) => f.properties!.name)).toContain(SOUTH);
  });

  it("reads back the same in GDAL's ogr2ogr and ogrinfo", () => {
    const src = `/vsizip/${path.join(dir, fileName)}`;
    const info = execFileSync('ogrinfo', ['-al', '-so', src], { encoding: 'utf8' });
    expect(info).toMatch(/Geometry: Polygon/);
    expect(info).toMatch(new RegExp(`Feature Count: ${map.zones.features.length}\\b`));
    for (const field of ['name: String', 'class: Integer', 'index: Real', 'area_ha: Real', 'area_ac: Real'])
      expect(info).toContain(field);
    expect(info).toMatch(/WGS 84|WGS_1984/);

    const out = path.join(dir, 'gdal.geojson');
    execFileSync('ogr2ogr', ['-f', 'GeoJSON', out, src]);
    const fc = JSON.parse(readFileSync(out, 'utf8')) as GeoJSON.FeatureCollection<Polygon | MultiPolygon>;
    expectSameZones(
      fc.features.map((f) => ({
        name: f.properties!.name,
        class: f.properties!.class,
        geometry: f.geometry,
      })),
    );
    expect(fc.features.map((f) => f.properties!.name)).toContain(SOUTH);
  });

  it('answers 400 for an unknown format', async () => {
    const res = await w.callers.agronomist.get(`/api/zone-maps/${map.id}/export?format=kml`);
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toEqual(['format']);
  });
});

describe('the shapefile writer', () => {
  it('makes unique ASCII field names of at most 10 characters', () => {
    const names = dbfFieldNames([
      'name',
      'productivity_index',
      'productivity_class',
      'Bäche',
      '2nd',
      'NAME',
      'a b/c',
    ]);
    expect(names).toEqual(['name', 'productivi', 'producti_1', 'Bache', 'F_2nd', 'NAME_1', 'a_b_c']);
    for (const n of names) expect(n).toMatch(/^[A-Za-z][A-Za-z0-9_]{0,9}$/);
  });

  it('keeps long and non-ASCII text whole, writes a null shape for a missing geometry, and GDAL reads it', async () => {
    const long = `Südhang ${'ä'.repeat(50)} – Ende`;
    const parts = writePolygonShapefile(
      [
        {
          geometry: { type: 'MultiPolygon', coordinates: [[cell(0, 0, 1, 1)]] },
          properties: { label: long, n: 1 },
        },
        { geometry: null, properties: { label: 'nothing', n: null } },
      ],
      [
        { key: 'label', type: 'C' },
        { key: 'n', type: 'N', width: 5, decimals: 0 },
      ],
    );
    expect(parts.prj).toBe(WGS84_PRJ);
    const file = path.join(dir, 'writer.zip');
    writeFileSync(file, await zipShapefile('writer', parts));
    const out = path.join(dir, 'writer.geojson');
    execFileSync('ogr2ogr', ['-f', 'GeoJSON', out, `/vsizip/${file}`]);
    const fc = JSON.parse(readFileSync(out, 'utf8')) as GeoJSON.FeatureCollection;
    expect(fc.features.map((f) => f.properties)).toEqual([
      { label: long, n: 1 },
      { label: 'nothing', n: null },
    ]);
    expect(fc.features[1].geometry).toBeNull();
  });
});

describe('who may export', () => {
  it("answers 404 for another workspace's map, and 401 without a session", async () => {
    const other = await makeWorld(t.app, 'zone-export-other');
    const res = await other.callers.admin.get(`/api/zone-maps/${map.id}/export?format=geojson`);
    expect(res.status).toBe(404);
    const theirs = await createMap(other.callers.agronomist, other, 'Theirs');
    expect((await request(t.app).get(`/api/zone-maps/${theirs.id}/export?format=geojson`)).status).toBe(401);
    expect((await w.callers.admin.get(`/api/zone-maps/${theirs.id}/export?format=shapefile`)).status).toBe(
      404,
    );
  });
});
