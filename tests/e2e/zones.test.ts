import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { CropSeason, Farm, Field, Grower, User } from '../../server/db/associations';
import { geodesicAreaM2 } from '../../shared/geo/geodesic-area';
import { offsetPosition, ringFromOffsets } from '../../shared/geo/offset-position';
import { m2ToAc } from '../../shared/units';
import { shapefileOf, zipOf } from '../server/imports-support';
import { browserWorldPerFile, DEMO, signInAs } from '../helpers/browser';

const world = browserWorldPerFile();

/** How long to wait for the server to read a file or answer an edit, and for the map to draw. */
const WAIT = { timeout: 20_000, interval: 100 };

/** An invented place on plausible farmland (no name), the south-west corner of the test field. */
const ORIGIN: [number, number] = [-93.6472, 41.9688];
/** The field: 600 m east by 400 m north; three zones, 200 m wide strips from west to east. */
const FIELD = [
  [0, 0],
  [600, 0],
  [600, 400],
  [0, 400],
] as [number, number][];
const strip = (w: number): [number, number][] => [
  [w, 0],
  [w + 200, 0],
  [w + 200, 400],
  [w, 400],
];
const ZONES = [
  { name: 'West strip', class: 1, offsets: strip(0) },
  { name: 'Middle strip', class: 2, offsets: strip(200) },
  { name: 'East strip', class: 3, offsets: strip(400) },
];

const polygon = (offsets: [number, number][]) => ({
  type: 'Polygon' as const,
  coordinates: [ringFromOffsets(ORIGIN, offsets)],
});

/** The zone table's rows as name → area (acres, as shown: the demo agronomist works in imperial units). */
async function zoneRows(page: Page) {
  const table = page.getByRole('table', { name: 'Zones' });
  const rows = await table.locator('tbody tr').all();
  const out = new Map<string, number>();
  for (const row of rows) {
    const name = (await row.locator('th button span.text-ink').innerText()).trim();
    const cells = await row.locator('td').allInnerTexts();
    out.set(name, Number(cells[cells.length - 2].replace(/,/g, '')));
  }
  return out;
}

const footArea = async (page: Page, row: 'zones-total' | 'boundary') => {
  const cells = await page
    .locator(`table[aria-label="Zones"] tfoot tr[data-row="${row}"] td`)
    .allInnerTexts();
  return Number(cells[cells.length - 2].replace(/,/g, ''));
};

/** Web Mercator northing of a latitude (unit sphere), to place the pointer on the map. */
const mercY = (lat: number) => Math.log(Math.tan(Math.PI / 4 + (lat * Math.PI) / 360));

/**
 * The screen point of [lon, lat] on the map, from the view the map reports on its container
 * (`data-view` = west,south,east,north) and the container's box. MapLibre draws in Web Mercator.
 */
async function screenPoint(page: Page, [lon, lat]: [number, number]) {
  const map = page.getByTestId('map');
  const view = (await map.getAttribute('data-view'))!.split(',').map(Number);
  const box = (await map.boundingBox())!;
  const [w, s, e, n] = view;
  return {
    x: box.x + ((lon - w) / (e - w)) * box.width,
    y: box.y + ((mercY(n) - mercY(lat)) / (mercY(n) - mercY(s))) * box.height,
  };
}

/** Waits until the map has drawn and its view holds the whole field. */
async function mapShowsField(page: Page) {
  const map = page.getByTestId('map');
  await page.locator('[data-testid="map"][data-ready="true"]').waitFor();
  const corners = FIELD.map(([e, n]) => offsetPosition(ORIGIN, e, n));
  await expect
    .poll(async () => {
      const view = (await map.getAttribute('data-view'))?.split(',').map(Number);
      return (
        !!view &&
        corners.every(([lon, lat]) => lon > view[0] && lon < view[2] && lat > view[1] && lat < view[3])
      );
    }, WAIT)
    .toBe(true);
}

