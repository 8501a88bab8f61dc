import { readFileSync } from 'node:fs';
import { randomUUID } from 'node:crypto';
import { beforeAll, describe, expect, it } from 'vitest';
import type { Download, Page } from 'playwright-core';
import { makeWorld, TEST_PASSWORD, type World } from '../helpers/factory';
import { browserWorldPerFile, signedInFrame, signInThroughPage } from '../helpers/browser';

const world = browserWorldPerFile();

/** How long to wait for the server to answer and the map to draw. */
const WAIT = { timeout: 20_000, interval: 100 };

/** m² per international acre (NIST SP 811 B.8, exact; DOMAIN.md §1). */
const M2_PER_AC = 4046.8564224;
/** m per inch and m/s per mph (NIST SP 811 B.8, exact). */
const M_PER_IN = 0.0254;
const MPS_PER_MPH = 0.44704;

/**
 * The test world's planter (tests/helpers/factory.ts planterBody): 30-inch rows, a 30-hole corn disc that
 * turns 4 to 45 rpm, planted at 4, 5 (planned) and 6.5 mph.
 */
const PLANTER = { rowSpacingM: 30 * M_PER_IN, holes: 30, rpmMax: 45, plannedMps: 5 * MPS_PER_MPH };

/** Seeds per second per row for a population in seeds/ac at the planned speed (DOMAIN.md §4, derived). */
const seedsPerSecond = (perAc: number) => (perAc / M2_PER_AC) * PLANTER.rowSpacingM * PLANTER.plannedMps;
/** Disc rpm = 60 × seeds per second / holes per disc (DOMAIN.md §4, derived). */
const discRpm = (perAc: number) => (60 * seedsPerSecond(perAc)) / PLANTER.holes;
/** The ground speed (mph) at which the disc reaches its top rpm: the fastest deliverable speed (DOMAIN.md §4). */
const fastestMph = (perAc: number) =>
  (PLANTER.rpmMax * PLANTER.holes) / 60 / ((perAc / M2_PER_AC) * PLANTER.rowSpacingM) / MPS_PER_MPH;

/** A rate the planter cannot deliver at 5 mph (its disc would pass 45 rpm), and one it can at every speed. */
const TOO_HIGH = 55_000;
const FIXED = 36_000;

const tag = () => randomUUID().slice(0, 8);
const one = (n: number) => n.toFixed(1);

let w: World;
let productName = '';
let productId = '';
let zoneMapId = '';
/** The split line: north–south through the middle of the world's square field (factory.ts squareBoundary). */
const MID_LON = -93.6 + 0.0025;

