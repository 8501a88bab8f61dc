import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import yazl from 'yazl';
import request from 'supertest';
import type { Caller } from '../helpers/app';

export const FIXTURES = path.resolve('fixtures/imports');
export const fixture = (name: string) => readFileSync(path.join(FIXTURES, name));

/** POST /api/imports as `caller` with one file. */
export function upload(
  caller: Caller,
  fieldId: string,
  purpose: string,
  name: string,
  bytes: Buffer | string,
) {
  return request(caller.app)
    .post('/api/imports')
    .set('Cookie', caller.cookie)
    .set('X-Sowright-Request', '1')
    .field('purpose', purpose)
    .field('fieldId', fieldId)
    .attach('file', Buffer.isBuffer(bytes) ? bytes : Buffer.from(bytes), name);
}

export type ZipEntry = { name: string; data: Buffer | string; compress?: boolean; mode?: number };

/** A zip built in memory with yazl (names are taken as given, so tests can write hostile ones). */
export function zipOf(entries: ZipEntry[]): Promise<Buffer> {
  const zip = new yazl.ZipFile();
  for (const e of entries) {
    zip.addBuffer(Buffer.isBuffer(e.data) ? e.data : Buffer.from(e.data), e.name, {
      compress: e.compress ?? true,
      mode: e.mode,
    });
  }
  zip.end();
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    zip.outputStream.on('data', (c: Buffer) => chunks.push(c));
    zip.outputStream.on('end', () => resolve(Buffer.concat(chunks)));
    zip.outputStream.on('error', reject);
  });
}

/**
 * Writes `geojson` as an ESRI shapefile with GDAL's ogr2ogr (optionally reprojected with -t_srs) and
 * returns its parts by extension. `keep` picks which parts to return (all by default).
 */
export function shapefileOf(
  geojson: object,
  opts: { tSrs?: string; layer?: string; extra?: string[] } = {},
): Map<string, Buffer> {
  const dir = mkdtempSync(path.join(os.tmpdir(), 'sowright-shp-'));
  try {
    const src = path.join(dir, 'in.geojson');
    writeFileSync(src, JSON.stringify(geojson));
    const layer = opts.layer ?? 'shapes';
    const args = [
      '-f',
      'ESRI Shapefile',
      path.join(dir, `${layer}.shp`),
      src,
      ...(opts.tSrs ? ['-t_srs', opts.tSrs] : []),
      ...(opts.extra ?? []),
    ];
    execFileSync('ogr2ogr', args, { stdio: 'pipe' });
    const out = new Map<string, Buffer>();
    for (const f of readdirSync(dir))
      if (f.startsWith(`${layer}.`))
        out.set(f.slice(layer.length + 1).toLowerCase(), readFileSync(path.join(dir, f)));
    return out;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/** A zip of shapefile parts named `<layer>.<ext>`, leaving out `without`. */
export function zipShapefile(parts: Map<string, Buffer>, layer = 'shapes', without: string[] = []) {
  return zipOf(
    [...parts]
      .filter(([ext]) => !without.includes(ext))
      .map(([ext, data]) => ({ name: `${layer}.${ext}`, data })),
  );
}

/** A FeatureCollection of polygon features. */
export const collection = (...polygons: number[][][][]) => ({
  type: 'FeatureCollection',
  features: polygons.map((coordinates, i) => ({
    type: 'Feature',
    properties: { name: `Zone ${i + 1}`, class: i + 1 },
    geometry: { type: 'Polygon', coordinates },
  })),
});

/** A square ring [lon, lat], counter-clockwise. */
export const square = (lon: number, lat: number, side: number): number[][] => [
  [lon, lat],
  [lon + side, lat],
  [lon + side, lat + side],
  [lon, lat + side],
  [lon, lat],
];
