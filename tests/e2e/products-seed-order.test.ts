import { readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import { beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { CropSeason, Field, Grower, Prescription, Product, User } from '../../server/db/associations';
import { makeWorld, squareBoundary, TEST_PASSWORD, type World } from '../helpers/factory';
import {
  browserWorldPerFile,
  DEMO,
  descriptionOf,
  firstColumn,
  mainNav,
  openFromNav,
  openPage,
  signedInFrame,
  signInThroughPage,
} from '../helpers/browser';

const world = browserWorldPerFile();

/** Optional: a folder to keep the print screenshot and PDFs in, to look at by eye. */
const SHOT_DIR = process.env.SOWRIGHT_SHOT_DIR;

const tag = () => randomUUID().slice(0, 8);

/** m² per international acre (NIST SP 811 B.8, exact; DOMAIN.md §1). */
const M2_PER_AC = 4046.8564224;
/** m³ per litre (SI) and per US gallon (NIST SP 811 B.8, exact). */
const M3_PER_L = 1e-3;
const M3_PER_GAL = 3.785411784e-3;

let w: World;
beforeAll(async () => {
  w = await makeWorld(world().t.app, 'seed order');
});

/** Signs a person of the test workspace in through the form. */
async function pageAs(role: 'admin' | 'agronomist' | 'farmer' | 'consultant'): Promise<Page> {
  const page = await world().freshPage();
  await signInThroughPage(page, world().baseUrl, w.people[role].email, TEST_PASSWORD);
  await signedInFrame(page, w.people[role].name).waitFor();
  return page;
}

/** The text of each cell of the table row whose own name (its first cell or row header) matches. */
async function rowCells(page: Page, table: string, row: string | RegExp): Promise<string[]> {
  const r = page.getByRole('table', { name: table }).getByRole('row', { name: row });
  return (await r.getByRole('cell').allInnerTexts()).map((t) => t.trim());
}

/** A corn seed product's fields: 80 000 seeds a unit (DOMAIN.md §3, common practice). */
const cornSeed = (name: string, pricePerUnit: number, unitName = 'unit') => ({
  kind: 'seed' as const,
  name,
  crop: 'corn' as const,
  rateKind: 'count' as const,
  unitName,
  unitSize: 80_000,
  pricePerUnit,
  currency: 'USD',
});

const num = (text: string) => Number(text.replace(/[^0-9.-]/g, ''));

describe('products', () => {
  it('an agronomist adds a seed product: the crop fills the seeds per unit, a bad price is refused beside its field', async () => {
    const page = await pageAs('agronomist');
    const name = `Test soybean ${tag()}`;
    await openFromNav(page, 'Products');
    await page.getByRole('link', { name: 'Add product' }).click();
    await page.getByRole('heading', { level: 1, name: 'Add a product' }).waitFor();

    const size = page.getByLabel(/^Unit size/);
    await page.getByLabel('Name', { exact: true }).fill(name);
    await page.getByLabel('Crop').selectOption({ label: 'Corn' });
    expect(await size.inputValue()).toBe('80000'); // DOMAIN.md §3: corn 80 000 seeds a unit (common practice)
    await page.getByLabel('Crop').selectOption({ label: 'Soybean' });
    expect(await size.inputValue()).toBe('140000'); // DOMAIN.md §3: soybean 140 000 (Univ. of Missouri IPM)
    expect(await page.getByText('Seeds (count per area)').count()).toBe(1);

    const price = page.getByLabel('Price per unit');
    await price.fill('-5');
    await page.getByRole('button', { name: 'Add product', exact: true }).click();
    await expect.poll(() => descriptionOf(price)).toContain('Price cannot be negative');
    expect(await price.getAttribute('aria-invalid')).toBe('true');
    expect(await Product.count({ where: { name } })).toBe(0);

    await price.fill('52.5');
    await page.getByRole('button', { name: 'Add product', exact: true }).click();
    await page.getByRole('heading', { level: 1, name: 'Products' }).waitFor();
    expect(await firstColumn(page.getByRole('table', { name: 'Products' }))).toContain(name);
    const cells = await rowCells(page, 'Products', new RegExp(name));
    expect(cells).toContain('140,000 seeds per unit');
    expect(cells).toContain('$52.50');

    const saved = await Product.findOne({ where: { name } });
    expect(saved?.get({ plain: true })).toMatchObject({
      workspaceId: w.ws.id,
      kind: 'seed',
      crop: 'soybean',
      rateKind: 'count',
      unitSize: 140_000,
      currency: 'USD',
    });
    expect(Number(saved?.pricePerUnit)).toBe(52.5); // numeric(12,2) comes back as text
  });

  it('a unit size typed in litres by a metric user is stored in m³ and shown in gallons to an imperial one', async () => {
    await User.update({ unitSystem: 'metric' }, { where: { id: w.people.admin.id } });
    const page = await pageAs('admin');
    const name = `Test starter ${tag()}`;
    await openPage(page, world().baseUrl, '/products/new', 'Add a product');
    await page.getByLabel('Kind of product').selectOption({ label: 'Other product (fertiliser, in-furrow)' });
    await page.getByLabel('Rate measured by').selectOption({ label: 'Volume per area' });
    await page.getByLabel('Name', { exact: true }).fill(name);
    await page.getByLabel('Unit name').fill('jug');
    await page.getByLabel(/^Unit size\s*\(L per jug\)$/).fill('10');
    await page.getByLabel('Price per unit').fill('38');
    await page.getByLabel('Currency').fill('cad');
    await page.getByRole('button', { name: 'Add product', exact: true }).click();
    await page.getByRole('heading', { level: 1, name: 'Products' }).waitFor();

    const saved = await Product.findOne({ where: { name } });
    expect(saved?.crop).toBeNull();
    expect(saved?.rateKind).toBe('volume');
    expect(saved?.currency).toBe('CAD');
    expect(saved?.unitSize).toBeCloseTo(10 * M3_PER_L, 12);
    expect(await rowCells(page, 'Products', new RegExp(name))).toContain('10 L per jug');

    const imperial = await pageAs('agronomist');
    await openPage(imperial, world().baseUrl, '/products?kind=other', 'Products');
    const gallons = (10 * M3_PER_L) / M3_PER_GAL; // 2.6417… gal (NIST SP 811 B.8)
    expect(await rowCells(imperial, 'Products', new RegExp(name))).toContain(
      `${gallons.toFixed(2)} gal per jug`,
    );
  });

  it('a save over a newer version says so and keeps what was typed', async () => {
    const product = await Product.create({
      workspaceId: w.ws.id,
      ...cornSeed(`Test hybrid ${tag()}`, 300),
      notes: null,
    });
    const page = await pageAs('agronomist');
    await openPage(page, world().baseUrl, `/products/${product.id}`, product.name);
    await page.getByLabel('Price per unit').fill('310');
    await w.callers.agronomist
      .put(`/api/products/${product.id}`, { ...cornSeed(product.name, 295), version: product.version })
      .expect(200);
    await page.getByRole('button', { name: 'Save changes' }).click();
    await page.getByText('Someone else changed this record').waitFor();
    await page.getByRole('button', { name: 'Load the latest version' }).click();
    await page.getByText('The latest version is loaded').waitFor();
    expect(await page.getByLabel('Price per unit').inputValue()).toBe('295');
    await page.getByRole('button', { name: 'Use what I typed' }).click();
    await page.getByRole('button', { name: 'Save changes' }).click();
    await page.getByRole('heading', { level: 1, name: 'Products' }).waitFor();
    await product.reload();
    expect(Number(product.pricePerUnit)).toBe(310);
  });

  it('a farmer reads a product but is offered no way to change it', async () => {
    const product = await Product.create({
      workspaceId: w.ws.id,
      ...cornSeed(`Test read-only hybrid ${tag()}`, 280, 'bag'),
      notes: 'Treated.',
    });
    const page = await pageAs('farmer');
    await openFromNav(page, 'Products');
    expect(await page.getByRole('link', { name: 'Add product' }).count()).toBe(0);
    await page.getByRole('table', { name: 'Products' }).getByRole('link', { name: product.name }).click();
    await page.getByRole('heading', { level: 1, name: product.name }).waitFor();
    expect(await page.getByRole('textbox').count()).toBe(0);
    expect(await page.getByRole('combobox').count()).toBe(0);
    expect(await page.getByRole('button', { name: /archive/i }).count()).toBe(0);
    expect(await page.getByText('80,000 seeds per bag').count()).toBe(1);

    await page.goto(`${world().baseUrl}/products/new`);
    await page.getByText('Not part of your role').waitFor();
    expect(await page.getByRole('textbox').count()).toBe(0);
  });
});

describe('seed order and the farmer home', () => {
  const RATE_PER_AC = 32_000;
  let productName = '';
  let fields: { name: string; areaM2: number }[] = [];

  beforeAll(async () => {
    const { a } = w;
    // A second, smaller field of grower A with a 2027 corn season (0.003° a side, about 20 ac).
    const small = await Field.create({
      workspaceId: w.ws.id,
      growerId: a.grower.id,
      farmId: a.farm.id,
      name: 'Grower A small field',
      notes: null,
      boundary: { type: 'MultiPolygon', coordinates: [squareBoundary(-93.59, 42.0, 0.003).coordinates] },
    });
    const smallSeason = await CropSeason.create({
      workspaceId: w.ws.id,
      growerId: a.grower.id,
      fieldId: small.id,
      year: 2027,
      crop: 'corn',
      plannedPlantingDate: null,
      notes: null,
    });
    const agronomist = w.callers.agronomist;
    const product = await agronomist
      .post('/api/products', cornSeed(`Test order hybrid ${tag()}`, 300))
      .expect(201);
    productName = product.body.name;
    const draftOn = async (fieldId: string, seasonId: string, name: string) => {
      const map = await agronomist
        .post('/api/zone-maps', { fieldId, seasonId, name: 'Whole field' })
        .expect(201);
      const seedsPerM2 = RATE_PER_AC / M2_PER_AC;
      const rx = await agronomist
        .post('/api/prescriptions', {
          zoneMapId: map.body.id,
          productId: product.body.id,
          planterId: null,
          name,
          rateUnit: 'seeds/ac',
          defaultRateSi: seedsPerM2,
          outOfFieldRateSi: 0,
          minRateSi: seedsPerM2 / 2,
          maxRateSi: seedsPerM2 * 2,
        })
        .expect(201);
      return rx.body as { id: string; version: number };
    };
    const big = await draftOn(a.field.id, a.season.id, 'Corn 2027 big');
    await agronomist.post(`/api/prescriptions/${big.id}/approve`, { version: big.version }).expect(200);
    await draftOn(small.id, smallSeason.id, 'Corn 2027 small');
    await a.field.reload();
    await small.reload();
    fields = [
      { name: a.field.name, areaM2: a.field.areaM2 ?? Number.NaN },
      { name: small.name, areaM2: small.areaM2 ?? Number.NaN },
    ];
  });

  /** Seeds for a field at the one rate every zone has (DOMAIN.md §3: quantity = rate × area). */
  const seedsOf = (areaM2: number) => (RATE_PER_AC * areaM2) / M2_PER_AC;

  it('lists the approved prescription, and with drafts both, with totals rounded per field and once', async () => {
    const page = await pageAs('agronomist');
    await openFromNav(page, 'Seed orders');
    await page.getByLabel('Grower').selectOption({ label: w.a.grower.name });
    await page.getByRole('heading', { name: `Seed order: ${w.a.grower.name}, 2027` }).waitFor();
    expect(new URL(page.url()).searchParams.get('growerId')).toBe(w.a.grower.id);
    const table = `Fields for ${productName}`;
    const bodyRows = () => page.getByRole('table', { name: table }).locator('tbody tr');
    expect(await bodyRows().count()).toBe(1);
    expect(await bodyRows().first().innerText()).toContain('Approved');

    // The box follows the address (?drafts=true), which the router updates a moment after the click.
    await page.getByLabel('Include drafts').click();
    await expect.poll(() => page.getByLabel('Include drafts').isChecked()).toBe(true);
    await expect.poll(() => bodyRows().count()).toBe(2);
    const [big, small] = fields.map((f) => seedsOf(f.areaM2));
    const perField = [big, small].map((q) => Math.ceil(q / 80_000)); // DOMAIN.md §3 (derived): whole units per field
    const once = Math.ceil((big + small) / 80_000); // DOMAIN.md §3 (derived): the order rounded once
    expect(perField[0] + perField[1]).toBeGreaterThan(once); // the two roundings differ for these fields

    for (const [i, f] of fields.entries()) {
      const cells = await rowCells(page, table, new RegExp(f.name));
      expect(num(cells[4])).toBeCloseTo(f.areaM2 / M2_PER_AC, 1); // area, ac
      expect(num(cells[5])).toBe(RATE_PER_AC); // mean rate, seeds/ac
      expect(Math.abs(num(cells[6]) - [big, small][i])).toBeLessThanOrEqual(1); // seeds, shown whole
      expect(num(cells[7])).toBe(perField[i]);
    }
    const byField = await rowCells(page, table, /^Total, each field rounded up/);
    expect(num(byField[3])).toBe(perField[0] + perField[1]);
    const toOrder = await rowCells(page, table, /^To order/);
    expect(num(toOrder[3])).toBe(once);
    expect(num(toOrder[4])).toBe(once * 300); // cost = whole units × price (DOMAIN.md §3)
    expect(await page.getByText(`$${(once * 300).toLocaleString('en-US')}.00`).count()).toBeGreaterThan(1);
  });

  it('downloads the order as CSV from its link', async () => {
    const page = await pageAs('agronomist');
    await openPage(page, world().baseUrl, `/seed-orders?growerId=${w.a.grower.id}&year=2027`, 'Seed orders');
    const link = page.getByRole('link', { name: 'Download CSV' });
    expect(await link.getAttribute('href')).toBe(
      `/api/seed-orders?growerId=${w.a.grower.id}&year=2027&drafts=false&format=csv`,
    );
    const [download] = await Promise.all([page.waitForEvent('download'), link.click()]);
    expect(download.suggestedFilename()).toMatch(/\.csv$/);
    const csv = readFileSync(await download.path(), 'utf8');
    expect(csv).toContain(fields[0].name);
    expect(csv).not.toContain(fields[1].name); // drafts left out
    expect(csv).toContain(productName);
  });

  it('prints black on white without the navigation, on A4 and on Letter', async () => {
    const page = await pageAs('agronomist');
    await openPage(
      page,
      world().baseUrl,
      `/seed-orders?growerId=${w.a.grower.id}&year=2027&drafts=true`,
      'Seed orders',
    );
    const sheet = page.getByRole('article');
    await sheet.getByRole('table').first().waitFor();
    expect(await mainNav(page).isVisible()).toBe(true);

    await page.emulateMedia({ media: 'print' });
    expect(await mainNav(page).isVisible()).toBe(false);
    expect(await page.getByRole('button', { name: 'Print' }).isVisible()).toBe(false);
    expect(await page.getByRole('link', { name: 'Download CSV' }).isVisible()).toBe(false);
    expect(
      await sheet.getByRole('heading', { name: `Seed order: ${w.a.grower.name}, 2027` }).isVisible(),
    ).toBe(true);
    expect(await sheet.getByText(/^Generated /).isVisible()).toBe(true);
    expect(
      await sheet
        .getByText(
          "Seed quantities are planning figures: check them against your supplier's bag counts. Treated seed is a pesticide: follow the label.",
        )
        .isVisible(),
    ).toBe(true);
    const style = await sheet
      .locator('tbody tr')
      .first()
      .evaluate((el) => {
        const s = getComputedStyle(el);
        const text = getComputedStyle(el.querySelector('td') as Element);
        return {
          breakInside: s.breakInside,
          color: text.color,
          background: getComputedStyle(document.body).backgroundColor,
        };
      });
    expect(style).toEqual({ breakInside: 'avoid', color: 'rgb(0, 0, 0)', background: 'rgb(255, 255, 255)' });
    if (SHOT_DIR)
      await page.screenshot({ path: path.join(SHOT_DIR, 'seed-order-print.png'), fullPage: true });

    // Page sizes in PostScript points: A4 210 × 297 mm (ISO 216), Letter 8.5 × 11 in (ANSI/ASME Y14.1).
    for (const [format, width, height] of [
      ['A4', (210 / 25.4) * 72, (297 / 25.4) * 72],
      ['Letter', 8.5 * 72, 11 * 72],
    ] as const) {
      const pdf = await page.pdf({ format });
      if (SHOT_DIR) writeFileSync(path.join(SHOT_DIR, `seed-order-${format}.pdf`), pdf);
      const text = pdf.toString('latin1');
      expect(text.startsWith('%PDF-')).toBe(true);
      const boxes = [...text.matchAll(/\/MediaBox\s*\[\s*0 0 ([\d.]+) ([\d.]+)\s*\]/g)];
      expect(boxes.length).toBe(1); // this order fits on one sheet
      expect(Number(boxes[0][1])).toBeCloseTo(width, -1);
      expect(Number(boxes[0][2])).toBeCloseTo(height, -1);
    }
  });

  it("puts the approved prescription first on the farmer's home, linked to its page", async () => {
    const page = await pageAs('farmer');
    await page.getByRole('heading', { level: 1, name: 'Overview' }).waitFor();
    const panel = page.getByRole('region', { name: 'Ready to export' });
    const table = panel.getByRole('table', { name: 'Ready to export' });
    await table.waitFor();
    expect(await firstColumn(table)).toEqual([fields[0].name]); // the draft is not ready
    const row = await table.locator('tbody tr').first().innerText();
    expect(row).toContain(w.a.farm.name);
    expect(row).toContain(productName);
    expect(row).toContain('v1');
    // First thing under the page title: no other section comes before it.
    const firstSection = await page.locator('main section').first().getAttribute('aria-labelledby');
    expect(await page.locator(`[id="${firstSection}"]`).innerText()).toBe('Ready to export');
    const href = await table.getByRole('link', { name: fields[0].name, exact: true }).getAttribute('href');
    expect(href).toMatch(/^\/prescriptions\/[0-9a-f-]{36}$/);
  });
});

describe('the demo', () => {
  it("shows a demo grower's approved 2027 prescriptions, each product with what to order", async () => {
    const agronomist = await User.findOne({ where: { email: DEMO.agronomist.email } });
    const seasons = await CropSeason.findAll({ where: { workspaceId: agronomist!.workspaceId, year: 2027 } });
    const approved = await Prescription.findAll({
      where: {
        workspaceId: agronomist!.workspaceId,
        status: 'approved',
        cropSeasonId: seasons.map((s) => s.id),
      },
    });
    expect(approved.length).toBeGreaterThan(0);
    const growerId = approved[0].growerId;
    const grower = await Grower.findByPk(growerId);
    const mine = approved.filter((p) => p.growerId === growerId);
    const products = new Set(mine.map((p) => p.productId));

    const page = await world().signedInPage('agronomist');
    await openPage(page, world().baseUrl, `/seed-orders?growerId=${growerId}&year=2027`, 'Seed orders');
    const sheet = page.getByRole('article', { name: `Seed order: ${grower!.name}, 2027` });
    await sheet.getByRole('table').first().waitFor();
    expect(await sheet.getByRole('table').count()).toBe(products.size);
    expect(await sheet.locator('tbody tr').count()).toBe(mine.length);
    for (const table of await sheet.getByRole('table').all()) {
      const units = await table
        .getByRole('row', { name: /^To order/ })
        .getByRole('cell')
        .nth(3)
        .innerText();
      expect(num(units)).toBeGreaterThan(0);
    }
  });
});
