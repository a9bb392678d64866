/**
 * Regression guard only (the outside checks are in figures.test.ts and tables.test.ts): the
 * figures and tables of three real entries must equal golden-outputs/ byte for byte.
 * After an intended change (or a rebuilt reference artefact) run `npm run golden` and review
 * the diff.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { goldenOutputs, repoRoot, storedReports } from '../src/figures/golden.js';
import { sharedVegaHost } from '../src/figures/vega-host.js';

afterAll(() => sharedVegaHost().close());

test('figures and tables equal golden-outputs/ (run `npm run golden` after an intended change)', async () => {
  const root = repoRoot();
  // from the reports stored with the golden files, so an engine change alone does not move them;
  // the torsion figure still draws the shipped reference, so rebuilding it needs `npm run golden`
  const files = await goldenOutputs(storedReports(root), root);
  expect(files.size).toBeGreaterThanOrEqual(3 * 10);
  const differing: string[] = [];
  for (const [rel, text] of files) {
    const p = join(root, 'golden-outputs', rel);
    if (!existsSync(p) || readFileSync(p, 'utf8') !== text) differing.push(rel);
  }
  expect(differing).toEqual([]);
});
