/**
 * The prescription files read back by independent readers: shpjs and GDAL (ogrinfo, ogr2ogr) for shapefiles and
 * GeoJSON, @xmldom/xmldom for ISO 11783-10 task data, and the grid binary decoded by hand.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import shp from 'shpjs';
import * as turf from '@turf/turf';
import yauzl from 'yauzl';
import { DOMParser, type Element as XmlElement } from '@xmldom/xmldom';
import type { FeatureCollection, MultiPolygon, Polygon, Position } from 'geojson';
import { GeoInputError } from '../../shared/geo/geo-input-error';
import { geodesicAreaM2 } from '../../shared/geo/geodesic-area';
import { offsetPosition } from '../../shared/geo/offset-position';
import {
  type PrescriptionExportInput,
  prescriptionGeoJson,
  prescriptionShapefile,
  prescriptionTaskData,
} from '../../server/lib/prescription-files';
import { ddiHex, ddiValue } from '../../server/lib/taskdata-write';

/** 0.01 % (DEVELOPERS.md, zone export; issue 3 "Areas"). */
const AREA_TOLERANCE = 1e-4;
/** International acre, exact (DOMAIN.md §1, NIST SP 811 B.8). */
const M2_PER_AC = 4046.8564224;
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

/* ------------------------------------------------------------------------------------------- the field */

/*
 * An invented field: 400 m east by 300 m north from (−93.6, 42.0), positions at 7 decimals like stored data.
 * "Zone du Grand-Étang ★" is the west part (to 213 m) with a hole (50–150 m × 100–200 m) that the zone "Island"
 * fills; "South-east" is two parts east of 213 m (0–90 m and 110–200 m north); the rest is in no zone.
 */
const O: [number, number] = [-93.6, 42.0];
const r7 = (v: number) => Math.round(v * 1e7) / 1e7;
const lonAt = (m: number) => r7(offsetPosition(O, m, 0)[0]);
const latAt = (m: number) => r7(offsetPosition(O, 0, m)[1]);
/** A counter-clockwise rectangle from west, south, east, north in metres from O. */
const box = (w: number, s: number, e: number, n: number): Position[] => [
  [lonAt(w), latAt(s)],
  [lonAt(e), latAt(s)],
  [lonAt(e), latAt(n)],
  [lonAt(w), latAt(n)],
  [lonAt(w), latAt(s)],
];
const multi = (...polys: Position[][][]): MultiPolygon => ({ type: 'MultiPolygon', coordinates: polys });

const ETANG = 'Zone du Grand-Étang ★';
const PRODUCT = 'Hybrid "A&B" <early>';
const DEFAULT_NAME = 'Not in any zone (default rate)';
/** Seeds per acre of each region; the field's default 32 000, out of field 0. */
const PER_AC: Record<string, number> = {
  [ETANG]: 34_000,
  Island: 30_000,
  'South-east': 36_000,
  [DEFAULT_NAME]: 32_000,
};
const si = (perAc: number) => perAc / M2_PER_AC;

const boundary = multi([box(0, 0, 400, 300)]);
const cw = (ring: Position[]) => [...ring].reverse();
/** Wound both ways on purpose (Étang and Island clockwise, South-east counter-clockwise): writers must rewind. */
const zoneGeoms: Record<string, MultiPolygon> = {
  [ETANG]: multi([cw(box(0, 0, 213, 300)), box(50, 100, 150, 200)]),
  Island: multi([cw(box(50, 100, 150, 200))]),
  'South-east': multi([box(213, 0, 400, 90)], [box(213, 110, 400, 200)]),
};

