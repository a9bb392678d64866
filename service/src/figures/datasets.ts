/**
 * Report → the rows a figure template draws. Pure functions: the same report gives the same
 * rows in the same order (determinism of the SVG depends on it).
 */
import type { RamaClass, Report, ResidueRow } from '@foldfolio/shared';
import type { Dataset, FigureInput, RegionGrid } from './types.js';

const CLASS_TITLES: Record<RamaClass, string> = {
  general: 'General',
  gly: 'Gly',
  'trans-pro': 'trans-Pro',
  'cis-pro': 'cis-Pro',
  'pre-pro': 'pre-Pro',
  'ile-val': 'Ile/Val',
};
const CLASS_ORDER: RamaClass[] = ['general', 'gly', 'trans-pro', 'cis-pro', 'pre-pro', 'ile-val'];

export function residueLabel(r: ResidueRow): string {
  return `${r.chain} ${r.seq}${r.icode}${r.altloc ? ` ${r.altloc}` : ''} ${r.name}`;
}

function model(input: FigureInput): Report['models'][number] {
  const m = input.report.models[input.modelIndex ?? 0];
  if (!m)
    throw new Error(
      'The report has no model to draw; run the analysis again on a file with atoms.',
    );
  return m;
}

/** Residue class when the report has no verdict yet (same split as SCIENCE.md, Lovell et al. 2003). */
export function fallbackClass(
  r: ResidueRow,
  next: ResidueRow | undefined,
  cisBefore: boolean,
): RamaClass {
  const name = r.parent ?? r.name;
  if (name === 'GLY') return 'gly';
  if (name === 'PRO') return cisBefore ? 'cis-pro' : 'trans-pro';
  if (next && (next.parent ?? next.name) === 'PRO' && next.chain === r.chain) return 'pre-pro';
  if (name === 'ILE' || name === 'VAL') return 'ile-val';
  return 'general';
}
/**
 * Residues with both phi and psi, with their class and verdict: every model of an ensemble
 * unless `modelIndex` picks one; ensemble labels name the model ("A 57 GLY m3").
 */
export function torsionResidues(
  input: FigureInput,
): { row: ResidueRow; cls: RamaClass; verdict: string; label: string }[] {
  const models = input.modelIndex === undefined ? input.report.models : [model(input)];
  const out: { row: ResidueRow; cls: RamaClass; verdict: string; label: string }[] = [];
  for (const m of models) {
    const rows = m.residues;
    for (let i = 0; i < rows.length; i++) {
      const r = rows[i];
      if (r.phi === null || r.psi === null) continue;
      const prev = i > 0 ? rows[i - 1] : undefined;
      const cisBefore =
        !!prev && prev.chain === r.chain && prev.omega !== null && Math.abs(prev.omega) < 30;
      const cls = r.rama?.class ?? fallbackClass(r, rows[i + 1], cisBefore);
      const verdict = r.rama?.verdict ?? 'unclassified';
      const label = models.length > 1 ? `${residueLabel(r)} m${m.model}` : residueLabel(r);
      out.push({ row: r, cls, verdict, label });
    }
  }
  return out;
}

/** Cells of a region grid merged into runs along phi, and equal runs of neighbouring psi rows into one rectangle. */
export function gridRuns(
  grid: RegionGrid,
  level: number,
): { x0: number; x1: number; y0: number; y1: number }[] {
  const out: { x0: number; x1: number; y0: number; y1: number }[] = [];
  const { size, stepDeg, codes } = grid;
  // open rectangles keyed by their phi extent, extended while the next psi row has the same run
  let open = new Map<string, { x0: number; x1: number; y0: number; y1: number }>();
  for (let j = 0; j < size; j++) {
    const next = new Map<string, { x0: number; x1: number; y0: number; y1: number }>();
    let i = 0;
    while (i < size) {
      if (codes[i * size + j] >= level) {
        const start = i;
        while (i < size && codes[i * size + j] >= level) i++;
        const key = `${start}:${i}`;
        const prev = open.get(key);
        if (prev) {
          prev.y1 = -180 + (j + 1) * stepDeg;
          next.set(key, prev);
          open.delete(key);
        } else {
          const r = {
            x0: -180 + start * stepDeg,
            x1: -180 + i * stepDeg,
            y0: -180 + j * stepDeg,
            y1: -180 + (j + 1) * stepDeg,
          };
          out.push(r);
          next.set(key, r);
        }
      } else i++;
    }
    open = next;
  }
  return out;
}

