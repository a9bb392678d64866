// Browser test of the foundation: register → create a manuscript → invite a coauthor → the
// coauthor opens the link from the Outbox in a second browser, registers, accepts → both see
// the membership. Real service, real MariaDB, real SMTP sink, Debian's Chromium.
import { join } from 'node:path';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { launchBrowser, SCREENSHOTS, startService, type RunningService } from './harness';

// invented people and lab (demo data rule: no real names)
const OWNER = {
  name: 'Ilse Marrow',
  email: 'ilse.marrow@saltmarsh-lab.example',
  password: 'lidProtease-2026',
};
const COAUTHOR = {
  name: 'Teodor Quill',
  email: 'teo.quill@saltmarsh-lab.example',
  password: 'helixTurn-0815',
};
// markup in a title must come back as literal text, never as HTML
const TITLE = 'Crystal structure of the <b>Saltmarsh</b> lid protease & its inhibitor';

let service: RunningService;
let browser: Browser;
const pageErrors: string[] = [];

async function newPage(ctx: BrowserContext): Promise<Page> {
  const page = await ctx.newPage();
  page.on('pageerror', (err) => pageErrors.push(`${err.name}: ${err.message}`));
  return page;
}

async function shot(page: Page, name: string): Promise<void> {
  // let dialog and toast transitions finish so the picture shows the settled screen
  await page.waitForFunction(
    () => !document.querySelector('[class*="-enter-active"], [class*="-exit-active"]'),
  );
  await page.screenshot({
    path: join(SCREENSHOTS, `${name}.png`),
    fullPage: true,
    animations: 'disabled',
  });
}

async function register(page: Page, who: typeof OWNER): Promise<void> {
  await page.getByLabel('Your name').fill(who.name);
  const email = page.getByLabel('E-mail address');
  if ((await email.inputValue()) !== who.email) await email.fill(who.email);
  await page.getByLabel('Password').fill(who.password);
  await page.getByRole('button', { name: 'Create account' }).click();
}

beforeAll(async () => {
  service = await startService();
  browser = await launchBrowser();
}, 90_000);

afterAll(async () => {
  await browser?.close();
  await service?.stop();
});

