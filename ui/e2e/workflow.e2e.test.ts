// Browser test of the manuscript workflow (issue 6) against the real service, its analysis
// worker, MariaDB, Redis, the SMTP sink and Debian's Chromium: register → create a manuscript →
// upload a real structure → watch the progress bar → the Quality tab shows the summary → open a
// residue → comment with a mention → the mentioned member's e-mail arrives in the Outbox.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import {
  apiGet,
  apiPost,
  browserSuite,
  fillRegister,
  registerViaApi,
  ROOT,
  shot,
  signInViaApi,
  watchPageErrors,
  type Person,
} from './harness';

// invented people and lab (demo data rule: no real names)
const OWNER: Person = {
  name: 'Wrenna Holt',
  email: 'wrenna.holt@tidepool-lab.example',
  password: 'foldingPath-2026',
};
const COAUTHOR: Person = {
  name: 'Casimir Fenn',
  email: 'casimir.fenn@tidepool-lab.example',
  password: 'loopRegion-7788',
};
const VIEWPORT = { width: 1280, height: 900 };
// a real PDB entry (2XHE, X-ray) copied into the repo as a test fixture
const STRUCTURE = join(ROOT, 'shared', 'test', 'fixtures', '2XHE.cif');

const suite = browserSuite();
const pageErrors = suite.pageErrors;

test('upload → progress → Quality summary → residue → comment with a mention → mail in the Outbox', async () => {
  const { service, browser } = suite;
  const ctx = await browser.newContext({ baseURL: service.url, viewport: VIEWPORT });
  const page = watchPageErrors(await ctx.newPage(), pageErrors);

  // register in the browser (the first account of a fresh install is its admin)
  await page.goto('/register');
  await fillRegister(page, OWNER);
  await page.waitForURL(/\/desk$/);

  await page.getByRole('button', { name: 'New manuscript' }).first().click();
  await page.getByLabel('Working title').fill('Tidepool lectin bound to an invented glycan');
  await page.getByRole('button', { name: 'Create manuscript' }).click();
  await page.waitForURL(/\/manuscripts\/[^/]+\/models$/);
  const manuscriptId = new URL(page.url()).pathname.split('/')[2];

  // the coauthor joins as a commenter through the real invitation (link read from the sink)
  const ownerToken = await signInViaApi(service.url, OWNER);
  const coToken = await registerViaApi(service.url, COAUTHOR);
  await apiPost(service.url, ownerToken, `/api/manuscripts/${manuscriptId}/invitations`, {
    email: COAUTHOR.email,
    role: 'commenter',
  });
  const box = await apiGet<{ id: string; to: string; subject: string }[]>(
    service.url,
    ownerToken,
    '/api/admin/outbox',
  );
  const invite = box.find((m) => m.to === COAUTHOR.email);
  if (!invite) throw new Error('the invitation mail did not arrive');
  const mail = await apiGet<{ links: string[] }>(
    service.url,
    ownerToken,
    `/api/admin/outbox/${invite.id}`,
  );
  const token = mail.links.map((l) => l.match(/\/invitations\/([^/?#]+)/)?.[1]).find(Boolean);
  await apiPost(service.url, coToken, `/api/invitations/${token}/accept`, {});

  // upload through the Models tab: file input + note, then the progress bar, then "analysed"
  await page.reload();
  await page.getByLabel('Model file').setInputFiles({
    name: '2XHE.cif',
    mimeType: 'chemical/x-mmcif',
    buffer: readFileSync(STRUCTURE),
  });
  await page
    .getByLabel('Note for this version')
    .fill('First refinement after molecular replacement.');
  await shot(page, 'workflow-01-upload-ready');
  await page.getByRole('button', { name: 'Upload as new version' }).click();
  const card = page.getByTestId('version-1');
  await card.waitFor();
  await card.locator('.bp6-progress-bar, [data-testid="analysis-done"]').first().waitFor();
  await shot(page, 'workflow-02-progress');
  await card.getByTestId('analysis-done').waitFor({ timeout: 60_000 });
  await shot(page, 'workflow-03-analysed');

  // the Quality tab: the summary cards, the judgement note, the residue table
  await page.getByRole('tab', { name: 'Quality' }).click();
  await page.getByTestId('summary-cards').waitFor();
  await page.getByText('Validation supports, and does not replace').waitFor();
  // which engine, reference and side-chain library made these numbers, for the methods section
  expect(await page.getByTestId('provenance').textContent()).toMatch(
    /^Computed with Foldfolio engine \d+\.\d+\.\d+; reference foldfolio-ref-\S+; side-chain ideal geometry foldfolio-sidechain-geometry-\d+\./,
  );
  const torsions = (await page.getByTestId('card-torsions').textContent()) ?? '';
  expect(torsions).toMatch(/% favored/);
  await page.getByTestId('residue-table').locator('.bp6-table-cell').first().waitFor();
  await shot(page, 'workflow-04-quality');

  // open the first residue (outliers first) and comment on it, mentioning the coauthor
  await page
    .getByTestId('residue-table')
    .locator('.bp6-table-quadrant-main .bp6-table-body-cells .bp6-table-cell')
    .first()
    .click();
  const panel = page.getByTestId('residue-panel');
  await panel.waitFor();
  const handle = COAUTHOR.email.split('@')[0];
  await panel
    .getByLabel('New comment')
    .fill(`@${handle} is this **really** supported by the density?`);
  await panel.getByRole('button', { name: 'Comment' }).click();
  await panel.getByTestId('comment-thread').locator('strong', { hasText: 'really' }).waitFor();
  await shot(page, 'workflow-05-residue-comment');

  // the mention mail, as the admin sees it in the Outbox
  await page.keyboard.press('Escape');
  await page.goto('/admin/outbox');
  const item = page
    .getByTestId('outbox-list')
    .locator('a', { hasText: COAUTHOR.email })
    .filter({ hasText: /mentioned you/ });
  await item.first().waitFor({ timeout: 15_000 });
  await item.first().click();
  await page
    .getByTestId('outbox-message')
    .getByText('is this **really** supported by the density?')
    .waitFor();
  await shot(page, 'workflow-06-mention-mail');
});
