// Browser tests of the foundation against the real service, real MariaDB, its SMTP sink and
// Debian's Chromium: register → create a manuscript → invite → the coauthor opens the mailed link
// in a second browser, registers, accepts → both see the membership; then role change, revoke,
// leave; the Desk's sorting and archive; password reset through the mailed link.
import type { BrowserContext, Page } from 'playwright-core';
import {
  apiPost,
  browserSuite,
  fillRegister,
  fillSignIn,
  registerViaApi,
  shot,
  watchPageErrors,
  type Person,
} from './harness';

// invented people and lab (demo data rule: no real names)
const ADMIN: Person = {
  name: 'Maren Oakes',
  email: 'maren.oakes@saltmarsh-lab.example',
  password: 'siteAdmin-2026!',
};
const OWNER: Person = {
  name: 'Ilse Marrow',
  email: 'ilse.marrow@saltmarsh-lab.example',
  password: 'lidProtease-2026',
};
const COAUTHOR: Person = {
  name: 'Teodor Quill',
  email: 'teo.quill@saltmarsh-lab.example',
  password: 'helixTurn-0815',
};
const SORTER: Person = {
  name: 'Runa Vell',
  email: 'runa.vell@saltmarsh-lab.example',
  password: 'betaSheet-4242',
};
const FORGETFUL: Person = {
  name: 'Oskar Brine',
  email: 'oskar.brine@saltmarsh-lab.example',
  password: 'firstPass-1111',
};
const PROMOTED: Person = {
  name: 'Pell Arden',
  email: 'pell.arden@saltmarsh-lab.example',
  password: 'coiledCoil-5150',
};
const LEAVER: Person = {
  name: 'Sable North',
  email: 'sable.north@saltmarsh-lab.example',
  password: 'turnMotif-6262',
};
// markup in a title must come back as literal text, never as HTML
const TITLE = 'Crystal structure of the <b>Saltmarsh</b> lid protease & its inhibitor';
const VIEWPORT = { width: 1280, height: 860 };
const ACCESS_TTL_SEC = 5;

let adminPage: Page | null = null;

async function newPage(ctx: BrowserContext): Promise<Page> {
  return watchPageErrors(await ctx.newPage(), pageErrors);
}

/** The admin's page, signed in once and reused. */
async function adminSession(): Promise<Page> {
  if (!adminPage) {
    const ctx = await suite.browser.newContext({
      baseURL: suite.service.url,
      viewport: VIEWPORT,
    });
    adminPage = await newPage(ctx);
    await adminPage.goto('/sign-in?next=%2Fadmin%2Foutbox');
    await fillSignIn(adminPage, ADMIN);
    await adminPage.waitForURL(/\/admin\/outbox$/);
  }
  return adminPage;
}

/**
 * The newest mail to `to` whose subject matches, opened in the admin's Outbox page; returns the
 * in-app href of its first link (what a person would click).
 */
async function linkFromOutbox(to: string, subject: RegExp, screenshot?: string): Promise<string> {
  const page = await adminSession();
  await page.goto('/admin/outbox');
  const item = page
    .getByTestId('outbox-list')
    .locator('a', { hasText: to })
    .filter({ hasText: subject })
    .first();
  await item.click();
  const message = page.getByTestId('outbox-message');
  await message.getByText(to).first().waitFor();
  const href = await message.locator('.ff-message-links a').first().getAttribute('href');
  if (screenshot) await shot(page, screenshot);
  if (!href) throw new Error(`The mail to ${to} shows no link.`);
  return href;
}

const suite = browserSuite({
  // access tokens expire within the test, so the pages also exercise the silent refresh
  accessTtlSec: ACCESS_TTL_SEC,
  logName: 'invite-flow',
  // the first account of a fresh install becomes its admin (the one who reads the Outbox)
  afterStart: async (service) => {
    await registerViaApi(service.url, ADMIN);
  },
});
const pageErrors = suite.pageErrors;

