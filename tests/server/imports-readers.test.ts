import { beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { readUpload } from '../../server/routes/imports/parsers/read-upload';
import { DomainError } from '../../server/errors';
import { GeoInputError } from '../../shared/geo/geo-input-error';
import { ZipRefusedError } from '../../server/lib/zip-inspect';
import type { ImportPurpose } from '../../shared/schemas/import.schema';
import { collection, fixture, shapefileOf, square, zipShapefile } from './imports-support';

// The readers run in-process here (no worker, no database): every input either reads or fails with one of
// the errors the worker turns into a 4xx message (server/jobs/parse-upload.ts) — never anything else.
const known = (e: unknown) =>
  e instanceof DomainError || e instanceof GeoInputError || e instanceof ZipRefusedError;

async function readsOrRefuses(bytes: Uint8Array, fileName: string, purpose: ImportPurpose) {
  try {
    await readUpload({ bytes, fileName, purpose, crsCode: null, reference: [-93.6, 42] });
  } catch (e) {
    expect(known(e), String(e)).toBe(true);
  }
}

/** Flips `flips` bytes of `base` at the given positions (taken modulo its length). */
const mutate = (base: Buffer, flips: [number, number][]) => {
  const out = Buffer.from(base);
  for (const [at, v] of flips) out[at % out.length] = v;
  return out;
};

let parts: Map<string, Buffer>;
let shapeZip: Buffer;
beforeAll(async () => {
  parts = shapefileOf(collection([square(-93.6, 42, 0.002)], [square(-93.597, 42, 0.002)]));
  shapeZip = await zipShapefile(parts);
});

describe('property: the readers read or refuse with a message, nothing else', () => {
  const flips = fc.array(fc.tuple(fc.nat(), fc.integer({ min: 0, max: 255 })), {
    minLength: 1,
    maxLength: 8,
  });

  it('a zipped shapefile with bytes changed', async () => {
    await fc.assert(
      fc.asyncProperty(flips, fc.constantFrom<ImportPurpose>('zones', 'points'), (f, purpose) =>
        readsOrRefuses(mutate(shapeZip, f), 'z.zip', purpose),
      ),
      { numRuns: 300 },
    );
  });

  it('a shapefile whose .shp, .shx, .dbf or .prj has bytes changed before zipping', async () => {
    await fc.assert(
      fc.asyncProperty(flips, fc.constantFrom('shp', 'shx', 'dbf', 'prj'), async (f, ext) => {
        const changed = new Map(parts);
        changed.set(ext, mutate(parts.get(ext)!, f));
        await readsOrRefuses(await zipShapefile(changed), 'z.zip', 'zones');
      }),
      { numRuns: 300 },
    );
  });

  it('KML with bytes changed', async () => {
    const kml = fixture('boundary-multigeometry.kml');
    await fc.assert(
      fc.asyncProperty(flips, (f) => readsOrRefuses(mutate(kml, f), 'b.kml', 'boundary')),
      { numRuns: 300 },
    );
  });

  it('CSV: arbitrary text under a lon/lat header', async () => {
    await fc.assert(
      fc.asyncProperty(fc.string({ maxLength: 300 }), (text) =>
        readsOrRefuses(Buffer.from(`lon,lat,value\n${text}`), 'p.csv', 'points'),
      ),
      { numRuns: 300 },
    );
  });

  it('arbitrary bytes under any name', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.uint8Array({ maxLength: 400 }),
        fc.constantFrom('a.zip', 'a.kml', 'a.geojson', 'a.csv', 'a.bin'),
        fc.constantFrom<ImportPurpose>('boundary', 'zones', 'points'),
        (bytes, name, purpose) => readsOrRefuses(bytes, name, purpose),
      ),
      { numRuns: 300 },
    );
  });
});
