import { randomUUID } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { fn, col, where } from 'sequelize';
import { Farm, Field, Grower, Planter, User } from '../../server/db/associations';
import {
  browserWorldPerFile,
  chosenOption,
  DEMO,
  descriptionOf,
  factValue,
  firstColumn,
  openFromNav,
  openPage,
} from '../helpers/browser';

const world = browserWorldPerFile();

/** A short tag that keeps names unique across runs against the same database. */
const tag = () => randomUUID().slice(0, 8);

/** Submits a register form with its primary button and waits for the record page it opens. */
async function submitAndOpen(page: Page, button: string, heading: string) {
  await page.getByRole('button', { name: button, exact: true }).click();
  await page.getByRole('heading', { level: 1, name: heading, exact: true }).waitFor();
}

/** The id at the end of the page's address (`/growers/<id>`). */
const idInUrl = (page: Page) => new URL(page.url()).pathname.split('/').pop() ?? '';

/** The names a register list shows when its address is opened afresh (nothing cached in the page). */
async function listed(page: Page, baseUrl: string, path: string, title: string) {
  await openPage(page, baseUrl, path, title);
  return firstColumn(page.getByRole('table', { name: title }));
}

describe('register forms, as the demo agronomist', () => {
  it('adds a grower, a farm under it and a field under the farm, and each appears in its list', async () => {
    const { baseUrl, signedInPage } = world();
    const page = await signedInPage('agronomist');
    const growerName = `Larkmoor Test Acres ${tag()}`;
    const farmName = `Upper bottoms ${tag()}`;
    const fieldName = `Windmill eighty ${tag()}`;

    await openFromNav(page, 'Growers');
    await page.getByRole('link', { name: 'Add grower' }).click();
    await page.getByRole('heading', { level: 1, name: 'Add a grower' }).waitFor();
    await page.getByLabel('Name').fill(growerName);
    await page.getByLabel('Contact person').fill('Ada Testperson');
    await page.getByLabel('Phone').fill('+1 555 0100');
    await submitAndOpen(page, 'Add grower', growerName);
    const growerId = idInUrl(page);

    await page.getByRole('link', { name: 'Add farm' }).click();
    await page.getByRole('heading', { level: 1, name: 'Add a farm' }).waitFor();
    // The growers list loads after the heading: wait for the chosen grower rather than read it at once.
    await expect.poll(() => chosenOption(page.getByLabel('Grower'))).toBe(growerName);
    await page.getByLabel('Name').fill(farmName);
    await page.getByRole('button', { name: 'Add farm', exact: true }).click();
    await page.waitForURL(`${baseUrl}/growers/${growerId}`);
    expect(await firstColumn(page.getByRole('table', { name: 'Farms' }))).toEqual([farmName]);

    await page.getByRole('link', { name: 'Add field' }).click();
    await page.getByRole('heading', { level: 1, name: 'Add a field' }).waitFor();
    await expect.poll(() => chosenOption(page.getByLabel('Grower'))).toBe(growerName);
    await page.getByLabel('Farm').selectOption({ label: farmName });
    await page.getByLabel('Name').fill(fieldName);
    await submitAndOpen(page, 'Add field', fieldName);
    expect(await factValue(page, 'Grower')).toBe(growerName);
    expect(await factValue(page, 'Farm')).toBe(farmName);

    expect(await listed(page, baseUrl, '/growers', 'Growers')).toContain(growerName);
    expect(await listed(page, baseUrl, '/farms', 'Farms')).toContain(farmName);
    expect(await listed(page, baseUrl, '/fields', 'Fields')).toContain(fieldName);

    // Stored under one another, in the agronomist's workspace.
    const agronomist = await User.findOne({ where: { email: DEMO.agronomist.email } });
    const grower = await Grower.findByPk(growerId);
    const farm = await Farm.findOne({ where: { name: farmName } });
    const field = await Field.findOne({ where: { name: fieldName } });
    expect(grower?.workspaceId).toBe(agronomist?.workspaceId);
    expect(grower?.contactName).toBe('Ada Testperson');
    expect(farm?.growerId).toBe(growerId);
    expect(field?.farmId).toBe(farm?.id);
    expect(field?.growerId).toBe(growerId);
  });

  it('refuses a planter with more sections than its display, beside Rows per section, and saves it at 2 per section', async () => {
    const { baseUrl, signedInPage } = world();
    const agronomist = await User.findOne({ where: { email: DEMO.agronomist.email } });
    const grower = await Grower.create({
      workspaceId: agronomist!.workspaceId,
      name: `Hollin Test Farms ${tag()}`,
      contactName: null,
      email: null,
      phone: null,
      notes: null,
    });
    const planterName = `24-row test rig ${tag()}`;
    const page = await signedInPage('agronomist');
    await openPage(page, baseUrl, `/growers/${grower.id}`, grower.name);
    await page.getByRole('link', { name: 'Add planter' }).click();
    await page.getByRole('heading', { level: 1, name: 'Add a planter' }).waitFor();
    await expect.poll(() => chosenOption(page.getByLabel('Grower'))).toBe(grower.name);

    await page.getByLabel('Name').fill(planterName);
    await page.getByLabel('Rows', { exact: true }).fill('24');
    await page.getByLabel(/^Row spacing\s*\(in\)$/).fill('30');
    await page.getByLabel('Rows per section').fill('1');
    await page.getByLabel('Sections the display controls').fill('16');
    await page.getByLabel('Crop 1', { exact: true }).selectOption({ label: 'Corn' });
    await page.getByLabel('Holes per disc for crop 1', { exact: true }).fill('30');
    await page.getByLabel(/^Lowest disc speed\s*\(rpm\)$/).fill('4');
    await page.getByLabel(/^Highest disc speed\s*\(rpm\)$/).fill('45');
    await page.getByLabel(/^Lowest planting speed\s*\(mph\)$/).fill('4');
    await page.getByLabel(/^Planned speed\s*\(mph\)$/).fill('5');
    await page.getByLabel(/^Highest planting speed\s*\(mph\)$/).fill('6.5');
    await page.getByLabel('Ground speed from').selectOption({ label: 'GNSS receiver' });

    // The live sum warns before saving…
    const sum = page.getByRole('status').filter({ hasText: 'per section =' });
    await sum
      .getByText('More sections than the display can switch: use at least 2 rows per section.')
      .waitFor();
    expect(await sum.innerText()).toContain('24 rows ÷ 1 per section = 24 sections (display controls 16)');

    // …and saving puts the reason beside the input, and stores nothing.
    await page.getByRole('button', { name: 'Add planter', exact: true }).click();
    const rowsPerSection = page.getByLabel('Rows per section');
    await page.getByText(/use at least 2 rows per section$/).waitFor();
    expect(await rowsPerSection.getAttribute('aria-invalid')).toBe('true');
    expect(await descriptionOf(rowsPerSection)).toBe(
      "24 rows at 1 per section make 24 sections, more than the display's 16: use at least 2 rows per section",
    );
    expect(new URL(page.url()).pathname).toBe('/planters/new');
    expect(await Planter.count({ where: { name: planterName } })).toBe(0);

    await rowsPerSection.fill('2');
    await sum.getByText('24 rows ÷ 2 per section = 12 sections (display controls 16)').waitFor();
    expect(await sum.innerText()).not.toContain('More sections than the display can switch');
    await submitAndOpen(page, 'Add planter', planterName);

    expect(await factValue(page, 'Sections (display controls 16)')).toBe('12');
    expect(await factValue(page, 'Rows')).toBe('24');
    expect(await factValue(page, 'Row spacing')).toBe('30.0 in');
    const stored = await Planter.findByPk(idInUrl(page));
    expect(stored?.growerId).toBe(grower.id);
    expect(stored?.rowCount).toBe(24);
    expect(stored?.rowsPerSection).toBe(2);
    expect(stored?.displaySectionLimit).toBe(16);
    // 30 in = 30 × 0.0254 m exactly (NIST SP 811, B.8): 0.762 m, with no rounding on the way.
    expect(stored?.rowSpacingM).toBe(0.0254 * 30);
    expect(stored?.rowSpacingM).toBe(0.762);
  });

  it('a duplicate grower name shows the server’s message beside Name and stores nothing', async () => {
    const { baseUrl, signedInPage } = world();
    const page = await signedInPage('agronomist');
    const sameName = where(fn('lower', col('name')), 'oduya family farms');
    const before = await Grower.count({ where: sameName });
    expect(before).toBe(1);

    await openPage(page, baseUrl, '/growers/new', 'Add a grower');
    const name = page.getByLabel('Name');
    // Another case of a demo grower's name: names are unique without regard to case.
    await name.fill('oduya family FARMS');
    await page.getByRole('button', { name: 'Add grower', exact: true }).click();
    await page.getByText('A grower with this name already exists').waitFor();
    expect(await descriptionOf(name)).toBe('A grower with this name already exists');
    expect(await name.getAttribute('aria-invalid')).toBe('true');
    expect(new URL(page.url()).pathname).toBe('/growers/new');
    expect(await page.getByRole('alert').count(), 'a form-level notice as well').toBe(0);
    expect(await Grower.count({ where: sameName })).toBe(before);
  });
});
