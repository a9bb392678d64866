/**
 * Figure/table performance bars (issue 5): torsion-plot SVG for a 10,000-residue report
 * < 1.5 s; the full figure set plus tables for a 1,000-residue model < 5 s. Reports are
 * made from a real entry (1A8O) by repeating its residue rows under new chain ids, so the
 * angle distribution stays real. Times are with the Vega worker already started (it starts
 * once per process); the cold start is printed separately.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { buildReport, type Report, type ResidueRow } from '@foldfolio/shared';
import { experimentFromBytes } from '../tables/cli.js';
import {
  renderTableHtml,
  toCsv,
  toDocx,
  toHtmlDocument,
  toLatex,
  toMarkdown,
} from '../tables/render.js';
import { svgToPdf } from './export.js';
import { repoRoot } from './golden.js';
import { renderFigure } from './render.js';
import { listFigureTemplates } from './templates.js';
import { sharedVegaHost } from './vega-host.js';

function scaled(report: Report, residues: number): Report {
  const src = report.models[0].residues;
  const rows: ResidueRow[] = [];
  for (let k = 0; rows.length < residues; k++) {
    const chain = String.fromCharCode(65 + (k % 26)) + (k >= 26 ? String(Math.floor(k / 26)) : '');
    for (const r of src) {
      if (rows.length >= residues) break;
      rows.push({ ...r, chain });
    }
  }
  return { ...report, models: [{ ...report.models[0], residues: rows }] };
}

async function time<T>(fn: () => Promise<T>): Promise<[T, number]> {
  const t0 = performance.now();
  const v = await fn();
  return [v, (performance.now() - t0) / 1000];
}

async function main(): Promise<number> {
  const bytes = new Uint8Array(readFileSync(join(repoRoot(), 'shared/test/fixtures/1A8O.cif')));
  const base = await buildReport(bytes, { filename: '1A8O.cif' });
  const experiment = await experimentFromBytes(bytes);
  let status = 0;
  const bar = (name: string, seconds: number, limit: number) => {
    const ok = seconds < limit;
    if (!ok) status = 1;
    process.stdout.write(
      `${ok ? 'PASS' : 'FAIL'} ${name}: ${seconds.toFixed(2)} s (bar ${limit} s, ratio ${(seconds / limit).toFixed(2)})\n`,
    );
  };
  // a running service has its worker started and the reference regions shaped already
  const [, cold] = await time(() =>
    renderFigure({ report: base, templateId: 'torsion-plot', presetId: 'double' }),
  );
  process.stdout.write(
    `info worker cold start + reference shapes + first torsion plot (${base.models[0].residues.length} residues): ${cold.toFixed(2)} s\n`,
  );

  const big = scaled(base, 10_000);
  const [fig, t10k] = await time(() =>
    renderFigure({ report: big, templateId: 'torsion-plot', presetId: 'double' }),
  );
  process.stdout.write(
    `info 10,000-residue torsion plot: ${(fig.svg.length / 1e6).toFixed(1)} MB SVG\n`,
  );
  bar('torsion-plot SVG, 10,000 residues', t10k, 1.5);

  const mid = scaled(base, 1000);
  const svgs: string[] = [];
  const [, tSet] = await time(async () => {
    for (const t of listFigureTemplates()) {
      svgs.push(
        (
          await renderFigure({
            report: mid,
            previous: base,
            templateId: t.manifest.id,
            presetId: 'single',
          })
        ).svg,
      );
    }
    const table = renderTableHtml({ report: mid, experiment });
    toHtmlDocument(table);
    toMarkdown(table.model);
    toLatex(table.model);
    toCsv(table.model);
    await toDocx(table.model);
  });
  bar('full figure set (SVG) + methods table (5 formats), 1,000 residues', tSet, 5);
  const [, tPdf] = await time(async () => {
    for (const svg of svgs) await svgToPdf(svg);
  });
  process.stdout.write(`info PDF of the same ${svgs.length} figures: ${tPdf.toFixed(2)} s\n`);
  await sharedVegaHost().close();
  return status;
}

main().then(
  (code) => {
    process.exitCode = code;
  },
  (e: unknown) => {
    process.stderr.write(`bench figures: ${e instanceof Error ? e.message : String(e)}\n`);
    process.exitCode = 1;
  },
);
