/**
 * Methods tables: a Handlebars template (sandboxed) renders an HTML table from the values of
 * one model version; the HTML is read back into rows and written out as HTML, Markdown, LaTeX,
 * CSV and a word-processor document. Same inputs ⇒ byte-identical text outputs.
 */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import {
  AlignmentType,
  Document,
  Packer,
  Paragraph,
  Table,
  TableCell,
  TableRow,
  TextRun,
  WidthType,
} from 'docx';
import { parseDocument } from 'htmlparser2';
import type { ExperimentalStats, Report } from '@foldfolio/shared';
import { templatesRoot } from '../figures/templates.js';
import { renderSandboxed, type HelperFn } from './sandbox.js';
import { collectValues, type MethodsForm, type TableValue } from './values.js';

export interface TableManifest {
  id: string;
  kind: 'table';
  version: number;
  title: string;
  method: 'x-ray' | 'electron-microscopy' | 'nmr';
  description: string;
}

export interface TableTemplate {
  manifest: TableManifest;
  source: string;
}

export function listTableTemplates(): TableTemplate[] {
  const dir = join(templatesRoot(), 'tables');
  return readdirSync(dir)
    .sort()
    .filter((d) => existsSync(join(dir, d, 'manifest.json')))
    .map((d) => ({
      manifest: JSON.parse(readFileSync(join(dir, d, 'manifest.json'), 'utf8')) as TableManifest,
      source: readFileSync(join(dir, d, 'template.hbs'), 'utf8'),
    }));
}

export function loadTableTemplate(id: string): TableTemplate {
  const t = listTableTemplates().find((x) => x.manifest.id === id);
  if (!t)
    throw new Error(
      `There is no table template "${id}"; choose one of ${listTableTemplates()
        .map((x) => x.manifest.id)
        .join(', ')}.`,
    );
  return t;
}

/** The built-in table for a method (x-ray for neutron and unknown). */
export function defaultTableFor(method: Report['method']): string {
  return method === 'electron-microscopy'
    ? 'methods-em'
    : method === 'nmr'
      ? 'methods-nmr'
      : 'methods-xray';
}

export const MISSING = '—';

/** Fixed decimals for numbers (the template says how many); strings as they are. */
export function formatValue(v: TableValue | undefined, decimals: number | undefined): string {
  if (!v || v.value === null) return MISSING;
  if (typeof v.value === 'number') {
    if (decimals === undefined)
      return Number.isInteger(v.value) ? String(v.value) : String(v.value);
    return v.value.toFixed(decimals);
  }
  return v.value;
}

export interface TableRequest {
  report: Report;
  experiment: ExperimentalStats;
  form?: MethodsForm;
  templateId?: string;
  /** a saved version's body instead of the built-in one */
  template?: TableTemplate;
}

export interface TableModel {
  caption: string;
  header: string[];
  rows: ({ section: string } | { cells: string[] })[];
  notes: string[];
}

export interface RenderedTable {
  templateId: string;
  templateVersion: number;
  html: string;
  model: TableModel;
  /** every value the table shows, with its origin */
  used: TableValue[];
}

interface HelperOptions {
  hash: Record<string, unknown>;
}

