/**
 * Methods tables from real entries. Values are checked against the same PDBx items read by
 * gemmi (Debian python3-gemmi under /usr/bin/python3); the word-processor file is opened with
 * Python's zipfile; the Handlebars sandbox is attacked with prototype access and script.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { buildReport, type ExperimentalStats, type Report } from '@foldfolio/shared';
import { experimentFromBytes } from '../src/tables/cli.js';
import {
  renderTableHtml,
  toCsv,
  toDocx,
  toLatex,
  toMarkdown,
  type TableTemplate,
} from '../src/tables/render.js';
import { TemplateError } from '../src/tables/sandbox.js';

const HERE = dirname(fileURLToPath(import.meta.url));
const FIXTURES = join(HERE, '../../shared/test/fixtures');
const OUT = mkdtempSync(join(tmpdir(), 'foldfolio-tables-'));

interface Loaded {
  report: Report;
  experiment: ExperimentalStats;
}
const loaded: Record<string, Loaded> = {};
let gemmi: Record<string, Record<string, number | string>> = {};
let xray: string[] = [];

beforeAll(async () => {
  const files = readdirSync(FIXTURES)
    .filter((f) => /\.(cif|pdb)(\.gz)?$/.test(f))
    .sort();
  for (const f of files) {
    const bytes = new Uint8Array(readFileSync(join(FIXTURES, f)));
    const experiment = await experimentFromBytes(bytes);
    if (experiment.method !== 'x-ray' && f !== '2OFG.cif') continue;
    // header-only entries (bad-input fixtures) have no model, so no table: the engine refuses them
    const report = await buildReport(bytes, { filename: f }).catch(() => null);
    if (report) loaded[f] = { report, experiment };
  }
  xray = Object.keys(loaded).filter((f) => loaded[f].experiment.method === 'x-ray');
  gemmi = JSON.parse(
    execFileSync(
      '/usr/bin/python3',
      [
        join(HERE, '../../shared/test/reference/experiment_gemmi.py'),
        ...xray.map((f) => join(FIXTURES, f)),
      ],
      { encoding: 'utf8' },
    ),
  );
});

/** CSV (RFC 4180) → rows of cells; a small reader so the test does not reuse the writer. */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let cell = '';
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') {
        cell += '"';
        i++;
      } else if (c === '"') quoted = false;
      else cell += c;
    } else if (c === '"') quoted = true;
    else if (c === ',') {
      row.push(cell);
      cell = '';
    } else if (c === '\r') continue;
    else if (c === '\n') {
      row.push(cell);
      rows.push(row);
      row = [];
      cell = '';
    } else cell += c;
  }
  return rows;
}

function cellOf(csv: string[][], section: string, item: string): string {
  const r = csv.find((x) => x[0] === section && x[1] === item);
  if (!r) throw new Error(`row ${section} / ${item} missing`);
  return r[2];
}

/** a number printed with n decimals equals the reference rounded the same way */
function sameAt(printed: string, ref: number | string | undefined, decimals: number): boolean {
  return (
    typeof ref === 'number' &&
    Number(printed).toFixed(decimals) === ref.toFixed(decimals) &&
    Math.abs(Number(printed) - ref) <= 0.5 * 10 ** -decimals + 1e-12
  );
}