/** Boundary segments of the cells with code ≥ level (the outline), merged along straight runs. */
export function gridOutline(
  grid: RegionGrid,
  level: number,
): { x0: number; y0: number; x1: number; y1: number }[] {
  const { size, stepDeg, codes } = grid;
  const inside = (i: number, j: number) =>
    i >= 0 && j >= 0 && i < size && j < size && codes[i * size + j] >= level;
  const segs: { x0: number; y0: number; x1: number; y1: number }[] = [];
  // vertical edges at phi boundary i (between cell i-1 and i), merged over consecutive j
  for (let i = 0; i <= size; i++) {
    let j = 0;
    while (j < size) {
      if (inside(i - 1, j) !== inside(i, j)) {
        const s = j;
        const side = inside(i, j);
        while (j < size && inside(i - 1, j) !== inside(i, j) && inside(i, j) === side) j++;
        const x = -180 + i * stepDeg;
        segs.push({ x0: x, y0: -180 + s * stepDeg, x1: x, y1: -180 + j * stepDeg });
      } else j++;
    }
  }
  for (let j = 0; j <= size; j++) {
    let i = 0;
    while (i < size) {
      if (inside(i, j - 1) !== inside(i, j)) {
        const s = i;
        const side = inside(i, j);
        while (i < size && inside(i, j - 1) !== inside(i, j) && inside(i, j) === side) i++;
        const y = -180 + j * stepDeg;
        segs.push({ x0: -180 + s * stepDeg, y0: y, x1: -180 + i * stepDeg, y1: y });
      } else i++;
    }
  }
  return segs;
}

function round(x: number, d = 2): number {
  const f = 10 ** d;
  return Math.round(x * f) / f;
}

// region shapes depend only on the (immutable) grid: computed once per grid, level and kind
const shapeCache = new WeakMap<
  RegionGrid,
  Map<string, { x0: number; x1: number; y0: number; y1: number }[]>
>();
function memo(
  grid: RegionGrid,
  level: number,
  fn: (g: RegionGrid, level: number) => { x0: number; x1: number; y0: number; y1: number }[],
): { x0: number; x1: number; y0: number; y1: number }[] {
  let m = shapeCache.get(grid);
  if (!m) shapeCache.set(grid, (m = new Map()));
  const key = `${fn.name}:${level}`;
  let v = m.get(key);
  if (!v) m.set(key, (v = fn(grid, level)));
  return v;
}

