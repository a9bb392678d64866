// Browser test of the Figures, Methods table and Templates tabs against the real service and
// Debian's Chromium: gallery with readiness badges and a PDF export, the methods form with
// provenance and an override reaching the preview, and a template forked, broken (the error's
// line is shown), fixed, saved as version 2, pinned and compared with the built-in.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { createConnection } from 'mysql2/promise';
import {
  manuscriptWithUpload,
  browserSuite,
  dbSettings,
  registerViaApi,
  ROOT,
  shot,
  signInToDesk,
  waitForAnalysis,
  watchPageErrors,
  type Person,
} from './harness';

// invented person (demo data rule: no real names)
const OWNER: Person = {
  name: 'Ilse Marrowby',
  email: 'ilse.marrowby@fernhollow-lab.example',
  password: 'houseStyle-2026',
};
const COMMENTER: Person = {
  name: 'Tobiah Quenell',
  email: 'tobiah.quenell@fernhollow-lab.example',
  password: 'readOnly-2026-x',
};
const VIEWPORT = { width: 1400, height: 950 };
// a real PDB entry (1A8O, X-ray) copied into the repo as a test fixture
const STRUCTURE = join(ROOT, 'shared', 'test', 'fixtures', '1A8O.cif');

/** Adds a membership straight in the test's own database (the invitation flow has its own test). */
async function addMember(dbName: string, email: string, manuscriptId: string, role: string) {
  const conn = await createConnection({ ...dbSettings(), database: dbName });
  try {
    await conn.query(
      'INSERT INTO memberships (id, manuscript_id, user_id, role) SELECT UUID(), ?, id, ? FROM users WHERE email = ?',
      [manuscriptId, role, email],
    );
  } finally {
    await conn.end();
  }
}

const suite = browserSuite({ logName: 'figures' });
const pageErrors = suite.pageErrors;

