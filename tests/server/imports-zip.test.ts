import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { deflateRawSync } from 'node:zlib';
import { parseInWorker } from '../../server/jobs/parse-runner';
import { readZip, DEFAULT_ZIP_LIMITS } from '../../server/lib/zip-inspect';
import { startTestApp, type TestApp } from '../helpers/app';
import { makeWorld, type World } from '../helpers/factory';
import { collection, fixture, shapefileOf, square, upload, zipOf, type ZipEntry } from './imports-support';

let t: TestApp;
let w: World;
let parts: Map<string, Buffer>;
beforeAll(async () => {
  t = await startTestApp();
  w = await makeWorld(t.app, 'imports-zip');
  parts = shapefileOf(collection([square(-93.6, 42, 0.002)]));
});
afterAll(() => t.close());

const countUploads = async () =>
  (
    await t.sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM uploads WHERE workspace_id = $1', {
      bind: [w.ws.id],
      type: QueryTypes.SELECT,
    })
  )[0].n;

/** The shapefile's own parts as zip entries. */
const shapeEntries = (): ZipEntry[] => [...parts].map(([ext, data]) => ({ name: `field.${ext}`, data }));

/** A zip in which every occurrence of `placeholder` (in local headers and the central directory) is replaced by `name` of the same length. */
async function zipWithRawName(placeholder: string, name: string, extra: ZipEntry[] = []): Promise<Buffer> {
  expect(Buffer.byteLength(name)).toBe(placeholder.length);
  const zip = await zipOf([...extra, { name: placeholder, data: parts.get('shp')! }]);
  const from = Buffer.from(placeholder);
  const to = Buffer.from(name, 'latin1');
  let at = zip.indexOf(from);
  let replaced = 0;
  while (at >= 0) {
    to.copy(zip, at);
    replaced++;
    at = zip.indexOf(from, at + 1);
  }
  expect(replaced).toBe(2);
  return zip;
}

async function expectRefused(name: string, zip: Buffer) {
  const before = await countUploads();
  const res = await upload(w.callers.agronomist, w.a.field.id, 'zones', name, zip);
  expect(res.status, JSON.stringify(res.body)).toBe(422);
  expect(res.body.error.code).toBe('unreadable_file');
  expect(typeof res.body.error.message).toBe('string');
  expect(await countUploads()).toBe(before);
  return res.body.error.message as string;
}