/** Torsion-angle figure: one union dataset, `kind` tells each layer its rows. */
export function torsionDataset(input: FigureInput, onlyClasses?: RamaClass[]): Dataset {
  const res = torsionResidues(input);
  const byClass = new Map<RamaClass, typeof res>();
  for (const r of res) {
    const list = byClass.get(r.cls) ?? [];
    list.push(r);
    byClass.set(r.cls, list);
  }
  const classes = CLASS_ORDER.filter((c) =>
    onlyClasses ? onlyClasses.includes(c) : (byClass.get(c)?.length ?? 0) > 0,
  );
  const rows: Dataset = [];
  classes.forEach((cls, order) => {
    const list = byClass.get(cls) ?? [];
    const outliers = list.filter((r) => r.verdict === 'outlier').length;
    // '|' breaks the panel title into two lines (the template's labelExpr splits on it)
    const panel = `${CLASS_TITLES[cls]}|${list.length} residue${list.length === 1 ? '' : 's'} · ${outliers} outlier${outliers === 1 ? '' : 's'}`;
    const base = { panel, order };
    // two invisible corner rows give every panel its axes even when it has no other rows
    rows.push(
      { ...base, kind: 'frame', phi: -180, psi: -180 },
      { ...base, kind: 'frame', phi: 180, psi: 180 },
    );
    const emp = input.reference?.empirical?.[cls];
    if (emp) {
      for (const r of memo(emp, 1, gridRuns)) rows.push({ ...base, kind: 'allowed', ...r });
      for (const r of memo(emp, 2, gridRuns)) rows.push({ ...base, kind: 'favored', ...r });
    }
    const ster = input.reference?.steric?.[cls];
    if (ster)
      for (const s of memo(ster, 1, gridOutline)) rows.push({ ...base, kind: 'steric', ...s });
    for (const r of list) {
      const kind =
        r.verdict === 'outlier'
          ? 'outlier'
          : r.verdict === 'allowed'
            ? 'allowed-residue'
            : 'residue';
      const phi = round(r.row.phi!);
      const psi = round(r.row.psi!);
      rows.push({ ...base, kind, phi, psi, label: r.label });
      if (kind === 'outlier') {
        // label towards the plot's centre line, so it never runs past the panel's edge
        const lx = phi > 0 ? phi - 16 : phi + 16;
        const ly = psi > 140 ? psi - 16 : psi + 16;
        rows.push({
          ...base,
          kind: 'label',
          phi,
          psi,
          lx,
          ly,
          align: phi > 0 ? 'right' : 'left',
          label: r.label,
        });
      }
    }
  });
  return rows;
}

const SS_GROUP: Record<string, string> = {
  H: 'helix',
  G: 'helix',
  I: 'helix',
  P: 'helix',
  E: 'strand',
  B: 'strand',
};

/** Per-residue strip: secondary-structure track, B line, outlier markers per kind. */
export function stripDataset(input: FigureInput): Dataset {
  const rows: Dataset = [];
  const res = model(input).residues.filter(
    (r) =>
      r.altloc === '' || r.altloc === 'A' || r.altloc === firstAltloc(r, model(input).residues),
  );
  const kinds: [string, (r: ResidueRow) => boolean][] = [
    ['Ramachandran', (r) => r.flags.includes('rama-outlier')],
    ['Rotamer', (r) => r.flags.includes('rotamer-outlier')],
    ['Bond/angle', (r) => r.flags.includes('bond-outlier') || r.flags.includes('angle-outlier')],
    ['Cβ', (r) => r.flags.includes('cb-deviation')],
    ['Overlap', (r) => r.flags.includes('severe-overlap')],
    ['cis/twisted', (r) => r.flags.includes('cis-peptide') || r.flags.includes('twisted-peptide')],
  ];
  let pos = 0;
  let lastChain = '';
  for (const r of res) {
    if (r.chain !== lastChain && lastChain !== '') pos += 3; // gap between chains
    lastChain = r.chain;
    pos++;
    const label = residueLabel(r);
    rows.push({ kind: 'ss', pos, ss: SS_GROUP[r.ss] ?? 'other', label });
    if (r.bMean !== null && r.bMean !== undefined)
      rows.push({ kind: 'b', pos, chain: r.chain, b: round(r.bMean, 1), label });
    for (const [k, test] of kinds) if (test(r)) rows.push({ kind: 'flag', pos, flag: k, label });
  }
  return rows;
}

function firstAltloc(r: ResidueRow, all: ResidueRow[]): string {
  const same = all.find((x) => x.chain === r.chain && x.seq === r.seq && x.icode === r.icode);
  return same ? same.altloc : r.altloc;
}

const CHI2_TYPES = [
  'ARG',
  'ASN',
  'ASP',
  'GLN',
  'GLU',
  'HIS',
  'ILE',
  'LEU',
  'LYS',
  'MET',
  'PHE',
  'TRP',
  'TYR',
];

