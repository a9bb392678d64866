/**
 * Figures rendered from real entries (1A8O X-ray, 2OFG NMR ensemble, 5cvz low resolution),
 * checked with tools outside the project: Python's XML parser reads the SVG and counts marks,
 * poppler-utils (pdffonts, pdfinfo, pdftotext) read the PDF.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { buildReport, type Report } from '@foldfolio/shared';
import { svgToPdf, svgToPng } from '../src/figures/export.js';
import { compareDataset, gridOutline, gridRuns, torsionDataset } from '../src/figures/datasets.js';
import { figureReferenceForReport } from '../src/figures/figure-reference.js';
import { checkReadiness, deltaE, paletteConflicts, simulate } from '../src/figures/readiness.js';
import { renderFigure, type RenderedFigure } from '../src/figures/render.js';
import { listFigureTemplates, loadPreset } from '../src/figures/templates.js';
import { sharedVegaHost } from '../src/figures/vega-host.js';

const HERE = dirname(fileURLToPath(import.meta.url));
const ROOT = join(HERE, '../..');
const FIXTURES = join(ROOT, 'shared/test/fixtures');
const OUT = mkdtempSync(join(tmpdir(), 'foldfolio-figures-'));

const reports: Record<string, Report> = {};
const torsion: Record<string, RenderedFigure> = {};

beforeAll(async () => {
  for (const f of ['1A8O.cif', '2OFG.cif', '5cvz_final.pdb']) {
    reports[f] = await buildReport(new Uint8Array(readFileSync(join(FIXTURES, f))), {
      filename: f,
    });
    torsion[f] = await renderFigure({
      report: reports[f],
      templateId: 'torsion-plot',
      presetId: 'single',
    });
  }
});
afterAll(() => sharedVegaHost().close());

function python(script: string, args: string[]): Record<string, Record<string, unknown>> {
  return JSON.parse(
    execFileSync('/usr/bin/python3', [join(HERE, 'reference', script), ...args], {
      encoding: 'utf8',
      maxBuffer: 1 << 26,
    }),
  );
}

describe('torsion-angle figure', () => {
  test('SVG parses as XML (Python xml.etree), is 89 mm wide, and every residue with φ/ψ is exactly one mark', () => {
    const files = Object.entries(torsion).map(([f, fig]) => {
      const p = join(OUT, `${f}.torsion.svg`);
      writeFileSync(p, fig.svg);
      return [f, p] as const;
    });
    const checked = python(
      'svg_check.py',
      files.map(([, p]) => p),
    );
    for (const [f, p] of files) {
      const rec = checked[p] as {
        parses: boolean;
        width: string;
        height: string;
        viewBox: string;
        marks: Record<string, number>;
      };
      expect(rec.parses).toBe(true);
      expect(rec.width).toBe('89mm');
      const [, , w, h] = rec.viewBox.split(' ').map(Number);
      expect(parseFloat(rec.height)).toBeCloseTo((h / w) * 89, 2);
      // every model of an ensemble is drawn
      const rows = reports[f].models
        .flatMap((m) => m.residues)
        .filter((r) => r.phi !== null && r.psi !== null);
      const drawn =
        (rec.marks.residue_dot_marks ?? 0) +
        (rec.marks.residue_open_marks ?? 0) +
        (rec.marks.residue_outlier_marks ?? 0);
      expect([f, drawn]).toEqual([f, rows.length]);
      expect(rows.length).toBeGreaterThan(50);
    }
  });

  test('fonts are embedded and Greek letters are set in the Greek subset of Noto Serif', () => {
    const svg = torsion['1A8O.cif'].svg;
    for (const fam of ['Merriweather', 'Noto Serif', 'Noto Serif Greek'])
      expect(svg).toContain(`@font-face{font-family:"${fam}";src:url(data:font/woff;base64,`);
    // every φ/ψ sits in a run whose font has Greek glyphs
    const greek = [...svg.matchAll(/<tspan font-family="([^"]+)">([^<]*[φψ][^<]*)<\/tspan>/g)];
    expect(greek.length).toBeGreaterThanOrEqual(2);
    for (const m of greek) expect(m[1]).toBe('Noto Serif Greek');
    expect(svg).not.toMatch(/font-family="(Merriweather|Noto Serif)"[^>]*>[^<]*[φψ]/);
  });

  test('outliers are open diamonds labelled "chain number name"', () => {
    for (const [f, fig] of Object.entries(torsion)) {
      const many = reports[f].models.length > 1;
      for (const m of reports[f].models)
        for (const r of m.residues.filter(
          (x) => x.phi !== null && x.psi !== null && x.rama?.verdict === 'outlier',
        ))
          expect(fig.svg).toContain(
            `>${r.chain} ${r.seq}${r.icode}${r.altloc ? ` ${r.altloc}` : ''} ${r.name}${many ? ` m${m.model}` : ''}<`,
          );
    }
  });

  test('readiness passes for every preset', async () => {
    for (const preset of ['single', 'one-and-half', 'double']) {
      const fig = await renderFigure({
        report: reports['1A8O.cif'],
        templateId: 'torsion-plot',
        presetId: preset,
      });
      expect([preset, fig.readiness.issues]).toEqual([preset, []]);
      expect(fig.readiness.widthMm).toBe(loadPreset(preset).widthMm);
    }
  });
});

describe('region shapes (hand-worked grids)', () => {
  // 4×4 cells of 90°: an L of three cells, (i=0,j=0), (i=1,j=0), (i=0,j=1); i runs along φ
  const size = 4;
  const codes = new Uint8Array(size * size);
  codes[0 * size + 0] = 2;
  codes[1 * size + 0] = 2;
  codes[0 * size + 1] = 1;
  const grid = { stepDeg: 90, size, codes };

  test('filled rectangles cover exactly the cells at or above the level', () => {
    expect(gridRuns(grid, 2)).toEqual([{ x0: -180, x1: 0, y0: -180, y1: -90 }]);
    expect(gridRuns(grid, 1)).toEqual([
      { x0: -180, x1: 0, y0: -180, y1: -90 },
      { x0: -180, x1: -90, y0: -90, y1: 0 },
    ]);
  });

  test('the outline of the L has six straight edges and perimeter 8 cells', () => {
    const segs = gridOutline(grid, 1);
    expect(segs.length).toBe(6);
    const perimeter = segs.reduce((a, s) => a + Math.abs(s.x1 - s.x0) + Math.abs(s.y1 - s.y0), 0);
    expect(perimeter).toBe(8 * 90);
  });
});

describe('what the figures draw', () => {
  test('residues the engine calls favored sit inside drawn favored regions, outliers outside them', () => {
    let favored = 0;
    let inside = 0;
    for (const f of Object.keys(reports)) {
      const reference = figureReferenceForReport(reports[f]);
      expect(reference).not.toBeNull();
      const rows = torsionDataset({ report: reports[f], reference });
      const rects = rows.filter((r) => r.kind === 'favored') as {
        panel: string;
        x0: number;
        x1: number;
        y0: number;
        y1: number;
      }[];
      expect(rects.length).toBeGreaterThan(0);
      const inFavored = (panel: unknown, phi: number, psi: number) =>
        rects.some(
          (q) => q.panel === panel && phi >= q.x0 && phi <= q.x1 && psi >= q.y0 && psi <= q.y1,
        );
      for (const r of rows) {
        if (r.kind === 'residue') {
          const res = reports[f].models
            .flatMap((m) =>
              m.residues.map((x) => ({
                ...x,
                name: reports[f].models.length > 1 ? `${x.name} m${m.model}` : x.name,
              })),
            )
            .find(
              (x) =>
                `${x.chain} ${x.seq}${x.icode}${x.altloc ? ` ${x.altloc}` : ''} ${x.name}` ===
                r.label,
            );
          if (res?.rama?.verdict !== 'favored') continue;
          favored++;
          if (inFavored(r.panel, r.phi as number, r.psi as number)) inside++;
        }
        if (r.kind === 'outlier')
          expect([r.label, inFavored(r.panel, r.phi as number, r.psi as number)]).toEqual([
            r.label,
            false,
          ]);
      }
    }
    // the engine interpolates the density; the figure draws whole 2° cells: edges may differ
    expect(favored).toBeGreaterThan(100);
    expect(inside / favored).toBeGreaterThan(0.97);
  });

  test('comparing the same entry read from mmCIF and from PDB shows no backbone change (1A8O)', async () => {
    const pdb = await buildReport(new Uint8Array(readFileSync(join(FIXTURES, '1A8O.pdb'))), {
      filename: '1A8O.pdb',
    });
    const rows = compareDataset({ report: reports['1A8O.cif'], previous: pdb });
    expect(rows.length).toBeGreaterThan(50);
    for (const r of rows) expect([r.label, (r.shift as number) < 0.01]).toEqual([r.label, true]);
  });
});

describe('every template renders for the three fixtures', () => {
  test('each figure parses, has the preset width and passes the readiness check', async () => {
    const paths: string[] = [];
    for (const f of Object.keys(reports)) {
      for (const t of listFigureTemplates()) {
        const fig = await renderFigure({
          report: reports[f],
          previous: reports[f],
          templateId: t.manifest.id,
          presetId: 'single',
        });
        const p = join(OUT, `${f}.${t.manifest.id}.svg`);
        writeFileSync(p, fig.svg);
        paths.push(p);
        expect([f, t.manifest.id, fig.readiness.issues]).toEqual([f, t.manifest.id, []]);
      }
    }
    const checked = python('svg_check.py', paths);
    for (const p of paths)
      expect([p, checked[p].parses, checked[p].width]).toEqual([p, true, '89mm']);
  });
});

describe('PDF and PNG', () => {
  let pdfPaths: Record<string, string> = {};
  beforeAll(async () => {
    const r = reports['1A8O.cif'];
    pdfPaths = {};
    for (const id of ['torsion-plot', 'chi-density', 'omega-histogram', 'b-factor-groups']) {
      const fig = await renderFigure({ report: r, templateId: id, presetId: 'one-and-half' });
      const p = join(OUT, `${id}.pdf`);
      writeFileSync(p, await svgToPdf(fig.svg));
      pdfPaths[id] = p;
    }
  });

  test('pdffonts lists every font as embedded', () => {
    for (const p of Object.values(pdfPaths)) {
      const lines = execFileSync('pdffonts', [p], { encoding: 'utf8' }).trim().split('\n').slice(2);
      expect(lines.length).toBeGreaterThan(0);
      // columns: name type encoding emb sub uni object ID (poppler-utils)
      for (const l of lines) expect(l.split(/\s+/).slice(-5)[0]).toBe('yes');
    }
  });

  test('pdfinfo page size equals the preset to 0.1 mm', () => {
    const info = execFileSync('pdfinfo', [pdfPaths['torsion-plot']], { encoding: 'utf8' });
    const m = /Page size:\s+([\d.]+) x ([\d.]+) pts/.exec(info)!;
    expect(Math.abs((Number(m[1]) / 72) * 25.4 - 120)).toBeLessThan(0.1);
  });

  test('pdftotext finds φ, ψ, χ, ω, ° and Å', () => {
    const text = Object.values(pdfPaths)
      .map((p) => execFileSync('pdftotext', [p, '-'], { encoding: 'utf8' }))
      .join('\n');
    for (const s of ['φ', 'ψ', 'χ', 'ω', '°', 'Å'])
      expect([s, text.includes(s)]).toEqual([s, true]);
  });

  test('PNG has the width in pixels the dpi asks for', () => {
    const png = svgToPng(torsion['1A8O.cif'].svg, 300);
    expect(png.subarray(1, 4).toString('latin1')).toBe('PNG');
    // IHDR width, big-endian at byte 16 (PNG specification, ISO/IEC 15948)
    expect(png.readUInt32BE(16)).toBe(Math.round((89 / 25.4) * 300));
    // Pillow (Debian python3-pil) reads the size and the dpi we wrote
    const p = join(OUT, 'torsion.png');
    writeFileSync(p, png);
    const info = JSON.parse(
      execFileSync(
        '/usr/bin/python3',
        [
          '-c',
          'import sys,json;from PIL import Image;im=Image.open(sys.argv[1]);im.load();print(json.dumps({"size":im.size,"dpi":im.info.get("dpi")}))',
          p,
        ],
        { encoding: 'utf8' },
      ),
    );
    expect(info.size[0]).toBe(Math.round((89 / 25.4) * 300));
    expect(info.dpi[0]).toBeCloseTo(300, 0);
  });
});

describe('determinism', () => {
  test('the CLI run twice in separate processes writes identical SVG and PDF bytes', () => {
    const cli = join(ROOT, 'service/dist/cli/main.js');
    expect(existsSync(cli)).toBe(true); // scripts/test.sh builds first; else run `npm run build`
    const dirs = [1, 2].map((i) => join(OUT, `run${i}`));
    for (const d of dirs) {
      const r = spawnSync(
        process.execPath,
        [
          cli,
          'figures',
          join(FIXTURES, '1A8O.cif'),
          '--out',
          d,
          '--template',
          'torsion-plot',
          '--template',
          'residue-strip',
          '--format',
          'svg,pdf',
        ],
        { encoding: 'utf8' },
      );
      expect([r.status, r.stderr]).toEqual([0, '']);
    }
    for (const name of [
      'torsion-plot.single.svg',
      'torsion-plot.single.pdf',
      'residue-strip.single.svg',
    ]) {
      expect(readFileSync(join(dirs[0], name)).equals(readFileSync(join(dirs[1], name)))).toBe(
        true,
      );
    }
  });
});

describe('readiness check names the offending element', () => {
  const preset = loadPreset('single');
  test('text under 6 pt and lines under 0.25 pt at print size', () => {
    const svg = torsion['1A8O.cif'].svg
      .replace('font-size="6.5px"', 'font-size="3px"')
      .replace('stroke-width="0.5"', 'stroke-width="0.1"');
    const r = checkReadiness(svg, preset);
    expect(r.ok).toBe(false);
    expect(
      r.issues.some(
        (i) => i.check === 'font' && /axis/.test(i.element) && /3\.00 pt/.test(i.message),
      ),
    ).toBe(true);
    expect(r.issues.some((i) => i.check === 'line' && /0\.100 pt/.test(i.message))).toBe(true);
  });

  test('a character no shipped font draws is reported with its text', () => {
    const svg = torsion['1A8O.cif'].svg.replace('>φ<', '>√φ<');
    const issues = checkReadiness(svg, preset).issues.filter((i) => i.check === 'glyph');
    expect(issues.length).toBe(1);
    expect(issues[0].message).toMatch(/uses √/);
  });

  test('a width other than the preset is reported', () => {
    const svg = torsion['1A8O.cif'].svg.replace('width="89mm"', 'width="100mm"');
    expect(checkReadiness(svg, preset).issues.map((i) => i.check)).toContain('size');
  });

  test('red and green collapse under deuteranopia and protanopia but not in normal vision (red–green deficiency: fact of the trade)', () => {
    const normal = deltaE(simulate('#D00000', 'normal'), simulate('#00A000', 'normal'));
    const deut = deltaE(simulate('#D00000', 'deuteranopia'), simulate('#00A000', 'deuteranopia'));
    expect(normal).toBeGreaterThan(50);
    expect(deut).toBeLessThan(normal / 2);
    expect(paletteConflicts(['#CC3333', '#33AA33']).length).toBeGreaterThanOrEqual(0);
    // blue vs yellow stays apart for red–green deficiencies; tritanopia is the blue–yellow one
    expect(
      deltaE(simulate('#0072B2', 'deuteranopia'), simulate('#F0E442', 'deuteranopia')),
    ).toBeGreaterThan(40);
  });

  test('a saturated colour of our own in a data mark is checked too, and named', () => {
    // residues in a yellow-green beside the vermilion outliers: a red–green confusion pair
    const svg = torsion['2OFG.cif'].svg.replace(/#1F2A44/g, '#66AA00');
    const issues = checkReadiness(svg, preset).issues.filter((i) => i.check === 'palette');
    expect(issues.length).toBeGreaterThan(0);
    expect(issues.map((i) => i.element)).toContain('#66AA00 / #D55E00');
    expect(issues[0].message).toMatch(/deuteranopia|protanopia/);
  });

  test('the colours the figures use from the Okabe–Ito palette (Okabe & Ito 2008) stay apart', () => {
    const p = preset.palette;
    expect(
      paletteConflicts([p.vermilion, p.blue, p.orange, p.skyBlue, p.bluishGreen, preset.tones.ink]),
    ).toEqual([]);
  });
});

describe('bad parameters', () => {
  test('an unknown parameter or a value out of range gets a sentence saying what to use', async () => {
    await expect(
      renderFigure({
        report: reports['1A8O.cif'],
        templateId: 'torsion-plot',
        presetId: 'single',
        params: { nope: 1 },
      }),
    ).rejects.toThrow(/has no parameter "nope"; use one of markSize/);
    await expect(
      renderFigure({
        report: reports['1A8O.cif'],
        templateId: 'torsion-plot',
        presetId: 'single',
        params: { markSize: 1000 },
      }),
    ).rejects.toThrow(/between 2 and 60/);
    await expect(
      renderFigure({ report: reports['1A8O.cif'], templateId: 'torsion-plot', presetId: 'a4' }),
    ).rejects.toThrow(/There is no preset "a4"; choose one of/);
  });
});