export function renderTableHtml(req: TableRequest): RenderedTable {
  const t =
    req.template ??
    loadTableTemplate(
      req.templateId ?? defaultTableFor(req.report.method ?? req.experiment.method),
    );
  const values = collectValues(req.experiment, req.report, req.form);
  const used = new Map<string, TableValue>();
  const get = (key: unknown): TableValue | undefined => {
    if (typeof key !== 'string')
      throw new Error('a helper was given a value name that is not a string');
    const v = values.get(key);
    if (v && v.value !== null) used.set(key, v);
    return v;
  };
  const dec = (o: HelperOptions, name = 'd'): number | undefined => {
    const d = o.hash[name];
    if (d === undefined) return undefined;
    if (typeof d !== 'number' || d < 0 || d > 6 || !Number.isInteger(d))
      throw new Error(`${name}= must be a whole number of decimals from 0 to 6`);
    return d;
  };
  const helpers: Record<string, HelperFn> = {
    // {{val "completenessPct" shell="shellCompletenessPct" d=1}} → 99.6 (98.6)
    val: (key, opts) => {
      const o = opts as HelperOptions;
      const main = formatValue(get(key), dec(o));
      const shellKey = o.hash.shell;
      if (shellKey === undefined) return main;
      const shell = formatValue(get(shellKey), dec(o));
      return shell === MISSING ? main : `${main} (${shell})`;
    },
    // {{range "resolutionLowA" "resolutionHighA" shellLow=… shellHigh=… d=2}} → 25.00–1.70 (1.73–1.70)
    range: (low, high, opts) => {
      const o = opts as HelperOptions;
      const d = dec(o);
      const a = formatValue(get(low), d);
      const b = formatValue(get(high), d);
      let s = a === MISSING && b === MISSING ? MISSING : `${a}–${b}`;
      if (o.hash.shellLow !== undefined && o.hash.shellHigh !== undefined) {
        const sa = formatValue(get(o.hash.shellLow), d);
        const sb = formatValue(get(o.hash.shellHigh), d);
        if (sa !== MISSING || sb !== MISSING) s += ` (${sa}–${sb})`;
      }
      return s;
    },
    // {{list "cellA" "cellB" "cellC" d=2}} → 41.98, 41.98, 88.92
    list: (...args) => {
      const o = args.pop() as HelperOptions;
      return args.map((k) => formatValue(get(k), dec(o))).join(', ');
    },
    // {{ratio "reflectionsRefinement" "reflectionsFree"}} → 9254 / 969
    ratio: (a, b, opts) => {
      const o = opts as HelperOptions;
      return `${formatValue(get(a), dec(o))} / ${formatValue(get(b), dec(o))}`;
    },
    // list of "Label: source (origin)" lines for the footnote, in table order
    sources: () =>
      [...used.values()].map(
        (v) =>
          `${v.label}: ${v.origin === 'file' ? v.source : v.origin === 'form' ? 'entered in the form' : `computed (${v.source})`}`,
      ),
  };
  const context = {
    engineVersion: req.report.engine.version,
    referenceId: req.report.reference?.id ?? 'none',
    method: req.report.method ?? req.experiment.method,
    templateId: t.manifest.id,
    templateVersion: t.manifest.version,
  };
  const html = renderSandboxed(t.source, context, helpers).trim() + '\n';
  return {
    templateId: t.manifest.id,
    templateVersion: t.manifest.version,
    html,
    model: tableModel(html),
    used: [...used.values()],
  };
}

// ---- reading the HTML back -----------------------------------------------------------

interface Node {
  type: string;
  name?: string;
  attribs?: Record<string, string>;
  children?: Node[];
  data?: string;
}

function text(n: Node): string {
  if (n.type === 'text') return n.data ?? '';
  if (n.name === 'br') return ' ';
  return (n.children ?? []).map(text).join('');
}