describe('zip inspection before inflating', () => {
  it('accepts the plain shapefile (the control case)', async () => {
    const res = await upload(
      w.callers.agronomist,
      w.a.field.id,
      'zones',
      'ok.zip',
      await zipOf(shapeEntries()),
    );
    expect(res.status, JSON.stringify(res.body)).toBe(201);
  });

  it('refuses a zero-filled bomb (~1000:1) by its declared ratio', async () => {
    const bomb = await zipOf([
      ...shapeEntries().filter((e) => !e.name.endsWith('.dbf')),
      { name: 'field.dbf', data: Buffer.alloc(50 * 1024 * 1024) },
    ]);
    // Compression ratio of zeros with DEFLATE is about 1000:1 (RELIABILITY.md, measured).
    expect(bomb.length).toBeLessThan(200 * 1024);
    const message = await expectRefused('bomb.zip', bomb);
    expect(message).toContain('field.dbf');
  });

  it('refuses an entry whose header understates its size, counting bytes on the stream', async () => {
    const payload = Buffer.alloc(3 * 1024 * 1024, 7);
    const zip = await zipOf([
      ...shapeEntries().filter((e) => !e.name.endsWith('.dbf')),
      { name: 'field.dbf', data: payload },
    ]);
    // Rewrite the central directory's uncompressed size of field.dbf to 1000 bytes (APPNOTE 4.3.12, offset 24).
    const cd = zip.lastIndexOf(Buffer.from('field.dbf'));
    const header = cd - 46;
    expect(zip.readUInt32LE(header)).toBe(0x02014b50);
    zip.writeUInt32LE(1000, header + 24);
    await expect(readZip(zip, () => true)).rejects.toThrow(/more than its header declares|damaged/);
    await expectRefused('liar.zip', zip);
  });

  it('passes a text-heavy .dbf compressing about 45:1', async () => {
    // Repetitive text compresses far less than zeros; build one near 45:1 and check the ratio first.
    const row = Buffer.from('Low ridge  silt loam   2027 corn   '.padEnd(64, ' '));
    const text = Buffer.concat(
      Array.from({ length: 40_000 }, (_, i) =>
        Buffer.concat([row, Buffer.from(String(i * 7919).padStart(10, '0'))]),
      ),
    );
    const ratio = text.length / deflateRawSync(text).length;
    expect(ratio).toBeGreaterThan(10);
    expect(ratio).toBeLessThan(DEFAULT_ZIP_LIMITS.maxRatio);
    const zip = await zipOf([{ name: 'notes.dbf', data: text }]);
    const { files } = await readZip(zip, () => true);
    expect(files.get('notes.dbf')!.length).toBe(text.length);
  });

  it('refuses zip slip: "..", an absolute path, a backslash, a control character', async () => {
    for (const [placeholder, name] of [
      ['xx/evil.shp', '../evil.shp'],
      ['Xtmp/evil.shp', '/tmp/evil.shp'],
      ['dirXevil.shp', 'dir\\evil.shp'],
      ['Xevil.shp', '\u0001evil.shp'],
      ['XYevil.shp', 'C:evil.shp'],
    ]) {
      await expectRefused('slip.zip', await zipWithRawName(placeholder, name));
    }
  });

  it('refuses a nested archive, too many entries, duplicate names and a symbolic link', async () => {
    const inner = await zipOf(shapeEntries());
    await expectRefused('nested.zip', await zipOf([...shapeEntries(), { name: 'more.zip', data: inner }]));
    // A nested zip under an innocent name is caught by its magic bytes.
    await expectRefused(
      'nested2.zip',
      await zipOf([
        ...shapeEntries().filter((e) => !e.name.endsWith('.dbf')),
        { name: 'field.dbf', data: inner },
      ]),
    );
    const many = Array.from({ length: 25 }, (_, i) => ({ name: `extra-${i}.txt`, data: 'x' }));
    const entries = [...shapeEntries(), ...many];
    expect(await expectRefused('many.zip', await zipOf(entries))).toContain(String(entries.length));
    await expectRefused(
      'dup.zip',
      await zipOf([...shapeEntries(), { name: 'FIELD.shp', data: parts.get('shp')! }]),
    );
    await expectRefused(
      'link.zip',
      await zipOf([...shapeEntries(), { name: 'link.prj', data: '/etc/passwd', mode: 0o120777 }]),
    );
  });

  it('refuses a DOCTYPE in KML (billion laughs), alone or inside a KMZ', async () => {
    const before = await countUploads();
    const kml = await upload(
      w.callers.agronomist,
      w.a.field.id,
      'boundary',
      'lol.kml',
      fixture('billion-laughs.kml'),
    );
    expect(kml.status).toBe(422);
    const kmz = await upload(
      w.callers.agronomist,
      w.a.field.id,
      'boundary',
      'lol.kmz',
      await zipOf([{ name: 'doc.kml', data: fixture('billion-laughs.kml') }]),
    );
    expect(kmz.status).toBe(422);
    expect(await countUploads()).toBe(before);
  });

  it('refuses bytes that are not a zip at all but start like one', async () => {
    await expectRefused(
      'torn.zip',
      Buffer.concat([Buffer.from([0x50, 0x4b, 0x03, 0x04]), Buffer.alloc(100, 1)]),
    );
  });
});

describe('the parse worker', () => {
  it('ends a read that needs more heap than allowed and says so', async () => {
    const features = Array.from({ length: 20_000 }, (_, i) => ({
      type: 'Feature',
      properties: { i, note: 'x'.repeat(50) },
      geometry: { type: 'Polygon', coordinates: [square(-93.6, 42, 0.001)] },
    }));
    const bytes = Buffer.from(JSON.stringify({ type: 'FeatureCollection', features }));
    const job = { bytes, fileName: 'big.geojson', purpose: 'zones' as const, crsCode: null, reference: null };
    await expect(
      parseInWorker(job, { timeoutMs: 20_000, maxOldGenerationSizeMb: 16, maxYoungGenerationSizeMb: 4 }),
    ).rejects.toMatchObject({
      code: 'unreadable_file',
      message: expect.stringMatching(/memory/),
    });
  });

  it('terminates a read that takes too long and says so', async () => {
    const bytes = fixture('zones-crs84.geojson');
    const job = { bytes, fileName: 'z.geojson', purpose: 'zones' as const, crsCode: null, reference: null };
    await expect(
      parseInWorker(job, { timeoutMs: 1, maxOldGenerationSizeMb: 512, maxYoungGenerationSizeMb: 64 }),
    ).rejects.toMatchObject({
      code: 'unreadable_file',
      message: expect.stringMatching(/too long/),
    });
    // The pool recovers: the next read works.
    const ok = await parseInWorker(job);
    expect(ok.features).toHaveLength(2);
  });
});
