import { cpSync, existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, statSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { createServer } from 'node:http';
import { chromium, type BrowserContext, type Locator, type Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, expect } from 'vitest';
import { startTestApp, type TestApp } from './app';
import { closeApp, createApp } from '../../server/app';
import { createSmtpMailer } from '../../server/mail/mailer';
import demoUsers from '../../server/db/demo-users.json';
import type { Role } from '../../shared/schemas/auth.schema';

export type BrowserWorld = {
  t: TestApp;
  baseUrl: string;
  context: BrowserContext;
  /** Every request the page made that did not go to our own server. */
  foreignRequests: string[];
  /** Every uncaught exception thrown in any page of the context (`page.on('pageerror')`). */
  pageErrors: string[];
  newPage(): Promise<Page>;
  /** A new page with no session: the context's cookies are cleared first. */
  freshPage(): Promise<Page>;
  /** A fresh page signed in as a demo role through the sign-in form. */
  signedInPage(role: Role): Promise<Page>;
  /** Closes every open page (the context stays). */
  closePages(): Promise<void>;
  close(): Promise<void>;
};

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/** Newest modification time of a folder and everything in it. */
function newestMtime(dir: string): number {
  let newest = statSync(dir).mtimeMs;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    newest = Math.max(newest, entry.isDirectory() ? newestMtime(full) : statSync(full).mtimeMs);
  }
  return newest;
}

/**
 * A private copy of the built client for one test file, so a build started elsewhere while the file runs
 * (another `npm test`, `npm run build`) cannot swap the page's code chunks away under it. Copies only a
 * build that has been still for a moment and whose index.html names files that are all there.
 */
async function snapshotClient(dir: string): Promise<string> {
  const copy = mkdtempSync(path.join(os.tmpdir(), 'sowright-client-'));
  for (let attempt = 0; attempt < 60; attempt++) {
    try {
      if (Date.now() - newestMtime(dir) > 1000) {
        rmSync(copy, { recursive: true, force: true });
        cpSync(dir, copy, { recursive: true });
        const html = readFileSync(path.join(copy, 'index.html'), 'utf8');
        const named = [...html.matchAll(/(?:src|href)="\/(assets\/[^"]+)"/g)].map((m) => m[1]);
        if (
          named.length > 0 &&
          named.every((f) => existsSync(path.join(copy, f))) &&
          Date.now() - newestMtime(dir) > 1000
        )
          return copy;
      }
    } catch {
      // A build is rewriting the folder: wait and try again.
    }
    await sleep(500);
  }
  throw new Error(`no settled client build in ${dir}: run \`npm test\`, which builds it`);
}

/**
 * The real app serving the built client (dist/) on a free loopback port, and Debian's Chromium driven by
 * playwright-core with a fresh profile. Chromium is kept from reaching anything but 127.0.0.1, and every
 * request elsewhere is recorded so a test can fail on it.
 */
export async function startBrowserWorld(): Promise<BrowserWorld> {
  const t = await startTestApp();
  const clientDir = await snapshotClient(process.env.SOWRIGHT_CLIENT_DIR ?? path.resolve('dist'));
  // Listen first, so the app's own address (the links it e-mails) carries the real port.
  const server = createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', () => resolve()));
  const baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const app = createApp({
    sequelize: t.sequelize,
    jwtSecret: t.jwtSecret,
    mailer: createSmtpMailer({
      host: '127.0.0.1',
      port: t.mailbox.port,
      from: 'Sowright <test@sowright.invalid>',
    }),
    mailbox: t.mailbox,
    appUrl: baseUrl,
    version: 'test',
    clientDir,
    files: t.files,
    enqueueLog: t.enqueueLog,
  });
  server.on('request', app);
  const profile = mkdtempSync(path.join(os.tmpdir(), 'sowright-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: '/usr/bin/chromium',
    headless: true,
    viewport: { width: 1360, height: 860 },
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
      '--host-resolver-rules=MAP * ~NOTFOUND , EXCLUDE 127.0.0.1',
    ],
  });
  const foreignRequests: string[] = [];
  context.on('request', (req) => {
    const url = req.url();
    if (!url.startsWith(`${baseUrl}/`) && !url.startsWith('data:') && !url.startsWith('blob:'))
      foreignRequests.push(url);
  });
  const pageErrors: string[] = [];
  const watch = (page: Page) =>
    page.on('pageerror', (err) => pageErrors.push(`${page.url()}: ${err.stack ?? err.message}`));
  context.pages().forEach(watch);
  context.on('page', watch);
  const freshPage = async () => {
    await context.clearCookies();
    return context.newPage();
  };
  return {
    t,
    baseUrl,
    context,
    foreignRequests,
    pageErrors,
    newPage: () => context.newPage(),
    freshPage,
    async signedInPage(role) {
      const page = await freshPage();
      await signInAs(page, baseUrl, role);
      return page;
    },
    async closePages() {
      await Promise.all(context.pages().map((p) => p.close()));
    },
    async close() {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
      rmSync(clientDir, { recursive: true, force: true });
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await closeApp(app);
      await t.close();
    },
  };
}