test('register, create, invite, accept in a second browser; then change role, revoke, leave', async () => {
  const { service, browser } = suite;
  const ownerCtx = await browser.newContext({ baseURL: service.url, viewport: VIEWPORT });
  const owner = await newPage(ownerCtx);

  // a signed-out visitor is sent to sign-in, remembering where they wanted to go
  await owner.goto('/desk');
  await owner.waitForURL(/\/sign-in\?next=%2Fdesk$/);
  await shot(owner, '01-sign-in');

  await owner.getByRole('link', { name: 'Create an account' }).click();
  await owner.waitForURL(/\/register/);
  await fillRegister(owner, OWNER);
  await owner.waitForURL(/\/desk$/);
  await owner.getByText('Your Desk is empty').waitFor();
  // not an admin: no Admin entry, and the page itself says so
  expect(await owner.locator('.ff-navbar').getByRole('link', { name: 'Admin' }).count()).toBe(0);
  await shot(owner, '02-desk-empty');

  await owner.getByRole('button', { name: 'New manuscript' }).first().click();
  await owner.getByLabel('Working title').fill(TITLE);
  await shot(owner, '03-create-dialog');
  await owner.getByRole('button', { name: 'Create manuscript' }).click();
  await owner.waitForURL(/\/manuscripts\/[^/]+\/models$/);
  const manuscriptPath = new URL(owner.url()).pathname.replace(/\/models$/, '');
  await owner.getByRole('heading', { level: 1 }).getByText(TITLE, { exact: true }).waitFor();
  expect(await owner.locator('h1 b').count()).toBe(0);
  await owner.getByRole('button', { name: 'Upload as new version' }).waitFor();
  await owner.getByText('Validation supports expert judgement').waitFor();
  await shot(owner, '04-workspace-models');

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

  await owner.locator('.ff-navbar').getByRole('link', { name: 'Desk', exact: true }).click();
  const desk = owner.getByTestId('desk-table');
  await desk.getByText(TITLE, { exact: true }).waitFor();
  expect((await desk.textContent()) ?? '').toContain('Owner');
  await shot(owner, '07-desk');

  const href = await linkFromOutbox(COAUTHOR.email, /invites you/, '08-outbox-message');
  expect(href).toMatch(/^\/invitations\/[^/]+$/);

  // second browser: the coauthor opens the link signed out, registers, and comes back to accept
  const coCtx = await browser.newContext({ baseURL: service.url, viewport: VIEWPORT });
  const co = await newPage(coCtx);
  await co.goto(href);
  await co.getByText(TITLE, { exact: true }).waitFor();
  const preview = (await co.locator('.ff-invitation').textContent()) ?? '';
  expect(preview).toContain('Editor');
  expect(preview).toContain(OWNER.name);
  await shot(co, '09-invitation-signed-out');

  await co.getByRole('button', { name: 'Create an account' }).click();
  await co.waitForURL(/\/register\?next=/);
  expect(await co.getByLabel('E-mail address').inputValue()).toBe(COAUTHOR.email);
  await fillRegister(co, COAUTHOR);
  await co.waitForURL(/\/invitations\/[^/]+$/);
  await co.getByRole('button', { name: 'Accept invitation' }).waitFor();
  await shot(co, '10-invitation-signed-in');
  await co.getByRole('button', { name: 'Accept invitation' }).click();
  await co.waitForURL(new RegExp(`${manuscriptPath}/members$`));
  const coMembers = co.getByTestId('members-table');
  await coMembers.getByText(OWNER.email).waitFor();
  await coMembers.getByText(COAUTHOR.email).waitFor();
  expect(await coMembers.locator('tbody tr').count()).toBe(2);
  // an editor can neither invite nor see pending invitations
  expect(await co.getByRole('button', { name: 'Invite' }).count()).toBe(0);
  expect(await co.getByText('Pending invitations').count()).toBe(0);
  await shot(co, '11-members-as-coauthor');

  // a used invitation cannot be used again
  await co.goto(href);
  await co.getByText('This invitation cannot be used').waitFor();
  expect(((await co.locator('.ff-problem').textContent()) ?? '').length).toBeGreaterThan(20);

  await co.goto('/desk');
  const coDesk = co.getByTestId('desk-table');
  await coDesk.getByText(TITLE, { exact: true }).waitFor();
  expect((await coDesk.textContent()) ?? '').toContain('Editor');

  // the owner sees the new member; the invitation is no longer pending
  await owner.goto(`${manuscriptPath}/members`);
  const ownerMembers = owner.getByTestId('members-table');
  const row = ownerMembers.locator('tbody tr', { hasText: COAUTHOR.email });
  await row.waitFor();
  expect(await row.getByRole('combobox').inputValue()).toBe('editor');
  await owner.getByText('No invitation is waiting for an answer.').waitFor();
  await shot(owner, '12-members-as-owner');

  // let the access token expire: the next actions refresh silently
  await owner.waitForTimeout(ACCESS_TTL_SEC * 1000 + 1000);
  await row.getByRole('combobox').selectOption('commenter');
  await owner.getByText(`${COAUTHOR.name} is now Commenter.`).waitFor();
  await owner.reload();
  expect(new URL(owner.url()).pathname).toBe(`${manuscriptPath}/members`);
  await co.goto(`${manuscriptPath}/members`);
  await co.locator('.ff-role-tag', { hasText: 'Commenter' }).waitFor();

  // an invitation sent by mistake is revoked
  await owner.getByRole('button', { name: 'Invite' }).click();
  await owner
    .getByRole('dialog')
    .getByLabel('E-mail address')
    .fill('wrong.address@saltmarsh-lab.example');
  await owner.getByRole('dialog').getByRole('button', { name: 'Send invitation' }).click();
  const wrongRow = owner
    .getByTestId('invitations-table')
    .locator('tbody tr', { hasText: 'wrong.address' });
  await wrongRow.waitFor();
  await wrongRow.getByRole('button', { name: 'Revoke' }).click();
  await owner.getByText('No invitation is waiting for an answer.').waitFor();

  // the last owner cannot leave; the coauthor can
  expect(
    await ownerMembers
      .locator('tbody tr', { hasText: OWNER.email })
      .getByRole('button', { name: 'Leave' })
      .isDisabled(),
  ).toBe(true);
  await co
    .getByTestId('members-table')
    .locator('tbody tr', { hasText: COAUTHOR.email })
    .getByRole('button', { name: 'Leave' })
    .click();
  await co.getByRole('alertdialog').getByRole('button', { name: 'Leave manuscript' }).click();
  await co.waitForURL(/\/desk$/);
  await co.getByText('Your Desk is empty').waitFor();
  await owner.reload();
  await ownerMembers.getByText(OWNER.email).waitFor();
  expect(await ownerMembers.locator('tbody tr').count()).toBe(1);

  await coCtx.close();
  await ownerCtx.close();
}, 120_000);

