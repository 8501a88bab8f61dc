import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { startTestApp, type TestApp } from './app';
import { createApp } from '../../server/app';
import { createSmtpMailer } from '../../server/mail/mailer';

export type BrowserWorld = {
  t: TestApp;
  baseUrl: string;
  context: BrowserContext;
  /** Every request the page made that did not go to our own server. */
  foreignRequests: string[];
  newPage(): Promise<Page>;
  close(): Promise<void>;
};

/**
 * The real app serving the built client (dist/) on a free loopback port, and Debian's Chromium driven by
 * playwright-core with a fresh profile. Chromium is kept from reaching anything but 127.0.0.1, and every
 * request elsewhere is recorded so a test can fail on it.
 */
export async function startBrowserWorld(): Promise<BrowserWorld> {
  const t = await startTestApp();
  const clientDir = process.env.SOWRIGHT_CLIENT_DIR ?? path.resolve('dist');
  const server: Server = await new Promise((resolve) => {
    const s = createApp({
      sequelize: t.sequelize,
      jwtSecret: t.jwtSecret,
      mailer: createSmtpMailer({ host: '127.0.0.1', port: t.mailbox.port, from: 'Sowright <test@sowright.invalid>' }),
      mailbox: t.mailbox,
      appUrl: 'http://127.0.0.1',
      version: 'test',
      clientDir,
    }).listen(0, '127.0.0.1', () => resolve(s));
  });
  const baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
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
    if (!url.startsWith(baseUrl) && !url.startsWith('data:') && !url.startsWith('blob:')) foreignRequests.push(url);
  });
  return {
    t,
    baseUrl,
    context,
    foreignRequests,
    newPage: () => context.newPage(),
    async close() {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await t.close();
    },
  };
}

/** Signs in through the page's own form. */
export async function signInThroughPage(page: Page, baseUrl: string, email: string, password: string) {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel(/e-?mail/i).fill(email);
  await page.getByLabel(/^password/i).fill(password);
  await page.getByRole('button', { name: /sign in/i }).click();
}