function makeInput(over: Partial<PrescriptionExportInput> = {}): PrescriptionExportInput {
  return {
    growerName: 'Prairie Bend Ag',
    farmName: 'Home place',
    fieldName: 'North 40',
    prescriptionName: 'Corn 2027',
    versionNo: 3,
    productName: PRODUCT,
    crop: 'corn',
    rateKind: 'count',
    rateUnit: 'seeds/ac',
    boundary,
    boundaryAreaM2: geodesicAreaM2(boundary),
    zones: Object.entries(zoneGeoms).map(([name, geometry]) => ({
      name,
      rateSi: si(PER_AC[name]),
      // What PostGIS would store: the ellipsoidal area (GeographicLib, DOMAIN.md §2).
      areaM2: geodesicAreaM2(geometry),
      geometry,
    })),
    defaultRateSi: si(32_000),
    outOfFieldRateSi: 0,
    approvedAt: '2027-03-01T12:00:00.000Z',
    ...over,
  };
}
const input = makeInput();

/** Expected area of each region: the zones as given, the default the boundary less the zones (derived). */
const expectedArea: Record<string, number> = Object.fromEntries(input.zones.map((z) => [z.name, z.areaM2]));
expectedArea[DEFAULT_NAME] = input.boundaryAreaM2 - input.zones.reduce((s, z) => s + z.areaM2, 0);

/** Which region a position lies in, by its distance east and north of O (metres, to about 1 mm). */
function regionAt(lon: number, lat: number): string | null {
  const x = ((lon - O[0]) / (lonAt(400) - O[0])) * 400;
  const y = ((lat - O[1]) / (latAt(300) - O[1])) * 300;
  if (x < 0 || y < 0 || x > 400 || y > 300) return null;
  if (x >= 50 && x < 150 && y >= 100 && y < 200) return 'Island';
  if (x < 213) return ETANG;
  if (y < 90 || (y >= 110 && y < 200)) return 'South-east';
  return DEFAULT_NAME;
}

/* ------------------------------------------------------------------------------------------- readers */

/** Twice the signed planar area of a ring: positive when counter-clockwise (shoelace; derived). */
function shoelace(ring: Position[]): number {
  let s = 0;
  for (let i = 0; i + 1 < ring.length; i++) s += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
  return s;
}