test('Desk sorts by column, renames, archives and restores', async () => {
  const { service, browser } = suite;
  const token = await registerViaApi(service.url, SORTER);
  // created oldest → newest; titles chosen so text order and numeric order differ
  for (const title of ['Holo form 10', 'apo form at 2.1 Å', 'Holo form 9'])
    await apiPost(service.url, token, '/api/manuscripts', { title });

  const ctx = await browser.newContext({ baseURL: service.url, viewport: VIEWPORT });
  const page = await newPage(ctx);
  await page.goto('/sign-in');
  await fillSignIn(page, SORTER);
  await page.waitForURL(/\/desk$/);
  const desk = page.getByTestId('desk-table');
  const titles = async () =>
    (await desk.locator('.ff-title-link').allTextContents()).map((t) => t.trim());
  await desk.getByText('Holo form 9').waitFor();
  // default: last activity, newest first
  expect(await titles()).toEqual(['Holo form 9', 'apo form at 2.1 Å', 'Holo form 10']);
  // Table2 draws its header in several panes; the top pane is the one on screen
  await page
    .locator('.bp6-table-quadrant-top')
    .getByRole('button', { name: 'Sort by Title' })
    .click();
  expect(await titles()).toEqual(['apo form at 2.1 Å', 'Holo form 9', 'Holo form 10']);
  await page
    .locator('.bp6-table-quadrant-top')
    .getByRole('button', { name: 'Sort by Title' })
    .click();
  expect(await titles()).toEqual(['Holo form 10', 'Holo form 9', 'apo form at 2.1 Å']);
  await shot(page, '13-desk-sorted');

  // rename in the workspace header
  await desk.getByText('apo form at 2.1 Å').click();
  await page.waitForURL(/\/models$/);
  await page.locator('h1 .bp6-editable-text').click();
  await page.keyboard.press('ControlOrMeta+a');
  await page.keyboard.type('Apo form at 1.9 Å');
  await page.keyboard.press('Enter');
  await page.getByText('Manuscript renamed.').waitFor();

  // archive: hidden from the Desk until asked for
  await page.getByRole('button', { name: 'Archive' }).click();
  await page.getByText('This manuscript is archived').waitFor();
  await page.locator('.ff-navbar').getByRole('link', { name: 'Desk', exact: true }).click();
  await desk.getByText('Holo form 9').waitFor();
  expect(await titles()).not.toContain('Apo form at 1.9 Å');
  await page.getByText('Show archived (1)').click();
  await desk.getByText('Apo form at 1.9 Å').waitFor();
  await shot(page, '14-desk-archived-shown');

  await desk.getByText('Apo form at 1.9 Å').click();
  await page.getByRole('button', { name: 'Return to Desk' }).click();
  await page.getByText('The manuscript is active again.').waitFor();
  await ctx.close();
}, 90_000);