describe('X-ray methods table vs gemmi', () => {
  test('resolution, R-work, R-free, cell, space group, reflections and completeness equal the PDBx items read by gemmi, for every X-ray fixture', () => {
    expect(xray.length).toBeGreaterThanOrEqual(5);
    const problems: string[] = [];
    let checks = 0;
    for (const f of xray) {
      const g = gemmi[f];
      const csv = parseCsv(
        toCsv(renderTableHtml({ ...loaded[f], templateId: 'methods-xray' }).model),
      );
      const check = (ok: boolean, what: string, printed: string) => {
        checks++;
        if (!ok) problems.push(`${f} ${what}: table "${printed}" gemmi ${JSON.stringify(g)}`);
      };
      if (g.spaceGroup !== undefined)
        check(
          cellOf(csv, 'Data collection', 'Space group') === g.spaceGroup,
          'space group',
          cellOf(csv, 'Data collection', 'Space group'),
        );
      if (g.cellA !== undefined) {
        const cell = cellOf(csv, 'Data collection', 'Cell dimensions a, b, c (Å)').split(', ');
        check(
          sameAt(cell[0], g.cellA, 2) && sameAt(cell[1], g.cellB, 2) && sameAt(cell[2], g.cellC, 2),
          'cell',
          cell.join(', '),
        );
        const ang = cellOf(csv, 'Data collection', 'α, β, γ (°)').split(', ');
        check(
          sameAt(ang[0], g.cellAlpha, 2) &&
            sameAt(ang[1], g.cellBeta, 2) &&
            sameAt(ang[2], g.cellGamma, 2),
          'angles',
          ang.join(', '),
        );
      }
      const refRes = cellOf(csv, 'Refinement', 'Resolution (Å)');
      if (g.refineResolutionHighA !== undefined)
        check(
          sameAt(refRes.split('–')[1], g.refineResolutionHighA, 2),
          'refinement resolution',
          refRes,
        );
      if (g.refineResolutionLowA !== undefined)
        check(
          sameAt(refRes.split('–')[0], g.refineResolutionLowA, 2),
          'refinement low resolution',
          refRes,
        );
      const dc = cellOf(csv, 'Data collection', 'Resolution (Å)');
      if (g.resolutionHighA !== undefined)
        check(sameAt(dc.split(' ')[0].split('–')[1], g.resolutionHighA, 2), 'data resolution', dc);
      const r = cellOf(csv, 'Refinement', 'R-work / R-free').split(' / ');
      if (g.rWork !== undefined) check(sameAt(r[0], g.rWork, 3), 'R-work', r[0]);
      if (g.rFree !== undefined) check(sameAt(r[1], g.rFree, 3), 'R-free', r[1]);
      const refl = cellOf(csv, 'Refinement', 'Reflections (work / test)').split(' / ');
      if (g.reflectionsRefinement !== undefined)
        check(Number(refl[0]) === g.reflectionsRefinement, 'reflections', refl[0]);
      if (g.reflectionsUnique !== undefined)
        check(
          Number(cellOf(csv, 'Data collection', 'Unique reflections').split(' ')[0]) ===
            g.reflectionsUnique,
          'unique reflections',
          cellOf(csv, 'Data collection', 'Unique reflections'),
        );
      if (g.completenessPct !== undefined)
        check(
          sameAt(
            cellOf(csv, 'Data collection', 'Completeness (%)').split(' ')[0],
            g.completenessPct,
            1,
          ),
          'completeness',
          cellOf(csv, 'Data collection', 'Completeness (%)'),
        );
    }
    expect(problems).toEqual([]);
    expect(checks).toBeGreaterThan(40);
  });

  test('the highest shell is in parentheses and the footnote names each source (1A8O)', () => {
    const t = renderTableHtml({ ...loaded['1A8O.cif'], templateId: 'methods-xray' });
    const csv = parseCsv(toCsv(t.model));
    // entry's own REMARK 200: 25.0–1.70 Å overall, 1.73–1.70 Å highest shell, 99.6 (98.6) %
    expect(cellOf(csv, 'Data collection', 'Resolution (Å)')).toBe('25.00–1.70 (1.73–1.70)');
    expect(cellOf(csv, 'Data collection', 'Completeness (%)')).toBe('99.6 (98.6)');
    const notes = t.model.notes.join(' ');
    expect(notes).toContain('R-free: _refine.ls_R_factor_R_free');
    expect(notes).toMatch(/Bond lengths RMSD \(Å\): computed/);
    expect(notes).toContain(`engine ${loaded['1A8O.cif'].report.engine.version}`);
    expect(notes).toContain(`reference ${loaded['1A8O.cif'].report.reference?.id ?? 'none'}`);
  });

  test('a form value overrides the file and the footnote says so; a bad form value gets a sentence', () => {
    const t = renderTableHtml({
      ...loaded['1A8O.cif'],
      templateId: 'methods-xray',
      form: { rFree: '0.2601', ccHalf: 0.998 },
    });
    const csv = parseCsv(toCsv(t.model));
    expect(cellOf(csv, 'Refinement', 'R-work / R-free')).toBe('0.215 / 0.260');
    expect(cellOf(csv, 'Data collection', 'CC1/2')).toBe('0.998');
    expect(t.model.notes.join(' ')).toContain('R-free: entered in the form');
    expect(() => renderTableHtml({ ...loaded['1A8O.cif'], form: { rFree: 'low' } })).toThrow(
      /R-free" must be a number/,
    );
    expect(() => renderTableHtml({ ...loaded['1A8O.cif'], form: { colour: 'red' } })).toThrow(
      /no field "colour"/,
    );
  });
});