test('register, create a manuscript, invite, accept in a second browser, membership visible', async () => {
  const ownerCtx = await browser.newContext({
    baseURL: service.url,
    viewport: { width: 1280, height: 860 },
  });
  const owner = await newPage(ownerCtx);

  // a signed-out visitor is sent to sign-in, remembering where they wanted to go
  await owner.goto('/desk');
  await owner.waitForURL(/\/sign-in\?next=%2Fdesk$/);
  await shot(owner, '01-sign-in');

  await owner.getByRole('link', { name: 'Create an account' }).click();
  await owner.waitForURL(/\/register/);
  await register(owner, OWNER);
  await owner.waitForURL(/\/desk$/);
  await owner.getByText('Your Desk is empty').waitFor();
  await shot(owner, '02-desk-empty');

  // create a manuscript through the dialog
  await owner.getByRole('button', { name: 'New manuscript' }).first().click();
  await owner.getByLabel('Working title').fill(TITLE);
  await shot(owner, '03-create-dialog');
  await owner.getByRole('button', { name: 'Create manuscript' }).click();
  await owner.waitForURL(/\/manuscripts\/[^/]+\/models$/);
  const manuscriptPath = new URL(owner.url()).pathname.replace(/\/models$/, '');
  await owner.getByRole('heading', { level: 1 }).getByText(TITLE, { exact: true }).waitFor();
  expect(await owner.locator('h1 b').count()).toBe(0);
  await owner.getByText('arrives with a later release').waitFor();
  await owner.getByText('Validation supports expert judgement').waitFor();
  await shot(owner, '04-workspace-models');

  // Members: the owner alone, then an invitation
  await owner.getByRole('tab', { name: 'Members' }).click();
  await owner.waitForURL(new RegExp(`${manuscriptPath}/members$`));
  const members = owner.getByTestId('members-table');
  await members.getByText(OWNER.email).waitFor();
  expect(await members.locator('tbody tr').count()).toBe(1);

  await owner.getByRole('button', { name: 'Invite' }).click();
  const dialog = owner.getByRole('dialog');
  await dialog.getByLabel('E-mail address').fill(COAUTHOR.email);
  await dialog.getByLabel('Role').selectOption('editor');
  await shot(owner, '05-invite-dialog');
  await dialog.getByRole('button', { name: 'Send invitation' }).click();
  await dialog.waitFor({ state: 'detached' });
  const pending = owner.getByTestId('invitations-table');
  await pending.getByText(COAUTHOR.email).waitFor();
  expect(await pending.locator('tbody tr').first().textContent()).toContain('Editor');
  await shot(owner, '06-members-invited');

  // the Desk lists it with the owner's role and one member
  await owner.locator('.ff-navbar').getByRole('link', { name: 'Desk', exact: true }).click();
  const desk = owner.getByTestId('desk-table');
  await desk.getByText(TITLE, { exact: true }).waitFor();
  const deskText = (await desk.textContent()) ?? '';
  expect(deskText).toContain('Owner');
  await shot(owner, '07-desk');

  // the first account of a fresh install is its admin: read the invitation in the Outbox
  await owner.locator('.ff-navbar').getByRole('link', { name: 'Admin' }).click();
  await owner.getByTestId('users-table').getByText(OWNER.email).waitFor();
  await owner.getByRole('tab', { name: 'Outbox' }).click();
  const mail = owner.getByTestId('outbox-list').locator('a', { hasText: COAUTHOR.email });
  await mail.first().click();
  const message = owner.getByTestId('outbox-message');
  await message.getByText(COAUTHOR.email).first().waitFor();
  const inviteLink = message.locator('a[href*="/invitations/"]').first();
  const href = await inviteLink.getAttribute('href');
  expect(href).toMatch(/^\/invitations\/[^/]+$/);
  await shot(owner, '08-outbox-message');

  // second browser: the coauthor opens the link signed out, registers, and comes back to accept
  const coCtx = await browser.newContext({
    baseURL: service.url,
    viewport: { width: 1280, height: 860 },
  });
  const co = await newPage(coCtx);
  await co.goto(href as string);
  await co.getByText(TITLE, { exact: true }).waitFor();
  expect((await co.locator('.ff-invitation').textContent()) ?? '').toContain('Editor');
  expect((await co.locator('.ff-invitation').textContent()) ?? '').toContain(OWNER.name);
  await shot(co, '09-invitation-signed-out');

  await co.getByRole('button', { name: 'Create an account' }).click();
  await co.waitForURL(/\/register\?next=/);
  // the invited address is filled in for them
  expect(await co.getByLabel('E-mail address').inputValue()).toBe(COAUTHOR.email);
  await register(co, COAUTHOR);
  await co.waitForURL(/\/invitations\/[^/]+$/);
  await co.getByRole('button', { name: 'Accept invitation' }).waitFor();
  await shot(co, '10-invitation-signed-in');
  await co.getByRole('button', { name: 'Accept invitation' }).click();
  await co.waitForURL(new RegExp(`${manuscriptPath}/members$`));
  const coMembers = co.getByTestId('members-table');
  await coMembers.getByText(OWNER.email).waitFor();
  await coMembers.getByText(COAUTHOR.email).waitFor();
  expect(await coMembers.locator('tbody tr').count()).toBe(2);
  // an editor sees no invite button and no pending invitations
  expect(await co.getByRole('button', { name: 'Invite' }).count()).toBe(0);
  await shot(co, '11-members-as-coauthor');

  // the coauthor's Desk shows the manuscript with their role
  await co.goto('/desk');
  const coDesk = co.getByTestId('desk-table');
  await coDesk.getByText(TITLE, { exact: true }).waitFor();
  expect((await coDesk.textContent()) ?? '').toContain('Editor');

  // the owner sees the new member, and the invitation is no longer pending
  await owner.goto(`${manuscriptPath}/members`);
  const ownerMembers = owner.getByTestId('members-table');
  await ownerMembers.getByText(COAUTHOR.email).waitFor();
  const row = ownerMembers.locator('tbody tr', { hasText: COAUTHOR.email });
  expect(await row.getByRole('combobox').inputValue()).toBe('editor');
  await owner.getByText('No invitation is waiting for an answer.').waitFor();
  await shot(owner, '12-members-as-owner');

  // a reload keeps the session (silent refresh from the httpOnly cookie)
  await owner.reload();
  await owner.getByTestId('members-table').getByText(COAUTHOR.email).waitFor();
  expect(new URL(owner.url()).pathname).toBe(`${manuscriptPath}/members`);

  expect(pageErrors).toEqual([]);
  await coCtx.close();
  await ownerCtx.close();
}, 120_000);
