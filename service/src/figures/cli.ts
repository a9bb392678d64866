/**
 * `foldfolio figures`: model file (or report JSON) → every figure template as SVG/PDF/PNG in
 * an output folder, plus readiness.json. Deterministic: same inputs ⇒ same bytes.
 */
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { basename, join } from 'node:path';
import { buildReport, type Report } from '@foldfolio/shared';
import { svgToPdf, svgToPng } from './export.js';
import { renderFigure } from './render.js';
import { listFigureTemplates } from './templates.js';
import { sharedVegaHost } from './vega-host.js';

export const FIGURES_USAGE =
  'figures <model file | report.json> [--previous <file>] [--out DIR] [--preset single|one-and-half|double] [--template ID]... [--param NAME=VALUE]... [--format svg,pdf,png] [--dpi N] [--pdf-date ISO]';

type Io = { out: (t: string) => void; err: (t: string) => void };

/** A model file or a saved report (JSON with the report schema) → report. */
export async function loadReport(path: string): Promise<Report> {
  const bytes = readFileSync(path);
  if (path.endsWith('.json')) {
    const r = JSON.parse(bytes.toString('utf8')) as Report;
    if (r.schema !== 'foldfolio.report/1')
      throw new Error(
        `${path} is not a Foldfolio report (schema foldfolio.report/1); pass the model file instead.`,
      );
    return r;
  }
  return buildReport(new Uint8Array(bytes), { filename: basename(path) });
}

export function parseArgs(args: string[]): {
  positional: string[];
  options: Record<string, string[]>;
} {
  const positional: string[] = [];
  const options: Record<string, string[]> = {};
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    if (a.startsWith('--')) {
      const [k, inline] = a.slice(2).split('=', 2);
      const v = inline ?? args[++i];
      if (v === undefined) throw new Error(`Option --${k} needs a value.`);
      (options[k] ??= []).push(v);
    } else positional.push(a);
  }
  return { positional, options };
}

/** `--param name=value` pairs that this template declares, typed by its manifest. */
export function paramsFor(
  declared: { name: string; type: 'number' | 'string' | 'boolean' }[],
  pairs: string[],
): Record<string, number | string | boolean> {
  const out: Record<string, number | string | boolean> = {};
  for (const pair of pairs) {
    const eq = pair.indexOf('=');
    if (eq < 1) throw new Error(`--param needs NAME=VALUE, got "${pair}".`);
    const name = pair.slice(0, eq);
    const raw = pair.slice(eq + 1);
    const def = declared.find((d) => d.name === name);
    if (!def) continue; // parameters of other templates
    out[name] = def.type === 'number' ? Number(raw) : def.type === 'boolean' ? raw === 'true' : raw;
  }
  return out;
}

export async function runFiguresCommand(args: string[], io: Io): Promise<number> {
  let parsed: ReturnType<typeof parseArgs>;
  try {
    parsed = parseArgs(args);
  } catch (e) {
    io.err(`foldfolio figures: ${(e as Error).message}\nusage: foldfolio ${FIGURES_USAGE}\n`);
    return 2;
  }
  const { positional, options } = parsed;
  if (positional.length !== 1) {
    io.err(`usage: foldfolio ${FIGURES_USAGE}\n`);
    return 2;
  }
  const out = options.out?.[0] ?? 'figures';
  const preset = options.preset?.[0] ?? 'single';
  const formats = (options.format?.[0] ?? 'svg,pdf').split(',');
  const dpi = Number(options.dpi?.[0] ?? 300);
  const date = options['pdf-date'] ? new Date(options['pdf-date'][0]) : undefined;
  if (date && Number.isNaN(date.getTime())) {
    io.err('foldfolio figures: --pdf-date must be an ISO date such as 2026-01-31T00:00:00Z.\n');
    return 2;
  }
  try {
    const report = await loadReport(positional[0]);
    const previous = options.previous ? await loadReport(options.previous[0]) : null;
    const wanted = options.template ?? listFigureTemplates().map((t) => t.manifest.id);
    mkdirSync(out, { recursive: true });
    const readiness: Record<string, unknown> = {};
    for (const id of wanted) {
      const t = listFigureTemplates().find((x) => x.manifest.id === id);
      if (t?.manifest.needsComparison && !previous) {
        io.err(`skipped ${id}: it compares two versions; pass --previous <file>.\n`);
        continue;
      }
      const params = paramsFor(t?.manifest.parameters ?? [], options.param ?? []);
      const fig = await renderFigure({
        report,
        previous,
        templateId: id,
        presetId: preset,
        params,
      });
      const stem = join(out, `${id}.${preset}`);
      if (formats.includes('svg')) writeFileSync(`${stem}.svg`, fig.svg);
      if (formats.includes('pdf'))
        writeFileSync(`${stem}.pdf`, await svgToPdf(fig.svg, { date, title: t?.manifest.title }));
      if (formats.includes('png')) writeFileSync(`${stem}.png`, svgToPng(fig.svg, dpi));
      readiness[id] = fig.readiness;
      io.out(
        `${id}: ${fig.readiness.ok ? 'ready' : `${fig.readiness.issues.length} readiness issue(s)`}\n`,
      );
    }
    writeFileSync(join(out, `readiness.${preset}.json`), JSON.stringify(readiness, null, 2) + '\n');
    return 0;
  } catch (e) {
    io.err(`foldfolio figures: ${(e as Error).message}\n`);
    return 1;
  } finally {
    await sharedVegaHost().close();
  }
}