describe('other methods and formats', () => {
  test('the NMR table reads the ensemble items (2OFG: 300 calculated, 30 submitted)', () => {
    // values as written in the entry's _pdbx_nmr_ensemble category
    const t = renderTableHtml(loaded['2OFG.cif']);
    expect(t.templateId).toBe('methods-nmr');
    const csv = parseCsv(toCsv(t.model));
    expect(cellOf(csv, 'Structure calculation', 'Conformers calculated / submitted')).toBe(
      '300 / 30',
    );
  });

  test('LaTeX escapes specials and Greek; Markdown escapes pipes', () => {
    const t = renderTableHtml({
      ...loaded['1A8O.cif'],
      form: { refinementProgram: 'X|PLOR_3 & 50% #1' },
    });
    expect(toLatex(t.model)).toContain('$\\alpha$, $\\beta$, $\\gamma$ ($^{\\circ}$)');
    expect(toLatex(t.model)).not.toMatch(/[^\\]&[^ ]/);
    expect(toMarkdown(t.model)).toContain('| Space group | P 43 21 2 |');
  });

  test('the docx opens as a zip (Python zipfile) with the values in word/document.xml', async () => {
    const t = renderTableHtml({ ...loaded['1A8O.cif'], templateId: 'methods-xray' });
    const p = join(OUT, 'x.docx');
    writeFileSync(p, await toDocx(t.model));
    const xml = execFileSync(
      '/usr/bin/python3',
      [
        '-c',
        'import sys,zipfile;print(zipfile.ZipFile(sys.argv[1]).read("word/document.xml").decode())',
        p,
      ],
      { encoding: 'utf8' },
    );
    expect(xml).toContain('0.215 / 0.253');
    expect(xml).toContain('P 43 21 2');
  });

  test('same inputs give byte-identical table text', () => {
    const a = renderTableHtml(loaded['1A8O.cif']);
    const b = renderTableHtml(loaded['1A8O.cif']);
    expect(a.html).toBe(b.html);
    expect(toLatex(a.model)).toBe(toLatex(b.model));
    expect(toCsv(a.model)).toBe(toCsv(b.model));
  });
});

describe('sandbox', () => {
  const tpl = (source: string): TableTemplate => ({
    manifest: {
      id: 'user',
      kind: 'table',
      version: 1,
      title: 't',
      method: 'x-ray',
      description: '',
    },
    source,
  });
  const base = () => loaded['1A8O.cif'];

  test('constructor and __proto__ access render nothing and report the line', () => {
    const attacks = [
      '<table><tbody>\n<tr><td>{{constructor.constructor}}</td></tr></tbody></table>',
      '<table><tbody>\n<tr><td>{{#with __proto__}}{{polluted}}{{/with}}</td></tr></tbody></table>',
      '<table><tbody>\n<tr><td>{{lookup this "constructor"}}</td></tr></tbody></table>',
    ];
    for (const source of attacks) {
      let err: unknown = null;
      let html = '';
      try {
        html = renderTableHtml({ ...base(), template: tpl(source) }).html;
      } catch (e) {
        err = e;
      }
      // either refused with a line number, or rendered with the property blocked (empty)
      if (err) {
        expect(err).toBeInstanceOf(TemplateError);
        expect((err as TemplateError).line).toBe(2);
      } else expect(html).not.toMatch(/function|native code|Object/);
    }
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });

  test('script in the template or a form value comes out inert', () => {
    const t = renderTableHtml({
      ...base(),
      form: { refinementProgram: '<script>alert(1)</script><img src=x onerror=alert(1)>' },
      template: tpl(
        '<table><caption><script>alert(2)</script>ok</caption><tbody><tr onclick="alert(3)"><td>{{val "refinementProgram"}}</td><td><a href="javascript:alert(4)">x</a></td></tr></tbody></table>',
      ),
    });
    // no live element: no script/img/a tag, no on* attribute inside a tag, no javascript: URL
    expect(t.html).not.toMatch(/<script|<img|<a[\s>]|<[a-z]+[^>]*\son\w+=|javascript:/i);
    expect(t.html).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
  });

  test('raw output, partials and unknown helpers are refused with the line', () => {
    expect(() =>
      renderTableHtml({ ...base(), template: tpl('<table>\n\n{{{val "rFree"}}}</table>') }),
    ).toThrow(/Line 3: "\{\{\{" is not allowed/);
    expect(() =>
      renderTableHtml({ ...base(), template: tpl('<table>\n{{> evil}}</table>') }),
    ).toThrow(/Line 2/);
    try {
      renderTableHtml({
        ...base(),
        template: tpl('<table>\n<tr>\n<td>{{exec "rm"}}</td></tr></table>'),
      });
      throw new Error('no error');
    } catch (e) {
      expect(e).toBeInstanceOf(TemplateError);
      expect((e as Error).message).toMatch(/line 3/);
    }
    try {
      renderTableHtml({ ...base(), template: tpl('<table>\n{{#if x}}\n</table>') });
      throw new Error('no error');
    } catch (e) {
      expect(e).toBeInstanceOf(TemplateError);
      expect((e as TemplateError).line).not.toBeNull();
    }
  });
});