/**
 * One browser world for a test file (the context persists across its tests). After each test every page is
 * closed, and the test fails if a request left 127.0.0.1 or a page threw an uncaught error during it.
 */
export function browserWorldPerFile(): () => BrowserWorld {
  let world: BrowserWorld | undefined;
  beforeAll(async () => {
    world = await startBrowserWorld();
  });
  afterEach(async () => {
    if (!world) return;
    await world.closePages();
    const foreign = world.foreignRequests.splice(0);
    const errors = world.pageErrors.splice(0);
    expect(foreign, 'requests that left 127.0.0.1').toEqual([]);
    expect(errors, 'uncaught errors in the page').toEqual([]);
  });
  afterAll(async () => {
    await world?.close();
  });
  return () => {
    if (!world) throw new Error('the browser world has not started');
    return world;
  };
}

/** The demo sign-ins the test database is seeded with (README.md), by role. */
export const DEMO: Record<Role, { email: string; name: string; password: string }> = {
  admin: demoUser('admin'),
  agronomist: demoUser('agronomist'),
  farmer: demoUser('farmer'),
  consultant: demoUser('consultant'),
};

function demoUser(role: Role) {
  const user = demoUsers.find((u) => u.role === role);
  if (!user) throw new Error(`server/db/demo-users.json has no ${role}`);
  return user;
}

/** Signs in through the page's own form. */
export async function signInThroughPage(page: Page, baseUrl: string, email: string, password: string) {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel(/e-?mail/i).fill(email);
  await page.getByLabel(/^password/i).fill(password);
  await page.getByRole('button', { name: /sign in/i }).click();
}

/** Signs in as a demo role through the form and waits for the signed-in frame to show that person. */
export async function signInAs(page: Page, baseUrl: string, role: Role) {
  const who = DEMO[role];
  await signInThroughPage(page, baseUrl, who.email, who.password);
  await signedInFrame(page, who.name).waitFor();
}

/** The left rail's "who is signed in" name: present only once the app shell is drawn for that person. */
export const signedInFrame = (page: Page, name: string) =>
  page.getByRole('complementary').getByText(name, { exact: true });

/** The main navigation of the signed-in frame. */
export const mainNav = (page: Page) => page.getByRole('navigation', { name: 'Main' });

/** Signs out with the rail's button and waits for the sign-in page. */
export async function signOutThroughPage(page: Page) {
  await page.getByRole('button', { name: 'Sign out' }).click();
  await page.waitForURL((url) => url.pathname === '/sign-in');
}

/** Follows a link of the main navigation and waits for the page's heading of the same name. */
export async function openFromNav(page: Page, label: string) {
  await mainNav(page).getByRole('link', { name: label, exact: true }).click();
  await page.getByRole('heading', { level: 1, name: label, exact: true }).waitFor();
}

/** Follows a record's name in a list (the table named `table`) and waits for the record's page. */
export async function openFromTable(page: Page, table: string, name: string) {
  await page.getByRole('table', { name: table }).getByRole('link', { name, exact: true }).click();
  await page.getByRole('heading', { level: 1, name, exact: true }).waitFor();
}

/** Opens a path of the app and waits for the page's heading. */
export async function openPage(page: Page, baseUrl: string, path: string, heading: string | RegExp) {
  await page.goto(`${baseUrl}${path}`);
  await page.getByRole('heading', { level: 1, name: heading }).waitFor();
}

/** The text of the elements a control's `aria-describedby` points to: its hint and its error. */
export const descriptionOf = (control: Locator) =>
  control.evaluate((el) =>
    (el.getAttribute('aria-describedby') ?? '')
      .split(/\s+/)
      .filter(Boolean)
      .map((id) => document.getElementById(id)?.textContent ?? '')
      .join(' '),
  );

/** The text of the first cell of every body row of a table: the record names of a register list. */
export async function firstColumn(table: Locator): Promise<string[]> {
  await table.waitFor();
  const rows = table.locator('tbody').getByRole('row');
  const names: string[] = [];
  for (const row of await rows.all()) names.push((await row.getByRole('cell').first().innerText()).trim());
  return names;
}

/** The value shown beside a label in a record page's facts (a `<dt>` and the `<dd>` after it). */
export async function factValue(page: Page, label: string): Promise<string> {
  const term = page
    .getByRole('term')
    .filter({ hasText: new RegExp(`^${label.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}$`) });
  return (await term.locator('xpath=following-sibling::dd[1]').innerText()).trim();
}

/** The label of the option a select shows as chosen. */
export const chosenOption = (select: Locator) =>
  select.evaluate((el) => {
    const s = el as HTMLSelectElement;
    return s.selectedIndex >= 0 ? s.options[s.selectedIndex].text : '';
  });
