/**
 * Review package builder: model version(s) → report, figures (SVG + PDF + the data behind each),
 * methods table (every format), per-residue CSV, README and manifest.json, zipped
 * deterministically. The same inputs give the same zip bytes; `verify` rebuilds with this same
 * function and compares file by file.
 */
import { createHash } from 'node:crypto';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { buildReport, ENGINE_VERSION, type Report, type ResidueRow } from '@foldfolio/shared';
import { nodeGunzip } from '@foldfolio/shared/dist/cli/node-gunzip.js';
import { svgToPdf } from '../figures/export.js';
import { renderFigure } from '../figures/render.js';
import {
  listFigureTemplates,
  loadPreset,
  templatesRoot,
  type FigureTemplate,
} from '../figures/templates.js';
import type { FigureManifest } from '../figures/types.js';
import { experimentFromBytes } from '../tables/cli.js';
import {
  defaultTableFor,
  listTableTemplates,
  renderTableHtml,
  toCsv,
  toDocx,
  toHtmlDocument,
  toLatex,
  toMarkdown,
  type TableManifest,
  type TableTemplate,
} from '../tables/render.js';
import type { MethodsForm } from '../tables/values.js';
import { readZip, writeZip, ZIP_SETTINGS } from './zip.js';

export const PACKAGE_SCHEMA = 'foldfolio.package/1';
/** Figures are frozen at one journal width; the single-column preset is the common case. */
export const PACKAGE_PRESET = 'single';

export interface PackageModelInput {
  /** version number within the manuscript (1, 2, …) */
  n: number;
  /** the uploaded file's name (kept in the manifest unless anonymised) */
  filename: string;
  bytes: Buffer;
}

export interface PackageInput {
  title: string;
  /** chosen versions; sorted by n here */
  models: PackageModelInput[];
  includeModel: boolean;
  anonymise: boolean;
  /** names shown as "prepared by" (left out when anonymised) */
  preparedBy?: string[];
  /**
   * Texts that must appear nowhere in an anonymised package (member names, e-mails, comment
   * bodies); the build fails, naming the file, when one does.
   */
  forbiddenTexts?: string[];
  onProgress?: (fraction: number, step: string) => void;
  /** templates to draw with (verify passes the ones inside the package); default: built-in */
  templates?: TemplateSet;
  /** the methods-table form of each version (by version number), as saved by the authors */
  forms?: Map<number, MethodsForm>;
}

export type FileKind =
  | 'readme'
  | 'model'
  | 'report'
  | 'residues'
  | 'figure'
  | 'figure-data'
  | 'table'
  | 'template'
  | 'form';

export interface ManifestFile {
  path: string;
  kind: FileKind;
  sha256: string;
  sizeBytes: number;
  /** input keys (see `inputs`) this file is computed from */
  dependsOn: string[];
  description: string;
}

export interface ManifestInput {
  key: string;
  kind:
    | 'model'
    | 'figure-template'
    | 'table-template'
    | 'preset'
    | 'reference'
    | 'geometry-library'
    | 'engine'
    | 'form';
  id: string;
  version: string;
  sha256: string;
  /** model inputs: where the file is inside the package, when included */
  path?: string;
  /** model inputs: the uploaded name, left out when anonymised */
  filename?: string;
  /** template inputs: the saved version a manuscript pinned ("<template id>@<n>"), if any */
  pinned?: string;
  sizeBytes?: number;
}

export interface Manifest {
  schema: typeof PACKAGE_SCHEMA;
  title: string;
  anonymised: boolean;
  includesModel: boolean;
  preparedBy: string[];
  preset: string;
  /** Node's zlib and the zip settings: the zip bytes depend on them */
  zip: typeof ZIP_SETTINGS & { zlib: string };
  inputs: ManifestInput[];
  files: ManifestFile[];
}