beforeAll(async () => {
  w = await makeWorld(world().t.app, 'prescriptions e2e');
  const agronomist = w.callers.agronomist;
  // A zone map of two halves, made through the API as the zone editor would: one zone over the boundary,
  // split north–south, each half named and given a productivity index.
  const created = await agronomist.post('/api/zone-maps', {
    fieldId: w.a.field.id,
    seasonId: w.a.season.id,
    name: 'Two halves',
  });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  const split = await agronomist.post(`/api/zone-maps/${created.body.id}/split`, {
    version: created.body.version,
    zoneId: created.body.zones.features[0].properties.id,
    line: {
      type: 'LineString',
      coordinates: [
        [MID_LON, 41.999],
        [MID_LON, 42.006],
      ],
    },
  });
  expect(split.status, JSON.stringify(split.body)).toBe(200);
  let map = split.body;
  expect(map.zones.features).toHaveLength(2);
  for (const f of [...map.zones.features]) {
    const lons = (f.geometry.coordinates as number[][][][]).flat(2).map((p) => p[0]);
    const west = Math.max(...lons) <= MID_LON + 1e-6;
    const res = await agronomist.put(`/api/zone-maps/${map.id}/zones/${f.properties.id}`, {
      version: map.version,
      name: west ? 'West half' : 'East half',
      classValue: null,
      productivityIndex: west ? 0.9 : 1.1,
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    map = res.body;
  }
  productName = `Test hybrid ${tag()}`;
  const product = await agronomist.post('/api/products', {
    kind: 'seed',
    name: productName,
    crop: 'corn',
    rateKind: 'count',
    unitName: 'unit',
    unitSize: 80_000, // DOMAIN.md §3: corn, 80 000 seeds a unit (common practice)
    pricePerUnit: 250,
    currency: 'USD',
    notes: null,
  });
  expect(product.status, JSON.stringify(product.body)).toBe(201);
  productId = product.body.id;
  zoneMapId = map.id;
});

/** A person of the test workspace, signed in through the form. */
async function pageAs(role: 'agronomist' | 'farmer'): Promise<Page> {
  const page = await world().freshPage();
  await signInThroughPage(page, world().baseUrl, w.people[role].email, TEST_PASSWORD);
  await signedInFrame(page, w.people[role].name).waitFor();
  return page;
}

/** The rates table's row of a zone, and the text of its cells after the zone's name. */
const zoneRow = (page: Page, zone: string) =>
  page.getByRole('table', { name: 'Zone rates' }).locator(`tbody tr[data-zone="${zone}"]`);
const cellsOf = async (page: Page, zone: string) =>
  (await zoneRow(page, zone).locator('td').allInnerTexts()).map((t) => t.trim());

/** Clicks a download link and waits for the file. */
async function download(page: Page, name: string): Promise<Download> {
  const [file] = await Promise.all([
    page.waitForEvent('download'),
    page.getByRole('group', { name: 'Downloads' }).getByRole('link', { name, exact: true }).click(),
  ]);
  return file;
}

describe('a prescription from zones to export, in the browser', () => {
  it('the agronomist writes one, sees a zone the planter cannot deliver, fixes it, saves and approves; the farmer exports it', async () => {
    const { baseUrl } = world();
    const page = await pageAs('agronomist');

    await page.goto(`${baseUrl}/prescriptions/new?fieldId=${w.a.field.id}&seasonId=${w.a.season.id}`);
    await page.getByRole('heading', { level: 1, name: 'New prescription' }).waitFor();
    // The field's only zone map is chosen; the season's corn seed and the grower's only planter are offered first.
    await expect.poll(() => page.getByRole('radio', { name: /Two halves/ }).isChecked(), WAIT).toBe(true);
    await page.getByLabel('Product').selectOption({ label: productName });
    await page.getByLabel('Planter').selectOption({ label: w.a.planter.name });
    expect(await page.getByLabel('Name', { exact: true }).inputValue()).toBe('Corn 2027 rates');
    // Allow the rate that will be flagged, so the planter check (not the limits) is what stops it.
    await page.getByLabel(/^Highest rate/).fill('60000');
    await page.getByRole('button', { name: 'Create the draft' }).click();
    await page.waitForURL(/\/prescriptions\/[0-9a-f-]{36}$/, WAIT);
    await page.getByRole('heading', { level: 1, name: /Corn 2027 rates/ }).waitFor();
    await page.locator('[data-testid="map"][data-ready="true"]').waitFor(WAIT);
    const prescriptionUrl = page.url();

    // A rate the disc cannot turn fast enough for at the planned 5 mph: flagged as it is typed, before saving.
    await page.getByLabel('Rate of West half (seeds/ac)').fill(String(TOO_HIGH));
    await expect.poll(async () => (await cellsOf(page, 'West half')).at(-1), WAIT).toBe('Flagged');
    const flaggedCells = await cellsOf(page, 'West half');
    expect(flaggedCells.at(-3)).toBe(one(seedsPerSecond(TOO_HIGH))); // DOMAIN.md §4 (derived)
    expect(flaggedCells.at(-2)).toBe(one(discRpm(TOO_HIGH))); // DOMAIN.md §4 (derived)
    expect(discRpm(TOO_HIGH)).toBeGreaterThan(PLANTER.rpmMax);
    expect(await page.getByText('Flagged by the planter check').isVisible()).toBe(true);
    const checkRow = page
      .getByRole('table', { name: 'Planter check' })
      .getByRole('row', { name: /West half/ });
    expect(await checkRow.innerText()).toContain(`deliverable up to ${one(fastestMph(TOO_HIGH))} mph`);
    // The totals follow the typed rate at once.
    const totalsRow = page.getByRole('table', { name: 'Totals' }).getByRole('row', { name: /West half/ });
    expect(await totalsRow.innerText()).toContain('55,000');

    const approve = page.getByRole('button', { name: 'Approve', exact: true });
    await page.getByRole('button', { name: 'Save', exact: true }).click();
    await page.getByText('All saved').waitFor(WAIT);
    // Saved, the server's check blocks approval until the rate changes or the check is accepted.
    await expect.poll(() => approve.isDisabled(), WAIT).toBe(true);
    expect(await page.locator('#approve-held').innerText()).toContain('planter check flags zones');
    // Accepting the check with a reason lets it through; changing a rate afterwards asks again.
    await page.getByLabel('Why the planter can be left like this').fill('Too short');
    await page.getByRole('button', { name: 'Accept the check' }).click();
    expect(await page.getByText('at least 10 characters').isVisible()).toBe(true);
    await page
      .getByLabel('Why the planter can be left like this')
      .fill('The grower plants the west half at 4.5 mph this year.');
    await page.getByRole('button', { name: 'Accept the check' }).click();
    await page.getByText('Check accepted').waitFor(WAIT);
    await expect.poll(() => approve.isEnabled(), WAIT).toBe(true);

    // Fixed: a rate the disc delivers at every speed.
    await page.getByLabel('Rate of West half (seeds/ac)').fill(String(FIXED));
    await expect.poll(async () => (await cellsOf(page, 'West half')).at(-1), WAIT).toBe('OK');
    expect(await page.getByText('Flagged by the planter check').count()).toBe(0);
    expect(await approve.isDisabled()).toBe(true); // unsaved changes
    await page.getByRole('button', { name: 'Save', exact: true }).click();
    await page.getByText('All saved').waitFor(WAIT);
    await expect.poll(() => approve.isEnabled(), WAIT).toBe(true);
    await approve.click();
    const dialog = page.getByRole('dialog', { name: 'Approve version 1?' });
    await dialog.waitFor();
    expect(await dialog.innerText()).toContain('These rates are advice');
    await dialog.getByRole('button', { name: 'Approve', exact: true }).click();
    await page.getByText(`Approved by ${w.people.agronomist.name}`).waitFor(WAIT);
    // Approved means frozen: no rate inputs any more.
    expect(await page.getByLabel('Rate of West half (seeds/ac)').count()).toBe(0);
    expect(await cellsOf(page, 'West half')).toContain('36,000');

    // The farmer finds it on the home page among what is ready to export, opens it and downloads each file.
    const farmer = await pageAs('farmer');
    await farmer.goto(`${baseUrl}/`);
    const ready = farmer.getByRole('table', { name: 'Ready to export' });
    await ready.getByRole('link', { name: w.a.field.name, exact: true }).click();
    await farmer.waitForURL(prescriptionUrl, WAIT);
    await farmer.getByRole('heading', { level: 1, name: /Corn 2027 rates/ }).waitFor();
    expect(await farmer.getByLabel('Rate of West half (seeds/ac)').count()).toBe(0);

    const productSlug = productName.toLowerCase().replace(/[^a-z0-9]+/g, '-');
    const files: Record<string, Buffer> = {};
    for (const [label, ending] of [
      ['GeoJSON', '.geojson'],
      ['Shapefile (zip)', '.zip'],
      ['ISO 11783-10 task data (zip)', '.zip'],
    ] as const) {
      const file = await download(farmer, label);
      const name = file.suggestedFilename();
      // PRODUCT.md §10: the file names say grower, field, product and version.
      expect(name.endsWith(ending), name).toBe(true);
      for (const part of ['grower-a', 'field', productSlug, 'v1']) expect(name, name).toContain(part);
      const body = readFileSync((await file.path())!);
      expect(body.length, name).toBeGreaterThan(0);
      files[label] = body;
    }
    // A zip starts with the local file header signature "PK\x03\x04" (PKWARE APPNOTE 4.3.7).
    for (const label of ['Shapefile (zip)', 'ISO 11783-10 task data (zip)'])
      expect(files[label].subarray(0, 4).toString('latin1')).toBe('PK\x03\x04');
    expect(files['ISO 11783-10 task data (zip)'].equals(files['Shapefile (zip)'])).toBe(false);
    // The GeoJSON: one feature per zone (the halves cover the field), each with its rate in SI.
    const geo = JSON.parse(files.GeoJSON.toString('utf8'));
    expect(geo.type).toBe('FeatureCollection');
    expect(geo.features).toHaveLength(2);
    const byZone = new Map(geo.features.map((f: { properties: { zone: string } }) => [f.properties.zone, f]));
    expect([...byZone.keys()].sort()).toEqual(['East half', 'West half']);
    const west = byZone.get('West half') as { properties: { rate_si: number } };
    expect(west.properties.rate_si).toBeCloseTo(FIXED / M2_PER_AC, 9); // DOMAIN.md §1 (derived)
  });

  it("a save that crosses someone else's keeps what was typed, and saves it over; rates by rule fill the table", async () => {
    const { baseUrl } = world();
    const agronomist = w.callers.agronomist;
    const si = (perAc: number) => perAc / M2_PER_AC; // DOMAIN.md §1 (derived)
    const created = await agronomist.post('/api/prescriptions', {
      zoneMapId,
      productId,
      planterId: w.a.planter.id,
      name: `Crossed saves ${tag()}`,
      rateUnit: 'seeds/ac',
      defaultRateSi: si(32_000),
      outOfFieldRateSi: 0,
      minRateSi: si(28_000),
      maxRateSi: si(40_000),
    });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    const draft = created.body;
    const zoneId = (name: string) => draft.zones.find((z: { name: string }) => z.name === name).id;

    const page = await pageAs('agronomist');
    await page.goto(`${baseUrl}/prescriptions/${draft.id}`);
    await page.getByRole('heading', { level: 1, name: draft.name }).waitFor();
    await page.getByLabel('Rate of West half (seeds/ac)').fill('34000');

    // Meanwhile another save changes the other half.
    const other = await agronomist.put(`/api/prescriptions/${draft.id}`, {
      version: draft.version,
      name: draft.name,
      productId,
      planterId: w.a.planter.id,
      rateUnit: 'seeds/ac',
      defaultRateSi: draft.defaultRateSi,
      outOfFieldRateSi: 0,
      minRateSi: draft.minRateSi,
      maxRateSi: draft.maxRateSi,
      rates: [
        { zoneId: zoneId('West half'), rateSi: si(32_000) },
        { zoneId: zoneId('East half'), rateSi: si(38_000) },
      ],
    });
    expect(other.status, JSON.stringify(other.body)).toBe(200);

    await page.getByRole('button', { name: 'Save', exact: true }).click();
    const notice = page.getByRole('alert').filter({ hasText: 'Someone else saved this prescription' });
    await notice.waitFor(WAIT);
    expect(await notice.innerText()).toContain('West half: yours 34,000 seeds/ac, saved now 32,000 seeds/ac');
    expect(await notice.innerText()).not.toContain('East half');
    expect(await page.getByLabel('Rate of West half (seeds/ac)').inputValue()).toBe('34000');
    // The other person's rate shows; the typed one stays.
    expect(await page.getByLabel('Rate of East half (seeds/ac)').inputValue()).toBe('38000');

    await notice.getByRole('button', { name: 'Keep my changes' }).click();
    await page.getByRole('button', { name: 'Save', exact: true }).click();
    await page.getByText('All saved').waitFor(WAIT);
    const saved = await agronomist.get(`/api/prescriptions/${draft.id}`);
    const rateOf = (name: string) => saved.body.zones.find((z: { name: string }) => z.name === name).rateSi;
    expect(rateOf('West half')).toBeCloseTo(si(34_000), 9);
    expect(rateOf('East half')).toBeCloseTo(si(38_000), 9);

    // Rates by rule: base × productivity index, rounded to the step, held between lowest and highest
    // (DEVELOPERS.md "Rate rule"). West 34 000 × 0.9 = 30 600 → 30 500; East 34 000 × 1.1 = 37 400 → 37 500,
    // held at 36 000 (derived).
    const rule = page.getByRole('region', { name: 'Rates by rule' });
    await rule.getByLabel('Base rate').fill('34000');
    await rule.getByLabel('Highest').fill('36000');
    await rule.getByLabel('Round to').fill('500');
    const preview = page.getByRole('table', { name: 'Rates by rule, preview' });
    expect(await preview.getByRole('row', { name: /West half/ }).innerText()).toMatch(/30,500$/);
    expect(await preview.getByRole('row', { name: /East half/ }).innerText()).toMatch(
      /36,000\s*held at highest$/,
    );
    await rule.getByRole('button', { name: 'Use these rates' }).click();
    expect(await page.getByLabel('Rate of West half (seeds/ac)').inputValue()).toBe('30500');
    expect(await page.getByLabel('Rate of East half (seeds/ac)').inputValue()).toBe('36000');
    expect(await page.getByText('Unsaved changes').isVisible()).toBe(true);
  });
});
