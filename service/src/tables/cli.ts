/** `foldfolio tables`: model file → methods table as HTML, Markdown, LaTeX, CSV and docx. */
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { basename, join } from 'node:path';
import { buildReport, readExperimentFromBytes, type ExperimentalStats } from '@foldfolio/shared';
import { parseArgs } from '../figures/cli.js';
import { renderTableHtml, toCsv, toDocx, toHtmlDocument, toLatex, toMarkdown } from './render.js';
import type { MethodsForm } from './values.js';

export const TABLES_USAGE =
  'tables <model file> [--form form.json] [--template ID] [--out DIR] [--format html,md,tex,csv,docx]';

type Io = { out: (t: string) => void; err: (t: string) => void };

/** Experimental statistics straight from the file bytes (gzip, BinaryCIF, mmCIF or PDB). */
export async function experimentFromBytes(bytes: Uint8Array): Promise<ExperimentalStats> {
  return readExperimentFromBytes(bytes);
}

export async function runTablesCommand(args: string[], io: Io): Promise<number> {
  let parsed: ReturnType<typeof parseArgs>;
  try {
    parsed = parseArgs(args);
  } catch (e) {
    io.err(`foldfolio tables: ${(e as Error).message}\nusage: foldfolio ${TABLES_USAGE}\n`);
    return 2;
  }
  const { positional, options } = parsed;
  if (positional.length !== 1) {
    io.err(`usage: foldfolio ${TABLES_USAGE}\n`);
    return 2;
  }
  try {
    const bytes = new Uint8Array(readFileSync(positional[0]));
    const report = await buildReport(bytes, { filename: basename(positional[0]) });
    const experiment = await experimentFromBytes(bytes);
    const form = options.form
      ? (JSON.parse(readFileSync(options.form[0], 'utf8')) as MethodsForm)
      : {};
    const t = renderTableHtml({ report, experiment, form, templateId: options.template?.[0] });
    const out = options.out?.[0] ?? 'tables';
    const formats = (options.format?.[0] ?? 'html,md,tex,csv,docx').split(',');
    mkdirSync(out, { recursive: true });
    const stem = join(out, t.templateId);
    if (formats.includes('html')) writeFileSync(`${stem}.html`, toHtmlDocument(t));
    if (formats.includes('md')) writeFileSync(`${stem}.md`, toMarkdown(t.model));
    if (formats.includes('tex')) writeFileSync(`${stem}.tex`, toLatex(t.model));
    if (formats.includes('csv')) writeFileSync(`${stem}.csv`, toCsv(t.model));
    if (formats.includes('docx')) writeFileSync(`${stem}.docx`, await toDocx(t.model));
    io.out(`${t.templateId}: ${t.used.length} values\n`);
    return 0;
  } catch (e) {
    io.err(`foldfolio tables: ${(e as Error).message}\n`);
    return 1;
  }
}
