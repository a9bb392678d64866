/**
 * Golden outputs: every figure template (SVG, single-column preset, fonts referenced rather
 * than embedded to keep the repository small) and every table format for three real entries.
 * `npm run golden` rewrites golden-outputs/; service/test/figures-golden.test.ts compares.
 */
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { buildReport, type Report } from '@foldfolio/shared';
import { experimentFromBytes } from '../tables/cli.js';
import { renderTableHtml, toCsv, toHtmlDocument, toLatex, toMarkdown } from '../tables/render.js';
import { renderFigure } from './render.js';
import { listFigureTemplates } from './templates.js';
import { sharedVegaHost } from './vega-host.js';

export const GOLDEN_FIXTURES = [
  { file: '1A8O.cif', why: 'X-ray, 1.70 Å' },
  { file: '2OFG.cif', why: 'NMR ensemble' },
  { file: '5cvz_final.pdb', why: 'low resolution (3.29 Å), legacy PDB header' },
];

export function repoRoot(): string {
  return resolve(dirname(fileURLToPath(import.meta.url)), '../../..');
}

/** Reports of the golden fixtures, built by the engine now. */
export async function freshReports(root = repoRoot()): Promise<Record<string, Report>> {
  const out: Record<string, Report> = {};
  for (const { file } of GOLDEN_FIXTURES) {
    out[file] = await buildReport(
      new Uint8Array(readFileSync(join(root, 'shared/test/fixtures', file))),
      { filename: file },
    );
  }
  return out;
}

/**
 * Reports as stored beside the golden outputs: the comparison pins the engine's output so it
 * guards the figure and table code, not every engine change (the engine has its own checks).
 */
export function storedReports(root = repoRoot()): Record<string, Report> {
  const out: Record<string, Report> = {};
  for (const { file } of GOLDEN_FIXTURES)
    out[file] = JSON.parse(
      readFileSync(join(root, 'golden-outputs', file, 'report.json'), 'utf8'),
    ) as Report;
  return out;
}

/** relative path under golden-outputs/ → file text */
export async function goldenOutputs(
  reports: Record<string, Report>,
  root = repoRoot(),
): Promise<Map<string, string>> {
  const out = new Map<string, string>();
  for (const { file } of GOLDEN_FIXTURES) {
    const bytes = new Uint8Array(readFileSync(join(root, 'shared/test/fixtures', file)));
    const report = reports[file];
    const experiment = await experimentFromBytes(bytes);
    const readiness: Record<string, unknown> = {};
    for (const t of listFigureTemplates()) {
      if (t.manifest.needsComparison) continue;
      const fig = await renderFigure({
        report,
        templateId: t.manifest.id,
        presetId: 'single',
        embedFonts: false,
      });
      out.set(`${file}/${t.manifest.id}.svg`, fig.svg);
      readiness[t.manifest.id] = fig.readiness;
    }
    out.set(`${file}/readiness.json`, JSON.stringify(readiness, null, 2) + '\n');
    const table = renderTableHtml({ report, experiment });
    out.set(`${file}/${table.templateId}.html`, toHtmlDocument(table));
    out.set(`${file}/${table.templateId}.md`, toMarkdown(table.model));
    out.set(`${file}/${table.templateId}.tex`, toLatex(table.model));
    out.set(`${file}/${table.templateId}.csv`, toCsv(table.model));
  }
  return out;
}

async function main(): Promise<void> {
  const root = repoRoot();
  const reports = await freshReports(root);
  const files = await goldenOutputs(reports, root);
  for (const [file, report] of Object.entries(reports))
    files.set(`${file}/report.json`, JSON.stringify(report) + '\n');
  for (const [rel, text] of files) {
    const p = join(root, 'golden-outputs', rel);
    mkdirSync(dirname(p), { recursive: true });
    writeFileSync(p, text);
  }
  process.stdout.write(`golden-outputs: wrote ${files.size} files; review the diff like code.\n`);
  await sharedVegaHost().close();
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  main().catch((e: unknown) => {
    process.stderr.write(`golden: ${e instanceof Error ? e.message : String(e)}\n`);
    process.exitCode = 1;
  });
}