/** chi1–chi2 pairs per residue type (types with both angles). */
export function chiDataset(input: FigureInput): Dataset {
  const rows: Dataset = [];
  for (const r of model(input).residues) {
    const name = r.parent ?? r.name;
    if (!CHI2_TYPES.includes(name)) continue;
    const c1 = r.chi[0];
    const c2 = r.chi[1];
    if (c1 === null || c1 === undefined || c2 === null || c2 === undefined) continue;
    rows.push({
      type: name,
      chi1: round(c1),
      chi2: round(c2),
      outlier: r.rotamer?.verdict === 'outlier',
      label: residueLabel(r),
    });
  }
  rows.sort((a, b) => String(a.type).localeCompare(String(b.type)));
  return rows;
}

/** |omega| per peptide with its category (common practice: cis < 30°, twisted 30–150°). */
export function omegaDataset(input: FigureInput): Dataset {
  const rows: Dataset = [];
  for (const r of model(input).residues) {
    if (r.omega === null) continue;
    const a = Math.abs(r.omega);
    rows.push({
      absOmega: round(a),
      category: a < 30 ? 'cis' : a < 150 ? 'twisted' : 'trans',
      label: residueLabel(r),
    });
  }
  return rows;
}

/** Largest bond and angle |Z| per residue. */
export function geometryZDataset(input: FigureInput): Dataset {
  const rows: Dataset = [];
  for (const r of model(input).residues) {
    if (r.bondZMax !== null && r.bondZMax !== undefined)
      rows.push({
        measure: 'Bond lengths',
        z: round(Math.abs(r.bondZMax)),
        label: residueLabel(r),
      });
    if (r.angleZMax !== null && r.angleZMax !== undefined)
      rows.push({
        measure: 'Bond angles',
        z: round(Math.abs(r.angleZMax)),
        label: residueLabel(r),
      });
  }
  return rows;
}

export function bGroupsDataset(input: FigureInput): Dataset {
  return model(input)
    .summary.bFactors.filter((g) => g.mean !== null)
    .map((g) => ({
      group: g.group,
      atoms: g.atoms,
      mean: round(g.mean!, 1),
      min: round(g.min ?? g.mean!, 1),
      max: round(g.max ?? g.mean!, 1),
    }));
}

function wrap(d: number): number {
  return ((((d + 180) % 360) + 360) % 360) - 180;
}

/** Two versions matched by chain, number, insertion code and altloc: backbone change and verdict changes. */
export function compareDataset(input: FigureInput): Dataset {
  if (!input.previous)
    throw new Error(
      'The comparison figure needs an earlier version; choose the version to compare with.',
    );
  const prev = new Map<string, ResidueRow>();
  for (const r of input.previous.models[0]?.residues ?? [])
    prev.set(`${r.chain}|${r.seq}|${r.icode}|${r.altloc}`, r);
  const rows: Dataset = [];
  let pos = 0;
  for (const r of model(input).residues) {
    const p = prev.get(`${r.chain}|${r.seq}|${r.icode}|${r.altloc}`);
    pos++;
    if (!p || r.phi === null || r.psi === null || p.phi === null || p.psi === null) continue;
    const shift = Math.hypot(wrap(r.phi - p.phi), wrap(r.psi - p.psi));
    const was = p.flags.includes('rama-outlier');
    const now = r.flags.includes('rama-outlier');
    const change = was && !now ? 'outlier fixed' : !was && now ? 'new outlier' : 'unchanged';
    rows.push({ pos, shift: round(shift), change, label: residueLabel(r) });
  }
  return rows;
}

export function datasetFor(kind: string, input: FigureInput): Dataset {
  switch (kind) {
    case 'torsion':
      return torsionDataset(input);
    case 'strip':
      return stripDataset(input);
    case 'chi':
      return chiDataset(input);
    case 'omega':
      return omegaDataset(input);
    case 'geometry-z':
      return geometryZDataset(input);
    case 'b-groups':
      return bGroupsDataset(input);
    case 'compare':
      return compareDataset(input);
    default:
      throw new Error(`Unknown figure data kind "${kind}"; check the template manifest.`);
  }
}