export interface BuiltPackage {
  zip: Buffer;
  manifest: Manifest;
  /** every entry of the zip, manifest.json included */
  files: Map<string, Buffer>;
  reports: Report[];
}

export class PackageBuildError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'PackageBuildError';
  }
}

export const sha256 = (b: Buffer | string): string => createHash('sha256').update(b).digest('hex');

/** Files of one template folder (name → bytes), e.g. manifest.json + spec.vl.json. */
export type TemplateFolder = Map<string, Buffer>;

/** The figure and table templates a package is built with, by id. */
export interface TemplateSet {
  figures: Map<string, TemplateFolder>;
  tables: Map<string, TemplateFolder>;
}

/** sha256 over every file of a template folder, in name order: name NUL bytes NUL. */
export function folderSha(files: TemplateFolder): string {
  const h = createHash('sha256');
  for (const f of [...files.keys()].sort())
    h.update(f).update('\0').update(files.get(f)!).update('\0');
  return h.digest('hex');
}

function readFolder(dir: string): TemplateFolder {
  return new Map(
    readdirSync(dir)
      .sort()
      .map((f) => [f, readFileSync(join(dir, f))]),
  );
}

/** The built-in templates of this checkout (templates/figures, templates/tables). */
export function builtinTemplateSet(): TemplateSet {
  const root = templatesRoot();
  const figures = new Map<string, TemplateFolder>();
  const tables = new Map<string, TemplateFolder>();
  for (const t of listFigureTemplates())
    figures.set(t.manifest.id, readFolder(join(root, 'figures', t.manifest.id)));
  for (const t of listTableTemplates())
    tables.set(t.manifest.id, readFolder(join(root, 'tables', t.manifest.id)));
  return { figures, tables };
}

function need(folder: TemplateFolder, file: string, what: string): string {
  const b = folder.get(file);
  if (!b)
    throw new PackageBuildError(
      `The ${what} template has no ${file}; the package or template folder is incomplete.`,
    );
  return b.toString('utf8');
}

export function figureTemplateOf(id: string, folder: TemplateFolder): FigureTemplate {
  return {
    manifest: JSON.parse(need(folder, 'manifest.json', `figure ${id}`)) as FigureManifest,
    specText: need(folder, 'spec.vl.json', `figure ${id}`),
  };
}

export function tableTemplateOf(id: string, folder: TemplateFolder): TableTemplate {
  return {
    manifest: JSON.parse(need(folder, 'manifest.json', `table ${id}`)) as TableManifest,
    source: need(folder, 'template.hbs', `table ${id}`),
  };
}

/** The preset's fingerprint (figures are drawn with the installed preset; verify compares it). */
export function presetInput(): ManifestInput {
  const preset = loadPreset(PACKAGE_PRESET);
  return {
    key: `preset:${preset.id}`,
    kind: 'preset',
    id: preset.id,
    version: String(preset.version),
    sha256: sha256(readFileSync(join(templatesRoot(), 'presets', `${preset.id}.json`))),
  };
}

const EXT: Record<string, string> = { mmcif: 'cif', bcif: 'bcif', pdb: 'pdb' };

/** Model path inside the package: never the uploaded name, which may identify the lab. */
function modelPath(n: number, report: Report): string {
  return `model/v${n}.${EXT[report.input.format] ?? 'dat'}${report.input.gzip ? '.gz' : ''}`;
}

