import { randomUUID } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { Grower, Planter } from '../../server/db/associations';
import {
  browserWorldPerFile,
  DEMO,
  firstColumn,
  mainNav,
  openFromNav,
  openFromTable,
  signedInFrame,
  signInThroughPage,
  signOutThroughPage,
} from '../helpers/browser';

const world = browserWorldPerFile();

const DEMO_GROWERS = ['Brennick Grain', 'Halloway Ridge Partners', 'Oduya Family Farms'];

/** Links and buttons that create, edit, archive or restore a record ("Add grower", "Edit …", "Archive planter …"). */
const changeControls = (page: Page) => {
  const name = /^(add|edit|archive|restore)\b/i;
  return page
    .getByRole('main')
    .getByRole('link', { name })
    .or(page.getByRole('main').getByRole('button', { name }));
};

/** The one row of a demo record, looked up by name (the demo is seeded once per test run). */
function onlyOne<T>(rows: T[], what: string): T {
  expect(rows, what).toHaveLength(1);
  return rows[0];
}
const demoGrower = async (name: string) =>
  onlyOne(await Grower.findAll({ where: { name } }), `growers named ${name}`);
const demoPlanter = async (name: string) =>
  onlyOne(await Planter.findAll({ where: { name } }), `planters named ${name}`);

describe('what each demo role sees after signing in through the form', () => {
  it('admin: the navigation offers People and Mail outbox', async () => {
    const { signedInPage } = world();
    const page = await signedInPage('admin');
    const nav = mainNav(page);
    await nav.getByRole('link', { name: 'Growers' }).waitFor();
    expect(await nav.getByRole('link', { name: 'People' }).count()).toBe(1);
    expect(await nav.getByRole('link', { name: 'Mail outbox' }).count()).toBe(1);

    await nav.getByRole('link', { name: 'People' }).click();
    await page.getByRole('heading', { level: 1, name: 'People' }).waitFor();
    const people = await firstColumn(page.getByRole('table', { name: 'People' }));
    expect(people).toEqual(expect.arrayContaining(Object.values(DEMO).map((u) => u.name)));
  });

  it('agronomist: no People or Mail outbox, every demo grower, and the register can be changed', async () => {
    const { baseUrl, signedInPage } = world();
    const page = await signedInPage('agronomist');
    const nav = mainNav(page);
    await nav.getByRole('link', { name: 'Growers' }).click();
    const growers = await firstColumn(page.getByRole('table', { name: 'Growers' }));
    expect(growers).toEqual(expect.arrayContaining(DEMO_GROWERS));
    expect(await nav.getByRole('link', { name: 'People' }).count()).toBe(0);
    expect(await nav.getByRole('link', { name: 'Mail outbox' }).count()).toBe(0);
    // The same check that finds nothing for a consultant finds the agronomist's controls here.
    expect(await changeControls(page).count()).toBeGreaterThan(DEMO_GROWERS.length);

    await page.goto(`${baseUrl}/people`);
    await page.getByText('Not part of your role').waitFor();
    expect(await page.getByRole('table', { name: 'People' }).count()).toBe(0);
  });

  it('farmer: only Oduya Family Farms, nothing to add in the register, and may edit its planter', async () => {
    const { baseUrl, signedInPage } = world();
    const page = await signedInPage('farmer');
    for (const title of ['Farms', 'Fields', 'Growers']) {
      await openFromNav(page, title);
      await page.getByRole('table', { name: title }).waitFor();
      expect(await changeControls(page).count(), `change controls on ${title}`).toBe(0);
    }
    expect(await firstColumn(page.getByRole('table', { name: 'Growers' }))).toEqual(['Oduya Family Farms']);

    // On the grower's own page only its planters may be added to.
    await openFromTable(page, 'Growers', 'Oduya Family Farms');
    await page.getByRole('table', { name: 'Planters' }).waitFor();
    expect(await page.getByRole('link', { name: 'Add farm' }).count()).toBe(0);
    expect(await page.getByRole('link', { name: 'Add field' }).count()).toBe(0);
    expect(await page.getByRole('link', { name: 'Add planter' }).count()).toBe(1);

    const planter = await demoPlanter('24-row front fold');
    await openFromTable(page, 'Planters', '24-row front fold');
    await page.getByRole('main').getByRole('link', { name: 'Edit', exact: true }).click();
    await page.getByRole('heading', { level: 1, name: 'Edit 24-row front fold' }).waitFor();
    const notes = `Checked the drive chains ${randomUUID().slice(0, 8)}`;
    await page.getByLabel('Notes').fill(notes);
    await page.getByRole('button', { name: 'Save changes' }).click();
    await page.waitForURL(`${baseUrl}/planters/${planter.id}`);
    await page.getByText(notes).waitFor();
    await planter.reload();
    expect(planter.notes).toBe(notes);
  });

  it('consultant: Oduya Family Farms and Brennick Grain only, and no control that changes the register', async () => {
    const { signedInPage } = world();
    const page = await signedInPage('consultant');
    await openFromNav(page, 'Growers');
    expect(await firstColumn(page.getByRole('table', { name: 'Growers' }))).toEqual([
      'Brennick Grain',
      'Oduya Family Farms',
    ]);
    expect(await changeControls(page).count()).toBe(0);

    for (const title of ['Farms', 'Fields', 'Crop seasons', 'Planters']) {
      await openFromNav(page, title);
      const names = await firstColumn(page.getByRole('table', { name: title }));
      expect(names.length, `rows on ${title}`).toBeGreaterThan(0);
      expect(await changeControls(page).count(), `change controls on ${title}`).toBe(0);
    }

    // A record's own page: a grower (with its farms, fields and planters), a field and a planter.
    await openFromNav(page, 'Growers');
    await openFromTable(page, 'Growers', 'Oduya Family Farms');
    for (const table of ['Farms', 'Fields', 'Planters'])
      await page.getByRole('table', { name: table }).waitFor();
    expect(await changeControls(page).count(), 'change controls on the grower page').toBe(0);

    await openFromTable(page, 'Fields', 'North quarter');
    await page.getByRole('table', { name: 'Crop seasons' }).waitFor();
    expect(await changeControls(page).count(), 'change controls on the field page').toBe(0);

    await page.goBack();
    await openFromTable(page, 'Planters', '24-row front fold');
    expect(await changeControls(page).count(), 'change controls on the planter page').toBe(0);
  });

  it('a grower outside the farmer’s scope, opened by its address, is not found and shows none of its data', async () => {
    const { baseUrl, signedInPage } = world();
    const halloway = await demoGrower('Halloway Ridge Partners');
    const hallowayPlanter = await demoPlanter('8-row rigid');
    expect(hallowayPlanter.growerId).toBe(halloway.id);
    const page = await signedInPage('farmer');

    for (const path of [`/growers/${halloway.id}`, `/planters/${hallowayPlanter.id}`]) {
      await page.goto(`${baseUrl}${path}`);
      await page.getByText('Nothing here').waitFor();
      await page.getByText('This record does not exist, or you do not have access to it.').waitFor();
      const shown = await page.getByRole('main').innerText();
      for (const secret of ['Halloway', halloway.contactName ?? '', hallowayPlanter.name]) {
        expect(shown, `${path} shows ${secret}`).not.toContain(secret);
      }
    }
  });
});