describe('zones in the browser, as the demo agronomist', () => {
  let fieldId = '';
  let seasonId = '';
  let zipPath = '';
  let tmp = '';

  beforeAll(async () => {
    // A field of its own in the demo workspace, so no other test's zone maps are in the way.
    const agronomist = await User.findOne({ where: { email: DEMO.agronomist.email } });
    const grower = await Grower.findOne({
      where: { workspaceId: agronomist!.workspaceId, name: 'Oduya Family Farms' },
    });
    const farm = await Farm.findOne({ where: { growerId: grower!.id } });
    const field = await Field.create({
      workspaceId: grower!.workspaceId,
      growerId: grower!.id,
      farmId: farm!.id,
      name: `Strip test ${randomUUID().slice(0, 6)}`,
      notes: null,
      boundary: { type: 'MultiPolygon', coordinates: [polygon(FIELD).coordinates] },
    });
    const season = await CropSeason.create({
      workspaceId: grower!.workspaceId,
      growerId: grower!.id,
      fieldId: field.id,
      year: 2027,
      crop: 'soybean',
      plannedPlantingDate: null,
      notes: null,
    });
    fieldId = field.id;
    seasonId = season.id;

    // The zones as a zipped shapefile: GDAL's ogr2ogr writes it from GeoJSON, yazl zips it.
    const parts = shapefileOf(
      {
        type: 'FeatureCollection',
        features: ZONES.map((z) => ({
          type: 'Feature',
          properties: { zone_name: z.name, class: z.class },
          geometry: polygon(z.offsets),
        })),
      },
      { layer: 'strips' },
    );
    tmp = mkdtempSync(path.join(os.tmpdir(), 'sowright-zones-e2e-'));
    zipPath = path.join(tmp, 'strips.zip');
    writeFileSync(zipPath, await zipOf([...parts].map(([ext, data]) => ({ name: `strips.${ext}`, data }))));
  });

  afterAll(() => {
    if (tmp) rmSync(tmp, { recursive: true, force: true });
  });

  it('imports a zipped shapefile of zones, shows them with their areas, splits one by a drawn line, and the areas still add up', async () => {
    const { baseUrl, newPage, foreignRequests } = world();
    const page = await newPage();
    await signInAs(page, baseUrl, 'agronomist');

    await page.goto(`${baseUrl}/zone-maps/new?fieldId=${fieldId}&seasonId=${seasonId}&how=file`);
    await page.getByRole('heading', { level: 1, name: /^New zone map for Strip test/ }).waitFor();
    await page.getByLabel('Name of the zone map').fill('Strips from the grower');
    await page.getByLabel('File', { exact: true }).setInputFiles(zipPath);
    // Every feature of the file is listed with its area; all three are chosen (all valid).
    const list = page.getByRole('group', { name: 'Choose the features' });
    await expect.poll(() => list.getByRole('checkbox', { checked: true }).count(), WAIT).toBe(3);
    await page.getByLabel('Names the zone').selectOption('zone_name');
    await page.getByLabel('Carries the class').selectOption('class');
    await page.getByRole('button', { name: 'Create the zone map' }).click();

    await page.getByRole('heading', { level: 1, name: /Strips from the grower/ }).waitFor();
    await mapShowsField(page);
    await expect
      .poll(async () => [...(await zoneRows(page)).keys()].sort())
      .toEqual(['East strip', 'Middle strip', 'West strip']);

    // Each zone's area as shown, against its geodesic area on WGS84 (GeographicLib, Karney 2013; DOMAIN.md §2),
    // to the 0.01 ac the table shows.
    const before = await zoneRows(page);
    for (const z of ZONES)
      expect(before.get(z.name)).toBeCloseTo(m2ToAc(geodesicAreaM2(polygon(z.offsets))), 2);
    const boundaryAc = await footArea(page, 'boundary');
    expect(boundaryAc).toBeCloseTo(m2ToAc(geodesicAreaM2(polygon(FIELD))), 2);
    const sum = (rows: Map<string, number>) => [...rows.values()].reduce((a, b) => a + b, 0);
    // Rounded figures: the shown sum may differ from the boundary by half a hundredth per zone (derived).
    expect(Math.abs(sum(before) - boundaryAc)).toBeLessThanOrEqual(0.005 * before.size + 1e-9);

    // Choose the middle strip by clicking it on the map, then split it by a line drawn across it, west to
    // east, 150 m from the south edge, starting and ending 40 m outside the strip.
    const middle = await screenPoint(page, offsetPosition(ORIGIN, 300, 200));
    await page.mouse.click(middle.x, middle.y);
    const splitButton = page.getByRole('button', { name: 'Split by a line' });
    await expect.poll(() => splitButton.isEnabled(), WAIT).toBe(true);
    await splitButton.click();
    const from = await screenPoint(page, offsetPosition(ORIGIN, 160, 150));
    const to = await screenPoint(page, offsetPosition(ORIGIN, 440, 150));
    await page.mouse.click(from.x, from.y);
    await page.waitForTimeout(150);
    await page.mouse.click(to.x, to.y);
    await page.getByRole('button', { name: 'Finish', exact: true }).click();

    await expect.poll(async () => (await zoneRows(page)).size, WAIT).toBe(4);
    const after = await zoneRows(page);
    const parts = [...after.entries()].filter(([name]) => name.startsWith('Middle strip'));
    expect(parts).toHaveLength(2);
    // The two parts: 150 m and 250 m of the strip's 400 m (derived), and together the strip as it was.
    const partAreas = parts.map(([, ac]) => ac).sort((a, b) => a - b);
    expect(partAreas[0]).toBeCloseTo(
      m2ToAc(
        geodesicAreaM2(
          polygon([
            [200, 0],
            [400, 0],
            [400, 150],
            [200, 150],
          ]),
        ),
      ),
      1,
    );
    expect(partAreas[1]).toBeCloseTo(
      m2ToAc(
        geodesicAreaM2(
          polygon([
            [200, 150],
            [400, 150],
            [400, 400],
            [200, 400],
          ]),
        ),
      ),
      1,
    );
    expect(Math.abs(partAreas[0] + partAreas[1] - before.get('Middle strip')!)).toBeLessThanOrEqual(0.011);
    expect(after.get('West strip')).toBe(before.get('West strip'));
    expect(after.get('East strip')).toBe(before.get('East strip'));
    expect(Math.abs(sum(after) - (await footArea(page, 'boundary')))).toBeLessThanOrEqual(
      0.005 * after.size + 1e-9,
    );
    expect(Math.abs((await footArea(page, 'zones-total')) - boundaryAc)).toBeLessThanOrEqual(0.01);

    // Nothing the page did left this machine (the map has no tiles, glyphs or sprites to fetch).
    expect(foreignRequests).toEqual([]);
  });
});
