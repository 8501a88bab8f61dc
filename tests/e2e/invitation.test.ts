import { randomUUID } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { ConsultantGrower, User } from '../../server/db/associations';
import {
  browserWorldPerFile,
  firstColumn,
  mainNav,
  openFromNav,
  signedInFrame,
  signOutThroughPage,
} from '../helpers/browser';

const world = browserWorldPerFile();

describe('an invitation, from People to the first sign-in', () => {
  it('the admin invites a consultant for one grower; the link in the mail outbox signs them in seeing that grower only', async () => {
    const { baseUrl, signedInPage, t } = world();
    const id = randomUUID().slice(0, 8);
    const invitee = { name: `Corin Testwell ${id}`, email: `consultant-${id}@test.example` };
    const password = `furrow lantern ${id} quietly`;
    const page = await signedInPage('admin');

    // People → Invite someone: a consultant who reads Brennick Grain.
    await mainNav(page).getByRole('link', { name: 'People' }).click();
    await page.getByRole('link', { name: 'Invite someone' }).click();
    await page.getByRole('heading', { level: 1, name: 'Invite someone' }).waitFor();
    await page.getByLabel('Name').fill(invitee.name);
    await page.getByLabel('E-mail').fill(invitee.email);
    await page.getByLabel('Role').selectOption({ label: 'Consultant' });
    const readable = page.getByRole('group', { name: 'Growers this consultant reads' });
    await readable.getByLabel('Brennick Grain').check();
    await page.getByRole('button', { name: 'Send invitation' }).click();
    await page.waitForURL(`${baseUrl}/people`);
    // The list may first show what it had cached, then reload: wait for the new person's row.
    const row = page
      .getByRole('table', { name: 'People' })
      .getByRole('row')
      .filter({ hasText: invitee.email });
    await row.waitFor();
    const cells = await row.getByRole('cell').allInnerTexts();
    expect(cells.map((c) => c.trim())).toEqual(
      expect.arrayContaining([invitee.name, invitee.email, 'Consultant', 'Invited', 'Brennick Grain']),
    );

    // The catcher has it (delivery is asynchronous); then the outbox shows it.
    await t.mailbox.waitFor((m) => m.to.includes(invitee.email), 10_000);
    await openFromNav(page, 'Mail outbox');
    await page
      .getByRole('list', { name: 'Messages' })
      .getByRole('button')
      .filter({ hasText: invitee.email })
      .click();
    const message = page.getByRole('article', { name: 'Message' });
    await message.getByText(invitee.email, { exact: true }).waitFor();
    const link = message.getByRole('link', { name: /\/invitation\?token=/ });
    expect(await link.count()).toBe(1);
    const href = await link.getAttribute('href');
    expect(href?.startsWith(`${baseUrl}/invitation?token=`), `the link points at this app: ${href}`).toBe(
      true,
    );

    await signOutThroughPage(page);
    await page.goto(href!);
    await page.getByRole('heading', { level: 1, name: 'Join your team on Sowright' }).waitFor();
    await page.getByText(invitee.email, { exact: true }).waitFor();
    expect(await page.getByLabel('Your name').inputValue()).toBe(invitee.name);
    await page.getByLabel('New password', { exact: true }).fill(password);
    await page.getByLabel('New password again').fill(password);
    await page.getByRole('button', { name: 'Join and sign in' }).click();

    // Signed in as the new consultant, who reads Brennick Grain and nothing else.
    await signedInFrame(page, invitee.name).waitFor();
    expect(new URL(page.url()).pathname).toBe('/');
    expect(await page.getByRole('complementary').getByText('Consultant', { exact: true }).count()).toBe(1);
    await openFromNav(page, 'Growers');
    expect(await firstColumn(page.getByRole('table', { name: 'Growers' }))).toEqual(['Brennick Grain']);
    expect(await mainNav(page).getByRole('link', { name: 'People' }).count()).toBe(0);

    const user = await User.findOne({ where: { email: invitee.email } });
    expect(user?.role).toBe('consultant');
    expect(user?.status).toBe('active');
    expect(await ConsultantGrower.count({ where: { userId: user!.id } })).toBe(1);

    // The link works once.
    await page.goto(href!);
    await page.getByText('This invitation cannot be used').waitFor();
  });
});