function decodeEntities(s: string): string {
  return s
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&quot;/g, '"')
    .replace(/&#x27;|&#39;/g, "'")
    .replace(/&#x60;/g, '`')
    .replace(/&#x3D;/g, '=')
    .replace(/&amp;/g, '&');
}

const clean = (s: string) => decodeEntities(s).replace(/\s+/g, ' ').trim();

function find(n: Node, name: string, out: Node[] = []): Node[] {
  if (n.name === name) out.push(n);
  for (const c of n.children ?? []) find(c, name, out);
  return out;
}

export function tableModel(html: string): TableModel {
  const doc = parseDocument(html) as unknown as Node;
  const table = find(doc, 'table')[0];
  if (!table)
    throw new Error(
      'The template produced no <table>; a methods-table template must render one table.',
    );
  const caption = clean(find(table, 'caption').map(text).join(' '));
  const thead = find(table, 'thead')[0];
  const header = thead ? find(thead, 'th').map((c) => clean(text(c))) : [];
  const rows: TableModel['rows'] = [];
  for (const body of find(table, 'tbody')) {
    for (const tr of find(body, 'tr')) {
      const cells = (tr.children ?? []).filter((c) => c.name === 'th' || c.name === 'td');
      if ((tr.attribs?.class ?? '').split(/\s+/).includes('section'))
        rows.push({ section: clean(cells.map(text).join(' ')) });
      else rows.push({ cells: cells.map((c) => clean(text(c))) });
    }
  }
  const notes: string[] = [];
  for (const foot of find(table, 'tfoot'))
    for (const p of find(foot, 'p')) notes.push(clean(text(p)));
  return { caption, header, rows, notes };
}

// ---- writers -------------------------------------------------------------------------

export function toMarkdown(m: TableModel): string {
  const esc = (s: string) =>
    s
      .replace(/\\/g, '\\\\')
      .replace(/\|/g, '\\|')
      .replace(/([*_`[\]<>])/g, '\\$1');
  const width = Math.max(
    2,
    m.header.length,
    ...m.rows.map((r) => ('cells' in r ? r.cells.length : 1)),
  );
  const pad = (cells: string[]) => [...cells, ...Array(width - cells.length).fill('')];
  const lines: string[] = [];
  if (m.caption) lines.push(`**${esc(m.caption)}**`, '');
  lines.push(
    `| ${pad(m.header.length ? m.header : ['', ''])
      .map(esc)
      .join(' | ')} |`,
  );
  lines.push(`| ${Array(width).fill('---').join(' | ')} |`);
  for (const r of m.rows)
    lines.push(
      'section' in r
        ? `| ${pad([`**${esc(r.section)}**`]).join(' | ')} |`
        : `| ${pad(r.cells).map(esc).join(' | ')} |`,
    );
  if (m.notes.length)
    lines.push(
      '',
      ...m.notes
        .map((n) => esc(n))
        .join('\n\n')
        .split('\n'),
    );
  return lines.join('\n') + '\n';
}

const LATEX_CHARS: Record<string, string> = {
  '\\': '\\textbackslash{}',
  '{': '\\{',
  '}': '\\}',
  $: '\\$',
  '&': '\\&',
  '#': '\\#',
  '^': '\\textasciicircum{}',
  _: '\\_',
  '%': '\\%',
  '~': '\\textasciitilde{}',
  Å: '\\AA{}',
  '°': '$^{\\circ}$',
  '²': '$^{2}$',
  '⁻': '$^{-}$',
  '–': '--',
  '—': '---',
  '·': '$\\cdot$',
  '±': '$\\pm$',
  '≥': '$\\geq$',
  '√': '$\\surd$',
  α: '$\\alpha$',
  β: '$\\beta$',
  γ: '$\\gamma$',
  σ: '$\\sigma$',
  φ: '$\\phi$',
  ψ: '$\\psi$',
  χ: '$\\chi$',
  ω: '$\\omega$',
  Δ: '$\\Delta$',
  '<': '\\textless{}',
  '>': '\\textgreater{}',
};

export function latexEscape(s: string): string {
  return [...s].map((c) => LATEX_CHARS[c] ?? c).join('');
}

export function toLatex(m: TableModel): string {
  const width = Math.max(
    2,
    m.header.length,
    ...m.rows.map((r) => ('cells' in r ? r.cells.length : 1)),
  );
  const lines = [
    '% Foldfolio methods table; needs \\usepackage{booktabs}',
    '\\begin{table}',
    '\\centering',
  ];
  if (m.caption) lines.push(`\\caption{${latexEscape(m.caption)}}`);
  lines.push(`\\begin{tabular}{l${'r'.repeat(width - 1)}}`, '\\toprule');
  if (m.header.length) lines.push(`${m.header.map(latexEscape).join(' & ')} \\\\`, '\\midrule');
  for (const r of m.rows) {
    if ('section' in r)
      lines.push(`\\multicolumn{${width}}{l}{\\textit{${latexEscape(r.section)}}} \\\\`);
    else
      lines.push(
        `${[...r.cells, ...Array(width - r.cells.length).fill('')].map(latexEscape).join(' & ')} \\\\`,
      );
  }
  lines.push('\\bottomrule', '\\end{tabular}');
  if (m.notes.length)
    lines.push('\\par\\smallskip\\footnotesize', ...m.notes.map((n) => `${latexEscape(n)}\\par`));
  lines.push('\\end{table}');
  return lines.join('\n') + '\n';
}

/** RFC 4180 CSV: section, label, then one column per value column. */
export function toCsv(m: TableModel): string {
  const q = (s: string) => (/[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);
  const lines: string[] = [];
  lines.push(
    [
      'section',
      ...(m.header.length
        ? m.header.map((h, i) => h || (i === 0 ? 'item' : `value${i}`))
        : ['item', 'value']),
    ]
      .map(q)
      .join(','),
  );
  let section = '';
  for (const r of m.rows) {
    if ('section' in r) section = r.section;
    else lines.push([section, ...r.cells].map(q).join(','));
  }
  for (const n of m.notes) lines.push(['note', n].map(q).join(','));
  return lines.join('\r\n') + '\r\n';
}

export function toHtmlDocument(t: RenderedTable): string {
  return [
    '<!doctype html>',
    '<html lang="en"><head><meta charset="utf-8"><title>Methods table</title>',
    '<style>table{border-collapse:collapse;font-family:"Source Sans 3",sans-serif;font-variant-numeric:tabular-nums}caption{font-family:Merriweather,serif;text-align:left;padding-bottom:4pt}th,td{padding:2pt 8pt;text-align:left}td{text-align:right}tr.section th{font-style:italic;padding-top:6pt}thead th{border-bottom:1px solid #1F2A44}tfoot{font-size:smaller}</style>',
    '</head><body>',
    t.html.trim(),
    '</body></html>',
    '',
  ].join('\n');
}

export async function toDocx(m: TableModel): Promise<Buffer> {
  const width = Math.max(
    2,
    m.header.length,
    ...m.rows.map((r) => ('cells' in r ? r.cells.length : 1)),
  );
  const cell = (
    s: string,
    opts: { bold?: boolean; italics?: boolean; span?: number; right?: boolean } = {},
  ) =>
    new TableCell({
      columnSpan: opts.span,
      children: [
        new Paragraph({
          alignment: opts.right ? AlignmentType.RIGHT : AlignmentType.LEFT,
          children: [new TextRun({ text: s, bold: opts.bold, italics: opts.italics })],
        }),
      ],
    });
  const rows: TableRow[] = [];
  if (m.header.length)
    rows.push(
      new TableRow({ tableHeader: true, children: m.header.map((h) => cell(h, { bold: true })) }),
    );
  for (const r of m.rows) {
    if ('section' in r)
      rows.push(new TableRow({ children: [cell(r.section, { italics: true, span: width })] }));
    else
      rows.push(
        new TableRow({
          children: [...r.cells, ...Array(width - r.cells.length).fill('')].map((c, i) =>
            cell(c, { right: i > 0 }),
          ),
        }),
      );
  }
  const doc = new Document({
    creator: 'Foldfolio',
    title: m.caption || 'Methods table',
    sections: [
      {
        children: [
          new Paragraph({ children: [new TextRun({ text: m.caption, bold: true })] }),
          new Table({ rows, width: { size: 100, type: WidthType.PERCENTAGE } }),
          ...m.notes.map((n) => new Paragraph({ children: [new TextRun({ text: n, size: 16 })] })),
        ],
      },
    ],
  });
  return Packer.toBuffer(doc);
}