describe('sessions through the sign-in page', () => {
  it('signing out returns to sign-in, and a protected address then asks to sign in first', async () => {
    const { baseUrl, signedInPage } = world();
    const page = await signedInPage('agronomist');
    await signOutThroughPage(page);
    await page.getByRole('heading', { level: 1, name: 'Sign in' }).waitFor();

    await page.goto(`${baseUrl}/growers`);
    await page.waitForURL((url) => url.pathname === '/sign-in');
    expect(new URL(page.url()).searchParams.get('next')).toBe('/growers');
    await page.getByRole('heading', { level: 1, name: 'Sign in' }).waitFor();
    expect(await page.getByRole('table', { name: 'Growers' }).count()).toBe(0);
    expect(await signedInFrame(page, DEMO.agronomist.name).count()).toBe(0);

    // Signing in from there goes on to the address that was asked for.
    await page.getByLabel('E-mail').fill(DEMO.agronomist.email);
    await page.getByLabel('Password').fill(DEMO.agronomist.password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(`${baseUrl}/growers`);
    await page.getByRole('table', { name: 'Growers' }).waitFor();
  });

  it('a wrong password shows one generic error on the form, the same as for an unknown e-mail', async () => {
    const { baseUrl, freshPage } = world();
    const page = await freshPage();
    const messages: string[] = [];
    for (const [email, password] of [
      [DEMO.farmer.email, 'not-the-farmer-password'],
      [`nobody-${randomUUID().slice(0, 8)}@quillmere.example`, DEMO.farmer.password],
    ]) {
      await signInThroughPage(page, baseUrl, email, password);
      const alert = page.getByRole('alert');
      await alert.waitFor();
      expect(await alert.count()).toBe(1);
      messages.push((await alert.innerText()).trim());
      expect(new URL(page.url()).pathname).toBe('/sign-in');
      for (const label of ['E-mail', 'Password']) {
        expect(
          await page.getByLabel(label).getAttribute('aria-invalid'),
          `${label} marked invalid`,
        ).toBeNull();
      }
      expect(await signedInFrame(page, DEMO.farmer.name).count()).toBe(0);
    }
    expect(messages[0]).toBe('The e-mail or password is not right.');
    expect(messages[1]).toBe(messages[0]);
  });
});

describe('the checks every test here ends with', () => {
  it('notice an uncaught error in a page and a request that leaves 127.0.0.1', async () => {
    const { freshPage, foreignRequests, pageErrors } = world();
    const page = await freshPage();
    await page.setContent('<p>A page that throws</p>');
    await page.evaluate(() =>
      setTimeout(() => {
        throw new Error('thrown on purpose');
      }),
    );
    await expect.poll(() => pageErrors.length).toBe(1);
    expect(pageErrors.splice(0)[0]).toContain('thrown on purpose');

    await page.goto('http://elsewhere.invalid/').catch(() => undefined);
    expect(foreignRequests.splice(0)).toEqual(['http://elsewhere.invalid/']);
  });
});