function csvCell(v: unknown): string {
  if (v === null || v === undefined) return '';
  const s = Array.isArray(v) ? v.map((x) => (x === null ? '' : String(x))).join(';') : String(v);
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** Rows → CSV; nested objects become dotted columns, in first-appearance order. */
export function rowsToCsv(rows: Record<string, unknown>[]): string {
  const flat = rows.map((r) => {
    const o: Record<string, unknown> = {};
    const walk = (prefix: string, v: unknown) => {
      if (v && typeof v === 'object' && !Array.isArray(v)) {
        for (const [k, x] of Object.entries(v as Record<string, unknown>))
          walk(prefix ? `${prefix}.${k}` : k, x);
      } else o[prefix] = v;
    };
    walk('', r);
    return o;
  });
  const cols: string[] = [];
  const seen = new Set<string>();
  for (const r of flat)
    for (const k of Object.keys(r))
      if (!seen.has(k)) {
        seen.add(k);
        cols.push(k);
      }
  const lines = [cols.map(csvCell).join(',')];
  for (const r of flat) lines.push(cols.map((c) => csvCell(r[c])).join(','));
  return lines.join('\n') + '\n';
}

const RESIDUE_COLUMNS: (keyof ResidueRow)[] = [
  'chain',
  'seq',
  'icode',
  'name',
  'parent',
  'altloc',
  'phi',
  'psi',
  'omega',
  'chi',
  'ss',
  'flags',
  'bMean',
  'occupancyMin',
  'cbDeviationA',
  'bondZMax',
  'angleZMax',
  'rama',
  'steric',
  'rotamer',
];

/** One row per residue conformer of every model, fixed columns (chi1–5 split out). */
export function residuesCsv(report: Report): string {
  const rows = report.models.flatMap((m) =>
    m.residues.map((r) => {
      const o: Record<string, unknown> = { model: m.model };
      for (const c of RESIDUE_COLUMNS) {
        if (c === 'chi') for (let i = 0; i < 5; i++) o[`chi${i + 1}`] = r.chi[i] ?? null;
        else if (c === 'rama')
          o.rama = r.rama
            ? { class: r.rama.class, verdict: r.rama.verdict, percentile: r.rama.percentile }
            : { class: null, verdict: null, percentile: null };
        else if (c === 'rotamer')
          o.rotamer = r.rotamer
            ? {
                name: r.rotamer.name ?? null,
                verdict: r.rotamer.verdict,
                percentile: r.rotamer.percentile,
              }
            : { name: null, verdict: null, percentile: null };
        else o[c] = r[c] ?? null;
      }
      return o;
    }),
  );
  return rowsToCsv(rows);
}

function readme(
  title: string,
  manifest: Omit<Manifest, 'files'>,
  files: Omit<ManifestFile, 'sha256' | 'sizeBytes'>[],
  reports: { n: number; report: Report }[],
): string {
  const L: string[] = [];
  L.push(`# Review package: ${title}`, '');
  if (!manifest.anonymised && manifest.preparedBy.length)
    L.push(`Prepared by ${manifest.preparedBy.join(', ')}.`, '');
  if (manifest.anonymised)
    L.push('This package is anonymised: it names no author, lab or uploaded file.', '');
  L.push('## Cautions', '');
  L.push(
    '- These statistics support expert judgement; they do not replace it. Look at every flagged residue in the experimental map before drawing conclusions.',
    "- The journal's and the structure archive's own requirements and validation still apply; this package does not stand in for them.",
  );
  for (const { n, report } of reports) {
    // the engine's plain-language cautions (shared/src/report/cautions.ts), one rule set everywhere
    const w = report.cautions;
    L.push('', `### Model version ${n}`, '');
    if (w.length === 0)
      L.push('- No counts of concern were found by the checks this package covers.');
    for (const line of w) L.push(`- ${line}`);
  }
  L.push('', '## Versions', '');
  L.push(`- Foldfolio engine ${ENGINE_VERSION}`);
  const ref = reports[0]?.report.reference;
  L.push(`- Reference data: ${ref ? `${ref.id} (sha256 ${ref.sha256})` : 'none'}`);
  const lib = reports[0]?.report.geometryLibrary;
  L.push(`- Side-chain ideal geometry: ${lib ? `${lib.id} (sha256 ${lib.sha256})` : 'none'}`);
  for (const i of manifest.inputs.filter(
    (x) =>
      x.kind !== 'model' &&
      x.kind !== 'engine' &&
      x.kind !== 'reference' &&
      x.kind !== 'geometry-library',
  ))
    L.push(`- ${i.kind} ${i.id} version ${i.version} (sha256 ${i.sha256})`);
  for (const i of manifest.inputs.filter((x) => x.kind === 'model'))
    L.push(
      `- model version ${i.version}: sha256 ${i.sha256}${i.path ? `, in ${i.path}` : ', not included'}`,
    );
  L.push('', '## Files', '');
  L.push(
    '- `manifest.json` — every file with its SHA-256 and the inputs (with versions and SHA-256) it depends on.',
  );
  for (const f of files) L.push(`- \`${f.path}\` — ${f.description}`);
  L.push(
    '',
    '## Checking this package',
    '',
    'Run `npx foldfolio verify <package.zip>` (or use the Verify page of Foldfolio). It checks every',
    'file against manifest.json, recomputes everything from the model with the recorded template',
    'versions, and reports each file as identical, different (with what differs), missing or unexpected.',
    '',
  );
  return L.join('\n');
}

/** Builds every file of the package and the deterministic zip. */
export async function buildPackage(input: PackageInput): Promise<BuiltPackage> {
  if (input.models.length === 0)
    throw new PackageBuildError('Choose at least one model version to put in the package.');
  const models = [...input.models].sort((a, b) => a.n - b.n);
  if (new Set(models.map((m) => m.n)).size !== models.length)
    throw new PackageBuildError('Each model version can be chosen once; remove the duplicate.');
  const progress = input.onProgress ?? (() => undefined);
  const set = input.templates ?? builtinTemplateSet();
  const figureTemplates = [...set.figures.keys()]
    .sort()
    .map((id) => figureTemplateOf(id, set.figures.get(id)!));
  const steps = models.length * (2 + figureTemplates.length) + 2;
  let step = 0;
  const tick = (what: string) => progress(Math.min(0.99, ++step / steps), what);

  const entries: {
    path: string;
    kind: FileKind;
    bytes: Buffer;
    dependsOn: string[];
    description: string;
  }[] = [];
  const inputs: ManifestInput[] = [
    { key: 'engine', kind: 'engine', id: 'foldfolio-engine', version: ENGINE_VERSION, sha256: '' },
  ];
  const reports: { n: number; report: Report }[] = [];
  let previous: Report | null = null;
  let previousKey: string | null = null;
  for (const m of models) {
    // The engine is given no file name when anonymising (it never writes it into the report;
    // the format is sniffed from the content either way).
    const report = await buildReport(new Uint8Array(m.bytes), {
      filename: input.anonymise ? '' : m.filename,
      gunzip: nodeGunzip,
    });
    tick(`analysed model version ${m.n}`);
    reports.push({ n: m.n, report });
    const key = `model:v${m.n}`;
    const path = modelPath(m.n, report);
    inputs.push({
      key,
      kind: 'model',
      id: `v${m.n}`,
      version: String(m.n),
      sha256: sha256(m.bytes),
      sizeBytes: m.bytes.length,
      ...(input.includeModel ? { path } : {}),
      ...(input.anonymise ? {} : { filename: m.filename }),
    });
    if (input.includeModel)
      entries.push({
        path,
        kind: 'model',
        bytes: m.bytes,
        dependsOn: [key],
        description: `the model file of version ${m.n}, as uploaded.`,
      });
    const dir = `v${m.n}`;
    entries.push({
      path: `${dir}/report.json`,
      kind: 'report',
      bytes: Buffer.from(JSON.stringify(report, null, 2) + '\n', 'utf8'),
      dependsOn: [key, 'engine'],
      description: `the full validation report of version ${m.n} (schema ${report.schema}).`,
    });
    entries.push({
      path: `${dir}/residues.csv`,
      kind: 'residues',
      bytes: Buffer.from(residuesCsv(report), 'utf8'),
      dependsOn: [key, 'engine'],
      description: `one row per residue conformer of version ${m.n}: torsions, secondary structure, flags and verdicts.`,
    });
    for (const t of figureTemplates) {
      const id = t.manifest.id;
      if (t.manifest.needsComparison && !previous) {
        tick(`skipped ${id}`);
        continue;
      }
      const fig = await renderFigure({
        report,
        previous,
        templateId: id,
        template: t,
        presetId: PACKAGE_PRESET,
      });
      const deps = [key, `figure-template:${id}`, `preset:${PACKAGE_PRESET}`, 'engine'];
      if (t.manifest.needsComparison && previousKey) deps.splice(1, 0, previousKey);
      const stem = `${dir}/figures/${id}`;
      const what = t.manifest.needsComparison
        ? `${t.manifest.title} (against the previous chosen version)`
        : t.manifest.title;
      entries.push({
        path: `${stem}.svg`,
        kind: 'figure',
        bytes: Buffer.from(fig.svg, 'utf8'),
        dependsOn: deps,
        description: `figure "${what}", SVG.`,
      });
      entries.push({
        path: `${stem}.pdf`,
        kind: 'figure',
        bytes: await svgToPdf(fig.svg, { title: t.manifest.title }),
        dependsOn: deps,
        description: `figure "${what}", PDF.`,
      });
      entries.push({
        path: `${stem}.data.json`,
        kind: 'figure-data',
        bytes: Buffer.from(JSON.stringify(fig.rows, null, 2) + '\n', 'utf8'),
        dependsOn: deps,
        description: `the rows drawn in "${what}", JSON.`,
      });
      entries.push({
        path: `${stem}.data.csv`,
        kind: 'figure-data',
        bytes: Buffer.from(rowsToCsv(fig.rows), 'utf8'),
        dependsOn: deps,
        description: `the rows drawn in "${what}", CSV.`,
      });
      tick(`figure ${id} of version ${m.n}`);
    }
    const experiment = await experimentFromBytes(new Uint8Array(m.bytes));
    const tableId = defaultTableFor(report.method ?? experiment.method);
    const tableFolder = set.tables.get(tableId);
    if (!tableFolder)
      throw new PackageBuildError(
        `The methods table template "${tableId}" is not available; add it to the templates folder (or the package).`,
      );
    // the authors' form entries travel with the package (an input, not an output)
    const form = input.forms?.get(m.n);
    const tdeps = [key, `table-template:${tableId}`, 'engine'];
    if (form && Object.keys(form).length > 0) {
      const formBytes = Buffer.from(
        JSON.stringify(form, Object.keys(form).sort(), 2) + '\n',
        'utf8',
      );
      const formPath = `${dir}/methods-form.json`;
      inputs.push({
        key: `form:v${m.n}`,
        kind: 'form',
        id: `v${m.n}`,
        version: String(m.n),
        sha256: sha256(formBytes),
        path: formPath,
      });
      entries.push({
        path: formPath,
        kind: 'form',
        bytes: formBytes,
        dependsOn: [`form:v${m.n}`],
        description: `the methods-table form entries of version ${m.n} (values the authors typed in).`,
      });
      tdeps.push(`form:v${m.n}`);
    }
    const table = renderTableHtml({
      report,
      experiment,
      form: form ?? {},
      template: tableTemplateOf(tableId, tableFolder),
    });
    const tstem = `${dir}/tables/${tableId}`;
    const tdesc = `the methods table (${tableId})`;
    entries.push({
      path: `${tstem}.html`,
      kind: 'table',
      bytes: Buffer.from(toHtmlDocument(table), 'utf8'),
      dependsOn: tdeps,
      description: `${tdesc}, HTML.`,
    });
    entries.push({
      path: `${tstem}.md`,
      kind: 'table',
      bytes: Buffer.from(toMarkdown(table.model), 'utf8'),
      dependsOn: tdeps,
      description: `${tdesc}, Markdown.`,
    });
    entries.push({
      path: `${tstem}.tex`,
      kind: 'table',
      bytes: Buffer.from(toLatex(table.model), 'utf8'),
      dependsOn: tdeps,
      description: `${tdesc}, LaTeX.`,
    });
    entries.push({
      path: `${tstem}.csv`,
      kind: 'table',
      bytes: Buffer.from(toCsv(table.model), 'utf8'),
      dependsOn: tdeps,
      description: `${tdesc}, CSV.`,
    });
    entries.push({
      path: `${tstem}.docx`,
      kind: 'table',
      bytes: await normaliseDocx(await toDocx(table.model)),
      dependsOn: tdeps,
      description: `${tdesc}, Word.`,
    });
    tick(`table of version ${m.n}`);
    previous = report;
    previousKey = key;
  }
  // the versioned data the engine computed with: reference distributions, side-chain geometry
  const ref = reports[0].report.reference;
  const lib = reports[0].report.geometryLibrary;
  for (const [kind, data] of [
    ['reference', ref],
    ['geometry-library', lib],
  ] as const)
    if (data) inputs.push({ key: kind, kind, id: data.id, version: data.id, sha256: data.sha256 });
  // the templates used travel inside the package, so verify recomputes with exactly them
  const used = new Set(entries.flatMap((e) => e.dependsOn));
  const templateEntries: typeof entries = [];
  for (const [kind, map] of [
    ['figure', set.figures],
    ['table', set.tables],
  ] as const) {
    for (const id of [...map.keys()].sort()) {
      const key = `${kind}-template:${id}`;
      if (!used.has(key)) continue;
      const folder = map.get(id)!;
      const dirPath = `templates/${kind === 'figure' ? 'figures' : 'tables'}/${id}/`;
      const manifest = JSON.parse(folder.get('manifest.json')?.toString('utf8') ?? '{}') as {
        version?: number;
        pinned?: string;
      };
      inputs.push({
        key,
        kind: `${kind}-template`,
        id,
        version: String(manifest.version ?? '?'),
        sha256: folderSha(folder),
        path: dirPath,
        ...(manifest.pinned ? { pinned: manifest.pinned } : {}),
      });
      for (const [f, bytes] of folder)
        templateEntries.push({
          path: dirPath + f,
          kind: 'template',
          bytes,
          dependsOn: [key],
          description: `the ${kind} template "${id}" as used (${f}).`,
        });
    }
  }
  if (used.has(`preset:${PACKAGE_PRESET}`)) inputs.push(presetInput());
  entries.push(...templateEntries);
  for (const e of entries)
    if (e.kind !== 'model' && e.kind !== 'template' && e.kind !== 'form') {
      // everything else holds numbers the engine computed
      e.dependsOn.push('engine');
      if (ref) e.dependsOn.push('reference');
      if (lib) e.dependsOn.push('geometry-library');
    }

  const head: Omit<Manifest, 'files'> = {
    schema: PACKAGE_SCHEMA,
    title: input.title,
    anonymised: input.anonymise,
    includesModel: input.includeModel,
    preparedBy: input.anonymise ? [] : (input.preparedBy ?? []),
    preset: PACKAGE_PRESET,
    zip: { ...ZIP_SETTINGS, zlib: process.versions.zlib ?? 'unknown' },
    inputs,
  };
  entries.sort((a, b) => (a.path < b.path ? -1 : 1));
  const readmeText = readme(
    input.title,
    head,
    [{ path: 'README.md', kind: 'readme', dependsOn: [], description: 'this file.' }, ...entries],
    reports,
  );
  entries.unshift({
    path: 'README.md',
    kind: 'readme',
    bytes: Buffer.from(readmeText, 'utf8'),
    dependsOn: inputs.map((i) => i.key),
    description: 'this file.',
  });
  const manifest: Manifest = {
    ...head,
    files: entries.map((e) => ({
      path: e.path,
      kind: e.kind,
      sha256: sha256(e.bytes),
      sizeBytes: e.bytes.length,
      dependsOn: e.dependsOn,
      description: e.description,
    })),
  };
  const files = new Map<string, Buffer>(entries.map((e) => [e.path, e.bytes]));
  files.set('manifest.json', Buffer.from(JSON.stringify(manifest, null, 2) + '\n', 'utf8'));
  if (input.anonymise) checkAnonymous(files, input.forbiddenTexts ?? []);
  const zip = await writeZip(files);
  progress(1, 'zipped');
  return { zip, manifest, files, reports: reports.map((r) => r.report) };
}

/** Entries searched as text; PDF and Word files are drawn from the same SVG and table model. */
const TEXTUAL = /\.(json|csv|md|html|tex|svg|cif|pdb|ent|hbs|txt)$/i;

/**
 * Fails when a text entry contains one of the forbidden texts as a whole word or phrase
 * (case-insensitive; whole words so a short name never matches inside another word). Names the
 * file so the owner can act. Compressed model files (.gz, BinaryCIF) are not searched here.
 */
export function checkAnonymous(files: Map<string, Buffer>, forbidden: string[]): void {
  const escape = (t: string) => t.replace(/[.*+?^$()|[\]{}\\]/g, '\\$&');
  const needles = [...new Set(forbidden.map((t) => t.trim()).filter((t) => t.length >= 3))].map(
    (n) => ({ n, re: new RegExp('(^|[^\\p{L}\\p{N}])' + escape(n) + '($|[^\\p{L}\\p{N}])', 'iu') }),
  );
  for (const [path, bytes] of files) {
    if (!TEXTUAL.test(path)) continue;
    const hay = bytes.toString('utf8');
    for (const { n, re } of needles) {
      if (re.test(hay))
        throw new PackageBuildError(
          `The anonymised package would reveal "${n}" in ${path}. ${path.startsWith('model/') ? 'Remove it from the model file (for example its author records) and upload a new version, or build the package without the model file.' : 'Build the package without anonymisation, or tell the Foldfolio developers.'}`,
        );
    }
  }
}

/** Fixed creation/modification time written into Word files (the docx library stamps "now"). */
const DOCX_DATE = '2000-01-01T00:00:00Z';

/**
 * The docx writer stamps the current time into docProps/core.xml and its zip entries; a package
 * needs the same bytes every time, so the parts are re-zipped with our fixed settings and the
 * two dates replaced. [Content_Types].xml still comes first ('[' sorts before letters).
 */
export async function normaliseDocx(docx: Buffer): Promise<Buffer> {
  const parts = await readZip(docx);
  const core = parts.get('docProps/core.xml');
  if (core)
    parts.set(
      'docProps/core.xml',
      Buffer.from(
        core
          .toString('utf8')
          .replace(
            /(<dcterms:(created|modified) xsi:type="dcterms:W3CDTF">)[^<]*(<\/dcterms:\2>)/g,
            `$1${DOCX_DATE}$3`,
          ),
        'utf8',
      ),
    );
  return writeZip(parts);
}

/**
 * A template folder for a saved (pinned) version: the built-in slot's manifest with the saved
 * version number and reference, and the saved body as the spec or Handlebars source.
 */
export function pinnedFolder(
  kind: 'figure' | 'table',
  builtin: TemplateFolder,
  pinned: { ref: string; n: number; body: string },
): TemplateFolder {
  const manifest = JSON.parse(builtin.get('manifest.json')!.toString('utf8')) as Record<
    string,
    unknown
  >;
  const out: TemplateFolder = new Map();
  out.set(
    'manifest.json',
    Buffer.from(
      JSON.stringify({ ...manifest, version: pinned.n, pinned: pinned.ref }, null, 2) + '\n',
      'utf8',
    ),
  );
  out.set(kind === 'figure' ? 'spec.vl.json' : 'template.hbs', Buffer.from(pinned.body, 'utf8'));
  return out;
}
