import { beforeAll, describe, expect, it } from 'vitest';
import type { Locator, Page } from 'playwright-core';
import { browserWorldPerFile, factValue } from '../helpers/browser';

const world = browserWorldPerFile();

/** How long to wait for the server to answer and the maps to draw on a busy machine. */
const WAIT = { timeout: 60_000 };

type DemoLog = { id: string; fieldName: string; planterId: string; planterName: string; status: string };
let logs: DemoLog[] = [];

/** The first number of a text, commas for thousands ("1,234.5 ac" → 1234.5). */
const num = (text: string) => {
  const m = /−?-?\d[\d,]*(\.\d+)?/.exec(text);
  if (!m) throw new Error(`no number in "${text}"`);
  return Number(m[0].replace(/,/g, '').replace('−', '-'));
};

beforeAll(async () => {
  // The demo's logs, as the agronomist's browser reads them (the seeder 20261202-0004-demo-logs.ts imported them).
  const page = await world().signedInPage('agronomist');
  const res = await page.request.get(`${world().baseUrl}/api/logs`);
  expect(res.status()).toBe(200);
  const body = (await res.json()) as DemoLog[] | { items: DemoLog[] };
  logs = Array.isArray(body) ? body : body.items;
  await page.close();
});

const logOf = (field: string) => {
  const log = logs.find((l) => l.fieldName === field);
  if (!log) throw new Error(`the demo has no log for ${field}`);
  expect(log.status).toBe('ready');
  return log;
};

/** Opens a demo field's audit and answers its "Why it happened" section. */
async function diagnosticsOf(field: string): Promise<{ page: Page; why: Locator; consoleErrors: string[] }> {
  const page = await world().signedInPage('agronomist');
  const consoleErrors: string[] = [];
  page.on('console', (m) => {
    if (m.type() === 'error') consoleErrors.push(m.text());
  });
  await page.goto(`${world().baseUrl}/logs/${logOf(field).id}/audit`);
  await page.getByRole('heading', { level: 1, name: `Audit of ${field}` }).waitFor(WAIT);
  const why = page.getByRole('region', { name: 'Why it happened' });
  await why.waitFor(WAIT);
  return { page, why, consoleErrors };
}

const panel = (why: Locator, title: string) => why.getByRole('region', { name: title, exact: true });

