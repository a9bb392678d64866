// Browser test of review packages (issue 7) against the real service, its worker process,
// MariaDB, Redis and Debian's Chromium: freeze a package in the Review packages tab → make a
// reviewer link → open it in a fresh browser context (no sign-in) → see a figure → download the
// zip → `foldfolio verify` passes on the downloaded bytes; the owner's access log shows it.
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';
import {
  manuscriptWithUpload,
  browserSuite,
  ROOT,
  shot,
  signInToDesk,
  watchPageErrors,
  type Person,
} from './harness';

// invented person and lab (demo data rule: no real names)
const OWNER: Person = {
  name: 'Odile Brackwater',
  email: 'odile.brackwater@saltmarsh-lab.example',
  password: 'frozenPackage-2026',
};
const VIEWPORT = { width: 1280, height: 900 };
// a real PDB entry (1A8O, X-ray) copied into the repo as a test fixture
const STRUCTURE = join(ROOT, 'shared', 'test', 'fixtures', '1A8O.cif');

const suite = browserSuite();
const pageErrors = suite.pageErrors;

test('freeze → reviewer link in a fresh context → download → verify passes', async () => {
  const { service, browser, dir } = suite;
  const { ms, up } = await manuscriptWithUpload(
    service.url,
    OWNER,
    'Saltmarsh capsid domain, refined',
    STRUCTURE,
  );
  expect(up.status).toBe(201);

  // the owner freezes a package in the tab
  const ctx = await browser.newContext({
    baseURL: service.url,
    viewport: VIEWPORT,
    acceptDownloads: true,
  });
  const page = watchPageErrors(await ctx.newPage(), pageErrors);
  await signInToDesk(page, OWNER);
  await page.goto(`/manuscripts/${ms.id}/review-packages`);
  await page.getByText('Version 1', { exact: true }).click();
  await page.getByText(/^Anonymise/).click();
  expect(await page.getByRole('checkbox', { name: /^Anonymise/ }).isChecked()).toBe(true);
  await shot(page, 'packages-01-form');
  await page.getByTestId('package-build').click();
  await page.getByTestId('package-card').waitFor();
  await page.getByTestId('package-download').waitFor({ timeout: 90_000 });
  await page.getByLabel('Link label').fill('Referee 1');
  await page.getByTestId('package-share').click();
  const url = await page.getByTestId('package-link-url').inputValue();
  expect(url).toMatch(new RegExp(`^${service.url}/review/[0-9a-f-]{36}\\.[A-Za-z0-9_-]{43}$`));
  await shot(page, 'packages-02-shared');

  // a reviewer, in a fresh context with no session, opens the link
  const rctx = await browser.newContext({ viewport: VIEWPORT, acceptDownloads: true });
  const reviewer = watchPageErrors(await rctx.newPage(), pageErrors);
  await reviewer.goto(url);
  await reviewer.getByTestId('review-title').waitFor();
  expect(await reviewer.getByTestId('review-title').textContent()).toBe(
    'Saltmarsh capsid domain, refined',
  );
  const img = reviewer.locator('.ff-review-figure img').first();
  await img.waitFor();
  await reviewer.waitForFunction(() => {
    const el = document.querySelector('.ff-review-figure img') as HTMLImageElement | null;
    return el !== null && el.complete && el.naturalWidth > 0;
  });
  await shot(reviewer, 'packages-03-reviewer');
  const [download] = await Promise.all([
    reviewer.waitForEvent('download'),
    reviewer.getByTestId('review-download').click(),
  ]);
  const zipPath = join(dir, 'downloaded.zip');
  await download.saveAs(zipPath);

  // the downloaded bytes verify with the command-line tool
  const run = spawnSync(
    process.execPath,
    [join(ROOT, 'service/dist/cli/main.js'), 'verify', zipPath],
    {
      encoding: 'utf8',
      cwd: ROOT,
    },
  );
  expect(run.stderr).toBe('');
  expect(run.stdout).toMatch(/0 different, 0 missing, 0 unexpected, 0 not recomputed: VERIFIED/);
  expect(run.status).toBe(0);

  // the same bytes on the Verify page (signed in): every file identical
  await page.goto('/verify');
  await page.getByLabel('Package zip').setInputFiles(zipPath);
  await page.getByTestId('verify-run').click();
  await page.getByTestId('verify-result').waitFor({ timeout: 60_000 });
  await page.getByText('Every file is as recorded').waitFor();
  expect(
    await page
      .locator('[data-testid="verify-result"] tr[data-status]:not([data-status="identical"])')
      .count(),
  ).toBe(0);
  await shot(page, 'packages-04-verify');

  // the owner's access log shows the reviewer's visit and download
  await page.goto(`/manuscripts/${ms.id}/review-packages`);
  await page.getByText(/Access log/).click();
  const log = page.getByTestId('package-audit');
  await log.getByText('reviewer opened the link').first().waitFor();
  await log.getByText('reviewer downloaded the package').first().waitFor();
  await shot(page, 'packages-05-access-log');
  await rctx.close();
  await ctx.close();
}, 150_000);