test('figures, methods table and templates in the browser', async () => {
  const { service, browser, dir } = suite;
  const { token, ms, up } = await manuscriptWithUpload(
    service.url,
    OWNER,
    'Fernhollow lectin domain',
    STRUCTURE,
  );
  expect(up.status).toBe(201);
  const version = (await up.json()) as { id: string };
  await waitForAnalysis(service.url, token, ms.id, version.id);

  const ctx = await browser.newContext({
    baseURL: service.url,
    viewport: VIEWPORT,
    acceptDownloads: true,
  });
  const page = watchPageErrors(await ctx.newPage(), pageErrors);
  await signInToDesk(page, OWNER);

  // Figures: every card draws its SVG (the comparison figure explains it needs two versions)
  await page.goto(`/manuscripts/${ms.id}/figures`);
  const torsion = page.getByTestId('figure-torsion-plot');
  await torsion.locator('img').waitFor({ timeout: 60_000 });
  await page.waitForFunction(
    () => document.querySelectorAll('.ff-figure-card img').length >= 6,
    undefined,
    { timeout: 60_000 },
  );
  await page.waitForFunction(() =>
    [...document.querySelectorAll<HTMLImageElement>('.ff-figure-card img')].every(
      (i) => i.complete && i.naturalWidth > 0,
    ),
  );
  expect(await page.getByTestId('figure-version-compare').textContent()).toMatch(
    /second model version/,
  );
  const badges = await page
    .locator('[data-testid=readiness-ok], [data-testid=readiness-issues]')
    .count();
  expect(badges).toBeGreaterThanOrEqual(6);
  await shot(page, 'figures-01-gallery');
  const [pdf] = await Promise.all([
    page.waitForEvent('download'),
    torsion.getByRole('button', { name: 'PDF' }).click(),
  ]);
  expect(pdf.suggestedFilename()).toBe('torsion-plot.single.pdf');
  const pdfPath = join(dir, 'f.pdf');
  await pdf.saveAs(pdfPath);
  expect(readFileSync(pdfPath).subarray(0, 5).toString('latin1')).toBe('%PDF-');

  // Methods table: provenance per value; an override shows up in the preview as "form"
  await page.goto(`/manuscripts/${ms.id}/methods-table`);
  await page.getByTestId('methods-table-preview').locator('table').waitFor({ timeout: 30_000 });
  const formPanel = page.getByTestId('methods-form');
  expect(await formPanel.textContent()).toMatch(/from the file: _refine\.ls_d_res_high/);
  expect(await formPanel.textContent()).toMatch(/computed/);
  // 1A8O.cif states no CC1/2: the form offers the field empty
  expect(await formPanel.textContent()).toMatch(/CC1\/2not in the file: enter it here/);
  await page.getByLabel('R-free', { exact: true }).fill('0.2468');
  await page.getByRole('button', { name: 'Save form' }).click();
  await page.waitForFunction(() =>
    /0\.24[67]/.test(
      document.querySelector('[data-testid=methods-table-preview]')?.textContent ?? '',
    ),
  );
  expect(await formPanel.textContent()).toMatch(/entered in the form/);
  await shot(page, 'figures-02-methods-table');

  // Templates: fork the X-ray table, break it, see the line, fix, save v2, pin, compare
  await page.goto(`/manuscripts/${ms.id}/templates`);
  await page.getByTestId('template-slots').getByRole('button', { name: /X-ray/ }).click();
  await page.getByTestId('template-builtin').getByRole('button', { name: 'Fork' }).click();
  await page.getByLabel('Name').fill('Fernhollow house table');
  await page.getByRole('button', { name: 'Fork', exact: true }).last().click();
  const editor = page.getByTestId('template-editor');
  await editor.waitFor();
  await page.getByTestId('live-preview').locator('table').waitFor({ timeout: 30_000 });
  const content = editor.locator('.cm-content');
  await content.click();
  await page.keyboard.press('Control+Home');
  await page.keyboard.press('End');
  await page.keyboard.press('Enter');
  // a helper outside the sandbox's fixed list, on line 2
  await page.keyboard.type('{{shout "x"}}');
  await page
    .getByTestId('live-preview')
    .getByText(/line 2/i)
    .first()
    .waitFor({ timeout: 15_000 });
  expect(await editor.locator('.ff-cm-error-line').count()).toBe(1);
  await shot(page, 'figures-03-template-error');
  // undo the broken line and add a visible change on its place
  await page.keyboard.press('Home');
  await page.keyboard.press('Shift+End');
  await page.keyboard.type('<p>House style</p>');
  await page.getByTestId('live-preview').getByText('House style').waitFor({ timeout: 15_000 });
  await page.getByLabel('Version message').fill('Add the house line');
  await page.getByRole('button', { name: 'Save as new version' }).click();
  await page.getByTestId('template-manuscript').getByText('v2', { exact: true }).waitFor();
  await page
    .getByTestId('template-manuscript')
    .getByRole('button', { name: 'Pin' })
    .first()
    .click();
  await page.getByTestId('template-manuscript').getByText('pinned').waitFor();
  const diff = page.getByTestId('template-diff');
  await diff.locator('.ff-diff-add').first().waitFor();
  expect(await diff.locator('.ff-diff-add').allTextContents()).toEqual(['+ <p>House style</p>']);
  await shot(page, 'figures-04-template-pinned');
  // a figure fork: the JSON spec in the editor, its SVG drawn live beside it
  await page
    .getByTestId('template-slots')
    .getByRole('button', { name: /ω histogram/ })
    .click();
  await page.getByTestId('template-builtin').getByRole('button', { name: 'Fork' }).click();
  await page.getByLabel('Name').fill('Fernhollow omega');
  await page.getByRole('button', { name: 'Fork', exact: true }).last().click();
  await page.getByTestId('live-preview').locator('img').waitFor({ timeout: 30_000 });
  expect(await page.getByTestId('template-editor').locator('.cm-content').textContent()).toContain(
    '"$schema"',
  );
  await shot(page, 'figures-05-figure-fork');
  await ctx.close();

  // a commenter reads everything and can change nothing
  await registerViaApi(service.url, COMMENTER);
  await addMember(service.dbName, COMMENTER.email, ms.id, 'commenter');
  const cctx = await browser.newContext({ baseURL: service.url, viewport: VIEWPORT });
  const cpage = watchPageErrors(await cctx.newPage(), pageErrors);
  await signInToDesk(cpage, COMMENTER);
  await cpage.goto(`/manuscripts/${ms.id}/methods-table`);
  await cpage.getByTestId('methods-table-preview').locator('table').waitFor({ timeout: 30_000 });
  expect(await cpage.getByTestId('methods-form').locator('input').count()).toBe(0);
  expect(await cpage.getByRole('button', { name: 'Save form' }).count()).toBe(0);
  // the pinned fork (with its house line) is what the table shows
  expect(await cpage.getByTestId('methods-table-preview').textContent()).toContain('House style');
  await cpage.goto(`/manuscripts/${ms.id}/templates`);
  await cpage.getByTestId('template-slots').getByRole('button', { name: /X-ray/ }).click();
  const fork = cpage.getByTestId('template-manuscript');
  await fork.getByText('pinned').waitFor();
  expect(await fork.getByRole('button', { name: /^(Fork|Pin|Edit)$/ }).count()).toBe(0);
  await fork.getByRole('button', { name: 'View' }).first().click();
  await cpage.getByTestId('template-editor').getByText('You can read this template').waitFor();
  expect(
    await cpage
      .getByTestId('template-editor')
      .locator('.cm-content')
      .getAttribute('contenteditable'),
  ).toBe('false');
  expect(await cpage.getByRole('button', { name: 'Save as new version' }).count()).toBe(0);
  await shot(cpage, 'figures-06-commenter-view');
  await cctx.close();
}, 240_000);