describe('"Why it happened" on the demo audits (each field has one fault of known size)', () => {
  it('Creek bend: the controller lag of about 3 s the demo log was made with', async () => {
    const { page, why } = await diagnosticsOf('Creek bend');
    await panel(why, 'Controller lag').waitFor();
    // The seeder's fault: lagS 3 (server/db/seeders/20261202-0004-demo-logs.ts).
    const latency = num(await factValue(page, 'Latency (median)'));
    expect(latency).toBeGreaterThan(2.5);
    expect(latency).toBeLessThan(3.5);
    // The per-change chart is drawn, a dot per timed change.
    const chart = panel(why, 'Controller lag').getByRole('img', {
      name: /Latency of each of \d+ rate changes/,
    });
    expect(await chart.locator('circle').count()).toBeGreaterThan(5);
    // At the planned 5.5 mph of the demo planter, 3 s is some 24 ft: a length in feet, not zero.
    expect(num(await factValue(page, 'At the old rate past each zone edge'))).toBeGreaterThan(5);
    expect(await factValue(page, 'At the old rate past each zone edge')).toMatch(/ ft$/);
    // The demo log carries no per-row values: no rows panel.
    expect(await panel(why, 'Rows compared').count()).toBe(0);
  });

  it('Pond field: Row 7 named, below the others', async () => {
    const { why } = await diagnosticsOf('Pond field');
    const rows = panel(why, 'Rows compared');
    await rows.waitFor();
    // The seeder's fault: lowRow row 7 at 0.9 (10 % low) of 23 rows.
    expect(await rows.innerText()).toMatch(/Row 7 is \d+(\.\d)? % below the median in population/);
    const chart = rows.getByRole('img', { name: /Population of 23 rows/ });
    expect(await chart.getAttribute('aria-label')).toMatch(/apart: Row 7$/);
    expect(await chart.getByText('Row 7', { exact: true }).count()).toBe(1);
  });

  it('West slope: ground planted twice, and more alarms after 2 s than after 30 s, on maps that print', async () => {
    const { page, why, consoleErrors } = await diagnosticsOf('West slope');
    const coverage = panel(why, 'Skipped and double-planted ground');
    await coverage.waitFor();
    // The seeder's fault: passes overlapping by 1.5 m on an 8-row planter, some quarter of each pass.
    const double = await factValue(page, 'Planted twice or more');
    expect(double).toMatch(/ ac \(\d+(\.\d)? %\)$/);
    expect(num(double)).toBeGreaterThan(0);
    expect(num(double.split('(')[1])).toBeGreaterThan(5);

    const alarms = panel(why, 'Alarms at two delays').getByRole('table', { name: 'Alarm replay' });
    const counts = (
      await alarms
        .getByRole('row', { name: /^Alarms/ })
        .getByRole('cell')
        .allInnerTexts()
    ).map(num);
    const heads = await alarms.locator('thead th').allInnerTexts();
    expect(heads.slice(1).map((h) => /after (\d+) s/.exec(h)?.[1])).toEqual(['2', '30']);
    expect(counts).toHaveLength(2);
    expect(counts[0]).toBeGreaterThan(counts[1]);

    // Both diagnostic maps are drawn; the alarm starts of each delay can be switched off.
    for (const name of ['Alarm map of West slope', 'Coverage map of West slope']) {
      await page
        .getByRole('region', { name })
        .locator('[data-testid="map"][data-ready="true"]')
        .waitFor(WAIT);
    }
    // The coverage raster loads as an image (a data: URL) under the app's Content Security Policy.
    expect(consoleErrors.filter((e) => /Content Security Policy|Failed to fetch/.test(e))).toEqual([]);
    const short = page.getByRole('checkbox', { name: 'After 2 s' });
    expect(await short.isChecked()).toBe(true);
    await short.uncheck();
    expect(await short.isChecked()).toBe(false);

    // On paper every map, the diagnostics' too, is a picture taken just before printing.
    await page.evaluate(() => window.dispatchEvent(new Event('beforeprint')));
    await page.emulateMedia({ media: 'print' });
    for (const name of ['Alarm map of West slope', 'Coverage map of West slope']) {
      const img = why.getByRole('img', { name });
      expect(await img.isVisible()).toBe(true);
      expect(await img.getAttribute('src')).toMatch(/^data:image\/png;base64,/);
    }
  });

  it('Schoolhouse forty: the disc at its top speed in Better ground, with the speed that would have done', async () => {
    const { why } = await diagnosticsOf('Schoolhouse forty');
    const table = panel(why, 'Seed disc at its top speed').getByRole('table', {
      name: 'Disc at its top speed by zone',
    });
    await table.waitFor();
    // The seeder drives 1.25 × the planned speed with the disc capped: the highest-rate zone falls short most.
    const first = table.locator('tbody tr').first();
    expect(await first.getByRole('rowheader').innerText()).toBe('Better ground');
    const cells = await first.getByRole('cell').allInnerTexts();
    const [, shortBy, , driven, fastest] = cells;
    expect(num(shortBy)).toBeGreaterThan(1);
    expect(driven).toMatch(/ mph$/);
    // The speed that would have delivered the rate is below the one driven.
    expect(num(fastest)).toBeLessThan(num(driven));
  });

  it('North quarter: no panel for what the log does not carry, and nothing made up', async () => {
    const { why } = await diagnosticsOf('North quarter');
    expect(await panel(why, 'Rows compared').count()).toBe(0);
    expect(await panel(why, 'Seed disc at its top speed').count()).toBe(0);
    expect(await panel(why, 'Alarms at two delays').count()).toBe(1);
  });
});

describe('the planter logbook', () => {
  it("shows the demo planter's lifetime totals from its logs, per season and entry by entry", async () => {
    const log = logOf('Creek bend');
    const page = await world().signedInPage('agronomist');
    await page.goto(`${world().baseUrl}/planters/${log.planterId}`);
    await page.getByRole('heading', { level: 1, name: log.planterName }).waitFor(WAIT);
    const book = page.getByRole('region', { name: 'Logbook' });
    await book.getByRole('table', { name: 'Logbook entries' }).waitFor(WAIT);
    expect(await book.innerText()).toMatch(/cannot be edited/);
    expect(num(await factValue(page, 'Planted, all seasons'))).toBeGreaterThan(0);
    expect(num(await factValue(page, 'Seeds put down'))).toBeGreaterThan(0);
    expect(num(await factValue(page, 'Distance planting'))).toBeGreaterThan(0);
    expect(num(await factValue(page, 'Hours planting'))).toBeGreaterThan(0);
    // One entry per demo log of this planter, each with its note naming the file.
    const mine = logs.filter((l) => l.planterId === log.planterId);
    const entries = book.getByRole('table', { name: 'Logbook entries' }).locator('tbody tr');
    expect(await entries.count()).toBe(mine.length);
    expect(await entries.first().innerText()).toMatch(/Log added\s+Log \S+\.csv/);
    expect(
      await book.getByRole('table', { name: 'Logbook by season' }).locator('tbody tr').count(),
    ).toBeGreaterThan(0);
  });
});