test('password reset through the mailed link', async () => {
  const { service, browser } = suite;
  await registerViaApi(service.url, FORGETFUL);
  const ctx = await browser.newContext({ baseURL: service.url, viewport: VIEWPORT });
  const page = await newPage(ctx);
  await page.goto('/sign-in');
  await page.getByRole('link', { name: 'Forgot your password?' }).click();
  await page.getByLabel('E-mail address').fill(FORGETFUL.email);
  await page.getByRole('button', { name: 'Send reset link' }).click();
  await page.getByText('a message with a link to set a new password is on its way').waitFor();

  const href = await linkFromOutbox(FORGETFUL.email, /password/i);
  expect(href).toMatch(/^\/reset-password\/[^/]+$/);
  await page.goto(href);
  const newPassword = 'secondPass-2222';
  await page.getByLabel('New password').fill(newPassword);
  await page.getByLabel('Repeat it').fill(newPassword);
  await shot(page, '15-set-new-password');
  await page.getByRole('button', { name: 'Set new password' }).click();
  await page.getByText('Your password has been changed.').waitFor();

  // the old password no longer works and the page says so; the new one does
  await page.getByRole('link', { name: 'Sign in', exact: true }).click();
  await fillSignIn(page, FORGETFUL);
  await page.locator('.ff-problem').waitFor();
  expect(page.url()).toContain('/sign-in');
  await shot(page, '16-sign-in-refused');
  await page.getByLabel('Password').fill(newPassword);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(/\/desk$/);

  // signing out ends the session on the server too: a reload does not bring it back
  await page.getByRole('button', { name: FORGETFUL.name }).click();
  await page.getByRole('menuitem', { name: 'Sign out' }).click();
  await page.waitForURL(/\/sign-in$/);
  await page.goto('/desk');
  await page.waitForURL(/\/sign-in\?next=%2Fdesk$/);

  // the link works once
  await page.goto(href);
  await page.getByLabel('New password').fill('thirdPass-3333');
  await page.getByLabel('Repeat it').fill('thirdPass-3333');
  await page.getByRole('button', { name: 'Set new password' }).click();
  await page.locator('.ff-problem').waitFor();
  await ctx.close();
}, 90_000);

test('admin: the last admin cannot step down; promote someone; delete an account', async () => {
  const { service, browser } = suite;
  await registerViaApi(service.url, PROMOTED);
  await registerViaApi(service.url, LEAVER);
  const page = await adminSession();
  await page.goto('/admin/users');
  const users = page.getByTestId('users-table');
  const rowOf = (who: Person) => users.locator('tbody tr', { hasText: who.email });
  await rowOf(LEAVER).waitFor();

  // stepping down as the only admin is refused with the service's sentence
  await rowOf(ADMIN).getByRole('combobox').selectOption('user');
  await page.getByText('is the last admin').waitFor();
  await page.reload();
  expect(await rowOf(ADMIN).getByRole('combobox').inputValue()).toBe('admin');

  await rowOf(PROMOTED).getByRole('combobox').selectOption('admin');
  await page.getByText(`${PROMOTED.name} now has the site role Admin.`).waitFor();
  expect(await rowOf(PROMOTED).getByRole('combobox').inputValue()).toBe('admin');

  await rowOf(LEAVER)
    .getByRole('button', { name: `Delete the account of ${LEAVER.name}` })
    .click();
  await shot(page, '17-admin-delete-confirm');
  await page.getByRole('alertdialog').getByRole('button', { name: 'Delete account' }).click();
  await page.getByText(`The account of ${LEAVER.name} has been deleted.`).waitFor();
  await rowOf(LEAVER).waitFor({ state: 'detached' });
  await shot(page, '18-admin-users');

  // the promoted account now sees the Admin entry
  const ctx = await browser.newContext({ baseURL: service.url, viewport: VIEWPORT });
  const promoted = await newPage(ctx);
  await promoted.goto('/sign-in');
  await fillSignIn(promoted, PROMOTED);
  await promoted.waitForURL(/\/desk$/);
  await promoted.locator('.ff-navbar').getByRole('link', { name: 'Admin' }).click();
  await promoted.getByTestId('users-table').waitFor();
  await ctx.close();
}, 90_000);