/** Every entry of a zip, by name (yauzl, entry by entry). */
async function entriesOf(zipBytes: Buffer): Promise<Map<string, Buffer>> {
  const zip = await new Promise<yauzl.ZipFile>((ok, fail) =>
    yauzl.fromBuffer(zipBytes, { lazyEntries: true }, (e, z) => (e || !z ? fail(e) : ok(z))),
  );
  const found = new Map<string, Buffer>();
  await new Promise<void>((done, fail) => {
    zip.on('error', fail);
    zip.on('end', () => done());
    zip.on('entry', (entry: yauzl.Entry) =>
      zip.openReadStream(entry, async (e, stream) => {
        if (e || !stream) return fail(e);
        const parts: Buffer[] = [];
        for await (const chunk of stream) parts.push(chunk as Buffer);
        found.set(entry.fileName, Buffer.concat(parts));
        zip.readEntry();
      }),
    );
    zip.readEntry();
  });
  return found;
}

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(path.join(os.tmpdir(), 'sowright-rx-files-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** GDAL's reading: ogrinfo's summary and ogr2ogr's GeoJSON of the file. */
function gdalRead(file: string, src = file) {
  const summary = execFileSync('ogrinfo', ['-al', '-so', src], { encoding: 'utf8' });
  const out = path.join(dir, `gdal-${path.basename(file)}.json`);
  rmSync(out, { force: true });
  execFileSync('ogr2ogr', ['-f', 'GeoJSON', out, src]);
  return { summary, fc: JSON.parse(readFileSync(out, 'utf8')) as FeatureCollection<Polygon | MultiPolygon> };
}

type ReadFeature = { properties: Record<string, unknown> | null; geometry: Polygon | MultiPolygon };

/** Zone layout as any reader gives it back: one feature per region, its rate and area as written. */
function expectZones(features: ReadFeature[]) {
  const names = features.map((f) => f.properties!.zone as string);
  expect(names.sort()).toEqual(Object.keys(PER_AC).sort());
  expect(names).toContain(ETANG);
  for (const f of features) {
    const p = f.properties!;
    const name = p.zone as string;
    expect(p.rate, name).toBe(PER_AC[name]);
    expect(p.unit, name).toBe('seeds/ac');
    expect(rel(p.rate_si as number, si(PER_AC[name])), name).toBeLessThan(1e-9);
    const area = geodesicAreaM2(f.geometry);
    expect(rel(area, expectedArea[name]), name).toBeLessThan(AREA_TOLERANCE);
    expect(rel((p.area_ha as number) * 10_000, area), name).toBeLessThan(AREA_TOLERANCE);
    expect(rel((p.area_ac as number) * M2_PER_AC, area), name).toBeLessThan(AREA_TOLERANCE);
  }
}

/** 10 m grid: a feature per cell in the field, named and rated after the region holding its centre. */
function expectGrid(features: ReadFeature[]) {
  // Derived: 400 / 10 × 300 / 10 cells, the zone lines lying on cell edges.
  expect(features.length).toBe(40 * 30);
  let total = 0;
  for (const f of features) {
    const ring = (f.geometry.type === 'Polygon' ? f.geometry.coordinates : f.geometry.coordinates[0])[0];
    const lon = (Math.min(...ring.map((q) => q[0])) + Math.max(...ring.map((q) => q[0]))) / 2;
    const lat = (Math.min(...ring.map((q) => q[1])) + Math.max(...ring.map((q) => q[1]))) / 2;
    const region = regionAt(lon, lat);
    expect(f.properties!.zone, `${lon},${lat}`).toBe(region);
    expect(f.properties!.rate).toBe(PER_AC[region!]);
    const area = geodesicAreaM2(f.geometry);
    expect(rel((f.properties!.area_ha as number) * 10_000, area)).toBeLessThan(AREA_TOLERANCE);
    total += area;
  }
  expect(rel(total, input.boundaryAreaM2)).toBeLessThan(AREA_TOLERANCE);
}

/**
 * The rings of every record of a .shp, read raw (ESRI 1998: a 100-byte header, then per record a big-endian
 * number and length in 16-bit words, and a little-endian Polygon: type 5, box, part and point counts, the
 * index of each part's first point, the points).
 */
function shpRecords(shpFile: Buffer): Position[][][] {
  const records: Position[][][] = [];
  for (let at = 100; at < shpFile.length; at += 8 + 2 * shpFile.readInt32BE(at + 4)) {
    const rec = shpFile.subarray(at + 8);
    expect(rec.readInt32LE(0)).toBe(5);
    const [parts, points] = [rec.readInt32LE(36), rec.readInt32LE(40)];
    const first = [...Array(parts).keys()].map((k) => rec.readInt32LE(44 + 4 * k)).concat(points);
    const xy = (k: number): Position => [0, 8].map((d) => rec.readDoubleLE(44 + 4 * parts + 16 * k + d));
    records.push(first.slice(0, -1).map((s, k) => [...Array(first[k + 1] - s).keys()].map((j) => xy(s + j))));
  }
  return records;
}

/** Outer rings clockwise and holes counter-clockwise as read raw from the .shp (ESRI 1998, FORMATS.md). */
function expectShapefileWinding(shpFile: Buffer, records: number): number {
  const read = shpRecords(shpFile);
  expect(read.length).toBe(records);
  let holes = 0;
  for (const rings of read) {
    rings.forEach((ring, i) => {
      const around = rings.filter(
        (o, j) => j !== i && turf.booleanPointInPolygon(ring[0], turf.polygon([o])),
      );
      const hole = around.length % 2 === 1;
      holes += hole ? 1 : 0;
      expect(Math.sign(shoelace(ring)), hole ? 'hole' : 'outer ring').toBe(hole ? 1 : -1);
    });
  }
  return holes;
}

/* ------------------------------------------------------------------------------------------- GeoJSON */

describe.each(['zones', 'grid'] as const)('GeoJSON, %s layout', (layout) => {
  const file = prescriptionGeoJson(input, { layout, cellSizeM: 10 });
  const doc = JSON.parse(file.body.toString('utf8')) as FeatureCollection<MultiPolygon>;
  const check = layout === 'zones' ? expectZones : expectGrid;

  it('is RFC 7946: media type, file name, no crs, 7 decimals, exterior rings counter-clockwise', () => {
    expect(file.contentType).toBe('application/geo+json');
    // The naming rule (DEVELOPERS.md): grower, field, product, version, "-grid" when gridded.
    expect(file.fileName).toBe(
      `prairie-bend-ag_north-40_hybrid-a-b-early_v3${layout === 'grid' ? '-grid' : ''}.geojson`,
    );
    expect(doc.type).toBe('FeatureCollection');
    expect('crs' in doc).toBe(false);
    for (const f of doc.features) {
      expect(Object.keys(f.properties!).sort()).toEqual([
        'area_ac',
        'area_ha',
        'rate',
        'rate_si',
        'unit',
        'zone',
      ]);
      expect(f.geometry.type).toBe('MultiPolygon');
      for (const rings of f.geometry.coordinates) {
        rings.forEach((ring, i) => {
          expect(Math.sign(shoelace(ring))).toBe(i === 0 ? 1 : -1);
          for (const v of ring.flat()) expect(Math.abs(v * 1e7 - Math.round(v * 1e7))).toBeLessThan(1e-6);
        });
      }
    }
  });

  it('reads back whole as JSON: regions, rates, areas (and the hole)', () => {
    check(doc.features);
    if (layout === 'zones') {
      const etang = doc.features.find((f) => f.properties!.zone === ETANG)!;
      expect(etang.geometry.coordinates[0].length).toBe(2);
      expect(doc.features.find((f) => f.properties!.zone === 'South-east')!.geometry.coordinates.length).toBe(
        2,
      );
    }
  });

  it('reads back the same in GDAL', () => {
    const where = path.join(dir, file.fileName);
    writeFileSync(where, file.body);
    const { summary, fc } = gdalRead(where);
    expect(summary).toMatch(new RegExp(`Feature Count: ${doc.features.length}\\b`));
    expect(summary).toMatch(/zone: String/);
    check(fc.features);
  });
});

/* ------------------------------------------------------------------------------------------- shapefile */

describe.each(['zones', 'grid'] as const)('shapefile, %s layout', (layout) => {
  let zip: Buffer;
  let fileName: string;
  beforeAll(async () => {
    const file = await prescriptionShapefile(input, { layout, cellSizeM: 10 });
    expect(file.contentType).toBe('application/zip');
    zip = file.body;
    fileName = file.fileName;
    writeFileSync(path.join(dir, fileName), zip);
  });
  const check = layout === 'zones' ? expectZones : expectGrid;

  it('holds the five parts, named like the GeoJSON, with rings wound the shapefile way', async () => {
    const base = `prairie-bend-ag_north-40_hybrid-a-b-early_v3${layout === 'grid' ? '-grid' : ''}`;
    expect(fileName).toBe(`${base}.zip`);
    const entries = await entriesOf(zip);
    expect([...entries.keys()].sort()).toEqual(
      ['cpg', 'dbf', 'prj', 'shp', 'shx'].map((e) => `${base}.${e}`),
    );
    expect(entries.get(`${base}.cpg`)!.toString()).toBe('UTF-8');
    const holes = expectShapefileWinding(entries.get(`${base}.shp`)!, layout === 'zones' ? 4 : 1200);
    expect(holes).toBe(layout === 'zones' ? 1 : 0);
  });

  it('reads back the same in shpjs, non-ASCII name intact', async () => {
    const fc = (await shp(zip)) as FeatureCollection<Polygon | MultiPolygon>;
    check(fc.features);
  });

  it('reads back the same in GDAL', () => {
    const { summary, fc } = gdalRead(fileName, `/vsizip/${path.join(dir, fileName)}`);
    expect(summary).toMatch(new RegExp(`Feature Count: ${layout === 'zones' ? 4 : 1200}\\b`));
    for (const field of ['zone: String', 'unit: String', 'rate_si: Real', 'area_ha: Real', 'area_ac: Real'])
      expect(summary).toContain(field);
    expect(summary).toMatch(/rate: (Integer|Real)/);
    check(fc.features);
  });
});

/* ------------------------------------------------------------------------------------------- task data */

function parseXml(text: string) {
  const doc = new DOMParser({
    onError: (level, message) => {
      throw new Error(`${level}: ${message}`);
    },
  }).parseFromString(text, 'text/xml');
  return doc.documentElement!;
}

const all = (root: XmlElement, tag: string) => Array.from(root.getElementsByTagName(tag));
const kids = (el: XmlElement, tag: string) =>
  Array.from(el.childNodes).filter(
    (n): n is XmlElement => n.nodeType === 1 && (n as XmlElement).tagName === tag,
  );

/** Polygons rebuilt from PLN → LSG → PNT (C latitude, D longitude). */
function plnGeometry(plns: XmlElement[]): MultiPolygon {
  return multi(
    ...plns.map((pln) =>
      kids(pln, 'LSG').map((lsg) =>
        kids(lsg, 'PNT').map((p) => [Number(p.getAttribute('D')), Number(p.getAttribute('C'))]),
      ),
    ),
  );
}

async function readTaskData(layout: 'zones' | 'grid', over: Partial<PrescriptionExportInput> = {}) {
  const file = await prescriptionTaskData(makeInput(over), { layout, cellSizeM: 10 });
  const entries = await entriesOf(file.body);
  const root = parseXml(entries.get('TASKDATA/TASKDATA.XML')!.toString('utf8'));
  return { file, entries, root };
}

/** Every reference attribute names an element of the right kind. */
function expectReferencesResolve(root: XmlElement) {
  const ids = new Map<string, string>();
  for (const tag of ['CTR', 'FRM', 'CTP', 'PFD', 'PDT', 'TSK'])
    for (const e of all(root, tag)) ids.set(e.getAttribute('A')!, tag);
  const refs: [string, string, string][] = [
    ['FRM', 'I', 'CTR'],
    ['PFD', 'E', 'CTR'],
    ['PFD', 'F', 'FRM'],
    ['PFD', 'G', 'CTP'],
    ['TSK', 'C', 'CTR'],
    ['TSK', 'D', 'FRM'],
    ['TSK', 'E', 'PFD'],
    ['PDV', 'C', 'PDT'],
  ];
  for (const [tag, attr, target] of refs) {
    for (const e of all(root, tag)) expect(ids.get(e.getAttribute(attr)!), `${tag} ${attr}`).toBe(target);
  }
  const tsk = all(root, 'TSK')[0];
  const codes = new Set(kids(tsk, 'TZN').map((z) => z.getAttribute('A')));
  for (const attr of ['H', 'I', 'J']) expect(codes.has(tsk.getAttribute(attr)), `TSK ${attr}`).toBe(true);
  for (const grd of all(root, 'GRD')) expect(codes.has(grd.getAttribute('J')), 'GRD J').toBe(true);
}

const zoneByName = (root: XmlElement, name: string) =>
  all(root, 'TZN').find((z) => z.getAttribute('B') === name)!;

describe('ISO 11783-10 task data, zones layout', () => {
  it('is well-formed XML with the agreed root, and every reference resolves', async () => {
    const { file, entries, root } = await readTaskData('zones');
    expect(file.contentType).toBe('application/zip');
    expect(file.fileName).toBe('prairie-bend-ag_north-40_hybrid-a-b-early_v3-taskdata.zip');
    expect([...entries.keys()]).toEqual(['TASKDATA/TASKDATA.XML']);
    expect(root.tagName).toBe('ISO11783_TaskData');
    expect(root.getAttribute('VersionMajor')).toBe('4');
    expect(root.getAttribute('VersionMinor')).toBe('3');
    expect(root.getAttribute('DataTransferOrigin')).toBe('1');
    expect(root.getAttribute('ManagementSoftwareManufacturer')).toBe('Sowright');
    expectReferencesResolve(root);
    expect(all(root, 'PDT')[0].getAttribute('B')).toBe(PRODUCT);
    expect(all(root, 'TSK')[0].getAttribute('G')).toBe('1');
  });

  it('writes 34 000 seeds/ac as 8402 under DDI 11, and each zone its own rate', async () => {
    const { root } = await readTaskData('zones');
    const pdv = kids(zoneByName(root, ETANG), 'PDV')[0];
    expect(pdv.getAttribute('A')).toBe('000B');
    expect(pdv.getAttribute('B')).toBe('8402'); // DOMAIN.md §8
    for (const [name, perAc] of Object.entries(PER_AC)) {
      if (name === DEFAULT_NAME) continue;
      // DOMAIN.md §8: round(seeds/m² × 1000) (derived).
      expect(kids(zoneByName(root, name), 'PDV')[0].getAttribute('B'), name).toBe(
        String(Math.round((perAc / M2_PER_AC) * 1000)),
      );
    }
    const tsk = all(root, 'TSK')[0];
    const codeOf = (attr: string) =>
      kids(tsk, 'TZN').find((z) => z.getAttribute('A') === tsk.getAttribute(attr))!;
    expect(kids(codeOf('H'), 'PDV')[0].getAttribute('B')).toBe(
      String(Math.round((32_000 / M2_PER_AC) * 1000)),
    );
    expect(codeOf('I')).toBe(codeOf('H'));
    expect(kids(codeOf('J'), 'PDV')[0].getAttribute('B')).toBe('0');
    expect(kids(tsk, 'TZN').length).toBe(5);
  });

  it('draws the boundary and each zone as polygons of the same area, holes as interior rings, 9 decimals', async () => {
    const { root } = await readTaskData('zones');
    const pfd = all(root, 'PFD')[0];
    const pfdPln = kids(pfd, 'PLN');
    expect(pfdPln.map((p) => p.getAttribute('A'))).toEqual(['1']);
    expect(rel(geodesicAreaM2(plnGeometry(pfdPln)), input.boundaryAreaM2)).toBeLessThan(AREA_TOLERANCE);
    expect(Number(pfd.getAttribute('D'))).toBe(Math.round(input.boundaryAreaM2));
    for (const z of input.zones) {
      const plns = kids(zoneByName(root, z.name), 'PLN');
      expect(plns.every((p) => p.getAttribute('A') === '2')).toBe(true);
      expect(plns.length, z.name).toBe(z.geometry.coordinates.length);
      expect(rel(geodesicAreaM2(plnGeometry(plns)), z.areaM2), z.name).toBeLessThan(AREA_TOLERANCE);
    }
    const etangRings = kids(kids(zoneByName(root, ETANG), 'PLN')[0], 'LSG').map((l) => l.getAttribute('A'));
    expect(etangRings).toEqual(['1', '2']);
    for (const p of all(root, 'PNT')) {
      expect(p.getAttribute('A')).toBe('2');
      expect(p.getAttribute('C')).toMatch(/^-?\d+\.\d{7,}$/);
      expect(p.getAttribute('D')).toMatch(/^-?\d+\.\d{7,}$/);
    }
  });

  it('keeps designators well-formed: controls replaced, line breaks escaped, cut at 32 characters', async () => {
    const name = 'Bas\u0001-fond\n★ «nord» & <est> "très" long, long, long';
    const zones = input.zones.map((z, i) => (i === 1 ? { ...z, name } : z));
    const { root } = await readTaskData('zones', { zones });
    const names = all(root, 'TZN').map((z) => z.getAttribute('B'));
    // From memory: designators of at most 32 characters (see taskdata-write.ts); the control dropped.
    expect(names).toContain(
      Array.from('Bas-fond\n★ «nord» & <est> "très" long, long, long').slice(0, 32).join(''),
    );
    expect(names).toContain(ETANG);
  });

  it('uses DDI 6 (mg/m²) for mass and DDI 1 (mm³/m²) for volume', async () => {
    // Derived: 150 kg/ha = 0.015 kg/m² = 15 000 mg/m²; 100 L/ha = 10⁻⁵ m³/m² = 10 000 mm³/m².
    expect(ddiValue('mass', 150 / 10_000)).toBe(15_000);
    expect(ddiValue('volume', 100e-3 / 10_000)).toBe(10_000);
    expect(ddiHex(6)).toBe('0006');
    expect(ddiHex(1)).toBe('0001');
    const zones = input.zones.map((z) => ({ ...z, rateSi: 150 / 10_000 }));
    const { root } = await readTaskData('zones', { rateKind: 'mass', rateUnit: 'kg/ha', zones });
    const pdv = kids(zoneByName(root, ETANG), 'PDV')[0];
    expect([pdv.getAttribute('A'), pdv.getAttribute('B')]).toEqual(['0006', '15000']);
  });
});

describe('ISO 11783-10 task data, grid layout', () => {
  it('holds a type 2 grid whose binary has rows × columns 32-bit values', async () => {
    const { entries, root } = await readTaskData('grid');
    expect([...entries.keys()].sort()).toEqual(['TASKDATA/GRD00001.BIN', 'TASKDATA/TASKDATA.XML']);
    expectReferencesResolve(root);
    const grd = all(root, 'GRD')[0];
    expect(grd.getAttribute('I')).toBe('2');
    expect(grd.getAttribute('G')).toBe('GRD00001');
    const [cols, rows, length] = ['E', 'F', 'H'].map((a) => Number(grd.getAttribute(a)));
    expect(entries.get('TASKDATA/GRD00001.BIN')!.length).toBe(cols * rows * 4);
    expect(length).toBe(cols * rows * 4);
    // Derived: 400 m / 10 m and 300 m / 10 m, one more where round-off leaves a sliver past the field.
    expect([40, 41]).toContain(cols);
    expect([30, 31]).toContain(rows);
  });

  it('reproduces at every cell centre the DDI value of the region holding it', async () => {
    const { entries, root } = await readTaskData('grid');
    const grd = all(root, 'GRD')[0];
    const [minLat, minLon, dLat, dLon, cols, rows] = ['A', 'B', 'C', 'D', 'E', 'F'].map((a) =>
      Number(grd.getAttribute(a)),
    );
    const template = kids(all(root, 'TSK')[0], 'TZN').find(
      (z) => z.getAttribute('A') === grd.getAttribute('J'),
    )!;
    expect(kids(template, 'PDV').map((p) => p.getAttribute('A'))).toEqual(['000B']);
    const bin = entries.get('TASKDATA/GRD00001.BIN')!;
    const seen = new Set<string>();
    for (let row = 0; row < rows; row++) {
      for (let col = 0; col < cols; col++) {
        const region = regionAt(minLon + (col + 0.5) * dLon, minLat + (row + 0.5) * dLat);
        // DOMAIN.md §8: round(seeds/m² × 1000); 0 out of the field.
        const want = region ? Math.round((PER_AC[region] / M2_PER_AC) * 1000) : 0;
        expect(bin.readInt32LE((row * cols + col) * 4), `cell ${col},${row}`).toBe(want);
        seen.add(region ?? 'outside');
      }
    }
    expect(seen.size).toBeGreaterThanOrEqual(4);
    expect(bin.readInt32LE(0)).toBe(8402); // south-west cell is in the Étang zone: 34 000 seeds/ac (DOMAIN.md §8)
  });
});

describe('limits', () => {
  it('refuses a vector grid of too many cells and a task-data grid beyond 2 000 000 cells', async () => {
    expect(() => prescriptionGeoJson(input, { layout: 'grid', cellSizeM: 0.5 })).toThrow(GeoInputError);
    expect(() => prescriptionGeoJson(input, { layout: 'grid', cellSizeM: 0.5 })).toThrow(
      /choose larger cells/,
    );
    const huge = multi([
      [
        [-93.6, 42],
        [-93.5, 42],
        [-93.5, 42.1],
        [-93.6, 42.1],
        [-93.6, 42],
      ],
    ]);
    await expect(
      prescriptionTaskData(makeInput({ boundary: huge, zones: [] }), { layout: 'grid', cellSizeM: 2 }),
    ).rejects.toThrow(/choose larger cells/);
  });
});
