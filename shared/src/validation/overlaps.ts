/**
 * All-atom steric overlaps (Word et al. 1999, J Mol Biol 285:1711): riding hydrogens are added
 * where absent, then every non-bonded atom pair is tested against the sum of Bondi 1964 van der
 * Waals radii. overlap = r_a + r_b − d; a *severe* overlap is ≥ 0.4 Å (Word et al. 1999).
 *
 * Choices (stated in DEVELOPERS.md):
 *  - Hydrogens: electron-cloud X–H lengths by default (X-ray convention; `xhConvention` selects).
 *  - Exclusions: atoms up to three bonds apart (1–2, 1–3 and 1–4, which covers the peptide 1–4
 *    pairs and the para atoms of rings); bonds from distances (covalent radii of Cordero et al.
 *    2008 + 0.4 Å, common practice) and, for added H, their parent.
 *  - Hydrogen bonds: a polar H (on N or O) and an N/O acceptor may overlap by 0.8 Å more, and
 *    N/O···N/O heavy-atom pairs by 0.5 Å more (our allowances: a 1.9 Å H···O bond is a 0.8 Å
 *    raw overlap with electron-cloud radii), so normal H-bonds are never called clashes.
 *    Reported overlaps are beyond the allowance.
 *  - Metal ions and atoms of unknown element take no part (coordination is not a clash); atoms of
 *    different alternate locations never meet.
 *  - Neighbour search on the cell grid (`geometry/grid.ts`), linear in the number of atoms.
 *
 * Pure TypeScript, no Node or DOM APIs.
 */
import { STANDARD_AMINO_ACIDS as READER_STANDARD_AMINO_ACIDS } from '../io/residue-tables';
import type { Model, Structure } from '../model/types';
import { ResidueKind } from '../model/types';
import type { ConformerTable } from '../model/conformers';
import type { Overlap } from '../report/types';
import { buildCellGrid, cellBox, type CellGrid } from '../geometry/grid';
import {
  addRidingHydrogens,
  El,
  OVERLAP_XH_CONVENTION,
  XH_LENGTHS_A,
  type AllAtomModel,
  type XhConvention,
} from './hydrogens';

/** Bondi 1964 (J Phys Chem 68:441) van der Waals radii, Å (from memory, SCIENCE.md), by El code. */
export const BONDI_RADII_A: Readonly<Record<number, number>> = {
  [El.H]: 1.2,
  [El.C]: 1.7,
  [El.N]: 1.55,
  [El.O]: 1.52,
  [El.S]: 1.8,
  [El.Se]: 1.9,
  [El.P]: 1.8,
};

/** The 20 standard amino acids: the reader's list without SEC and PYL, whose side-chain links
 * are treated like those of other non-standard residues. */
const STANDARD_AMINO_ACIDS: ReadonlySet<string> = new Set(
  [...READER_STANDARD_AMINO_ACIDS].filter((n) => n !== 'SEC' && n !== 'PYL'),
);

/** Covalent radii, Å (Cordero et al. 2008, Dalton Trans 2832; from memory), by El code. */
const COVALENT_RADII_A: Readonly<Record<number, number>> = {
  [El.H]: 0.31,
  [El.C]: 0.76,
  [El.N]: 0.71,
  [El.O]: 0.66,
  [El.S]: 1.05,
  [El.Se]: 1.2,
  [El.P]: 1.07,
};
const BOND_TOLERANCE_A = 0.4; // common practice, no source

export const SEVERE_OVERLAP_A = 0.4; // Word et al. 1999
/** pairs at most this many bonds apart are never overlaps (1–2, 1–3, 1–4) */
export const EXCLUDED_BONDS = 3;
/** the same for pairs with a hydrogen (1–5 too; Word et al. 1999, from memory) */
export const H_EXCLUDED_BONDS = 4;
export const HBOND_H_ALLOWANCE_A = 0.8; // our choice, see header
export const HBOND_HEAVY_ALLOWANCE_A = 0.5; // our choice, see header
/**
 * O···C pairs four bonds apart (1–5) are set by two torsions and are short in ordinary
 * structures: O(i)···C(i+1) across the peptide in helices and Asn/Asp OD1···C within a residue
 * (the n→π* contact, about 2.8–3.0 Å, Bartlett et al. 2010 Nat Chem Biol 6:615, from memory;
 * measured 2.69–2.80 Å in 1EJG at 0.54 Å, 2.68 Å in 1OLR Asn 99). The classic hard-sphere outer
 * limit for O···C is 2.7 Å (Ramachandran & Sasisekharan 1968, SCIENCE.md), 0.52 Å inside the
 * Bondi sum: our allowance 0.5 Å, the same as for N/O···N/O.
 */
export const CARBONYL_1_5_ALLOWANCE_A = 0.5;

export interface OverlapPair {
  a: number;
  b: number;
  /** overlap beyond the H-bond allowance (raw overlap for non-H-bond pairs), Å */
  overlapA: number;
}

export interface OverlapAnalysis {
  all: AllAtomModel;
  /** atoms taking part (model atoms minus ions/unknown elements, plus added H) */
  atomsAnalysed: number;
  severe: OverlapPair[];
  perThousandAtoms: number;
  hydrogens: 'deposited' | 'added' | 'mixed';
  xhConvention: XhConvention;
}

export interface OverlapOptions {
  xhConvention?: XhConvention;
  table?: ConformerTable;
  /** severe threshold in Å (default 0.4, Word et al. 1999) */
  severeA?: number;
}

/** Growable list of index pairs, stored interleaved (one call per pair on the hot path). */
class PairList {
  data: Int32Array;
  /** number of pairs */
  length = 0;
  /** `capacity` in pairs: the expected count (typed arrays this large are costly to regrow) */
  constructor(capacity = 1024) {
    this.data = new Int32Array(2 * Math.max(16, capacity));
  }
  push(a: number, b: number): void {
    let k = this.length * 2;
    if (k === this.data.length) {
      const d = new Int32Array(this.data.length * 2);
      d.set(this.data);
      this.data = d;
    }
    this.data[k++] = a;
    this.data[k] = b;
    this.length++;
  }
}

/** Growable Int32 list. */
class IntList {
  data: Int32Array;
  length = 0;
  /** `capacity`: the expected size, so large lists are not grown (and copied) step by step */
  constructor(capacity = 1024) {
    this.data = new Int32Array(Math.max(16, capacity));
  }
  push(v: number): void {
    if (this.length === this.data.length) {
      const d = new Int32Array(this.data.length * 2);
      d.set(this.data);
      this.data = d;
    }
    this.data[this.length++] = v;
  }
}

/**
 * Deposited H move by at most this much when set to the analysis X–H length (nuclear 1.10 Å
 * C–H to 0.93 Å aromatic is 0.17 Å): contact searches for pairs with H reach this much further,
 * because bonds and candidates are found before the move.
 */
const H_MOVE_MARGIN_A = 0.2;

/**
 * Deposited hydrogens come at either X–H convention (1EJG's at nuclear lengths, C–H 1.10 Å
 * measured with gemmi; 1OLR's at electron-cloud lengths): each is moved along its bond to the
 * length the analysis uses for added H, so both kinds meet the same radii (a nuclear C–H is
 * 0.12 Å longer, which turns ordinary H···H contacts into "severe" overlaps). The H keeps its
 * direction (a refined methyl or hydroxyl orientation stays as deposited). Parent: the nearest
 * bonded heavy atom; C–H length by the parent's H count (3 methyl, 2 methylene) or, with one H,
 * by its heavy neighbours (3: tertiary sp3, else sp2).
 */
function rescaleDepositedHydrogens(
  conv: XhConvention,
  hIdx: Int32Array,
  adjStart: Int32Array,
  adj: Int32Array,
  xs: Float64Array,
  ys: Float64Array,
  zs: Float64Array,
  el: Uint8Array,
  fromModel: Uint8Array,
): void {
  const t = XH_LENGTHS_A[conv];
  for (let q = 0; q < hIdx.length; q++) {
    const h = hIdx[q];
    if (fromModel[h] !== 1) continue;
    let p = -1;
    let best = Infinity;
    for (let e = adjStart[h]; e < adjStart[h + 1]; e++) {
      const a = adj[e];
      if (el[a] === El.H) continue;
      const d2 = (xs[a] - xs[h]) ** 2 + (ys[a] - ys[h]) ** 2 + (zs[a] - zs[h]) ** 2;
      if (d2 < best) {
        best = d2;
        p = a;
      }
    }
    if (p < 0) continue;
    let len: number;
    if (el[p] === El.N) len = t.N;
    else if (el[p] === El.O) len = t.O;
    else if (el[p] === El.S || el[p] === El.Se) len = t.S;
    else if (el[p] === El.C) {
      let nh = 0;
      let heavy = 0;
      for (let e = adjStart[p]; e < adjStart[p + 1]; e++)
        if (el[adj[e]] === El.H) nh++;
        else heavy++;
      len =
        nh >= 3 ? t['C-methyl'] : nh === 2 ? t['C-tet2'] : heavy >= 3 ? t['C-tet1'] : t['C-tri1'];
    } else continue;
    const d = Math.sqrt(best);
    if (d === 0) continue;
    xs[h] = xs[p] + ((xs[h] - xs[p]) / d) * len;
    ys[h] = ys[p] + ((ys[h] - ys[p]) / d) * len;
    zs[h] = zs[p] + ((zs[h] - zs[p]) / d) * len;
  }
}

export function analyzeOverlaps(
  structure: Structure,
  model: Model,
  options: OverlapOptions = {},
): OverlapAnalysis {
  const conv = options.xhConvention ?? OVERLAP_XH_CONVENTION;
  const severeA = options.severeA ?? SEVERE_OVERLAP_A;
  const all = addRidingHydrogens(structure, model, conv, options.table);
  const n = all.count;
  const kind = model.residues.kind;
  // atoms taking part
  const subset = new IntList(n);
  // occupancy of each all-atom entry (added H: their parent's)
  const occOf = (i: number): number =>
    model.atoms.occupancy[i < all.modelAtoms ? i : all.parent[i]];
  for (let i = 0; i < n; i++) {
    if (all.element[i] === El.Other) continue;
    if (kind[all.residue[i]] === ResidueKind.Ion) continue;
    // zero occupancy: the depositor says the atom is not there (common practice, no source)
    if (occOf(i) <= 0) continue;
    // Water hydrogens: X-ray data rarely fix a water's orientation, and written ones point
    // anywhere (1OLR: water H 1.1–1.3 Å from amide H). The water O stands for the molecule and
    // meets donors and acceptors with the H-bond allowances.
    if (all.element[i] === El.H && kind[all.residue[i]] === ResidueKind.Water) continue;
    subset.push(i);
  }
  const sub = subset.data.subarray(0, subset.length);
  const m = sub.length;
  // Indices below are into the atoms taking part ("local"); `perm` maps back to the all-atom
  // set. (An extra reordering of all atoms by grid cell used to give the pair loops memory
  // locality at 1M atoms; the grids' own cell-ordered coordinate copies do that now, and the
  // reordering cost more than it saved: 1M-atom overlap step 5.1-5.9 s with it, 4.4-4.8 s
  // without.)
  const perm = sub;
  const local = new Int32Array(n).fill(-1);
  const xs = new Float64Array(m);
  const ys = new Float64Array(m);
  const zs = new Float64Array(m);
  const el = new Uint8Array(m);
  const alt = new Int32Array(m);
  const res = new Int32Array(m);
  for (let k = 0; k < m; k++) {
    const i = perm[k];
    local[i] = k;
    xs[k] = all.x[i];
    ys[k] = all.y[i];
    zs[k] = all.z[i];
    el[k] = all.element[i];
    alt[k] = all.altloc[i];
    res[k] = all.residue[i];
  }
  const fromModel = new Uint8Array(m);
  for (let k = 0; k < m; k++) fromModel[k] = perm[k] < all.modelAtoms ? 1 : 0;
  // 1 for partially occupied atoms (occupancy < 1), 1 for water atoms
  const partial = new Uint8Array(m);
  const water = new Uint8Array(m);
  for (let k = 0; k < m; k++) {
    partial[k] = occOf(perm[k]) < 1 ? 1 : 0;
    water[k] = kind[res[k]] === ResidueKind.Water ? 1 : 0;
  }
  // Standard residue names: links between these are peptide C–N and S–S only.
  const stdRes = new Uint8Array(model.residues.count);
  for (let r = 0; r < model.residues.count; r++)
    stdRes[r] = STANDARD_AMINO_ACIDS.has(structure.strings[model.residues.name[r]]) ? 1 : 0;

  // One pass over pairs within the largest severe-contact distance: record covalent bonds
  // (distance rule) and candidate overlaps (raw overlap ≥ the severe threshold).
  // expected sizes (reference set: about 1.1 bonds and 1.4 candidate pairs per atom)
  const bonds = new PairList(Math.ceil(m * 1.2));
  const cands = new PairList(Math.ceil(m * 1.5));
  // only deposited H move (below), so only models with deposited H need the wider search
  const hMargin = all.depositedHydrogens > 0 ? H_MOVE_MARGIN_A : 0;
  // Search radii from the elements present (most models have no Se: 3.2 Å instead of 3.4 Å for
  // heavy pairs, a sixth fewer distance tests); never below a bond limit, so bonds are found.
  let heavyBondi = BONDI_RADII_A[El.C];
  let heavyCov = COVALENT_RADII_A[El.C];
  const seen = new Uint8Array(8);
  for (let k = 0; k < m; k++) seen[el[k]] = 1;
  for (let e = 2; e < 8; e++)
    if (seen[e] === 1) {
      heavyBondi = Math.max(heavyBondi, BONDI_RADII_A[e]);
      heavyCov = Math.max(heavyCov, COVALENT_RADII_A[e]);
    }
  const maxContact = Math.max(2 * heavyBondi - severeA, 2 * heavyCov + BOND_TOLERANCE_A);
  // 8 × 8 tables by element code: squared bond limit and squared severe-contact distance.
  const bondLim2 = new Float64Array(64);
  const contact2 = new Float64Array(64);
  for (let a = 1; a < 8; a++)
    for (let b = 1; b < 8; b++) {
      const lim = (COVALENT_RADII_A[a] ?? 0) + (COVALENT_RADII_A[b] ?? 0) + BOND_TOLERANCE_A;
      bondLim2[a * 8 + b] = a === El.H && b === El.H ? 0 : lim * lim;
      const margin = (a === El.H ? hMargin : 0) + (b === El.H ? hMargin : 0);
      const c = (BONDI_RADII_A[a] ?? 0) + (BONDI_RADII_A[b] ?? 0) - severeA + margin;
      contact2[a * 8 + b] = c > 0 ? c * c : 0;
    }
  const visit = (i: number, j: number, d2: number): void => {
    if (alt[i] !== 0 && alt[j] !== 0 && alt[i] !== alt[j]) return;
    const pe = el[i] * 8 + el[j];
    if (d2 < bondLim2[pe] && fromModel[i] === 1 && fromModel[j] === 1) {
      // added H bond only to their parent (below)
      let bonded = true;
      const ri = res[i];
      const rj = res[j];
      if (ri !== rj) {
        // Between residues only real links count as bonds: peptide C–N, disulfide S–S, and
        // links to ligands or nucleic acids; never waters (a water pushed into a residue is a
        // clash, not a bond).
        const ki = kind[ri];
        const kj = kind[rj];
        const ei = el[i];
        const ej = el[j];
        if (ki === ResidueKind.Water || kj === ResidueKind.Water) bonded = false;
        else if (ki === ResidueKind.Protein && kj === ResidueKind.Protein) {
          const peptide = (ei === El.C && ej === El.N) || (ei === El.N && ej === El.C);
          const disulfide = ei === El.S && ej === El.S;
          // non-standard residues link through side chains too (esters and thioethers of
          // cyclic depsipeptides, e.g. 1PFE)
          const standard = stdRes[ri] === 1 && stdRes[rj] === 1;
          if (!peptide && !disulfide && standard) bonded = false;
        }
      }
      if (bonded) {
        bonds.push(i, j);
        return;
      }
    }
    if (d2 <= contact2[pe]) {
      cands.push(i, j);
    }
  };
  // Heavy–heavy pairs within the largest heavy contact; pairs with H need much shorter cutoffs
  // (H···Se 1.2 + 1.9 − 0.4 = 2.7 Å, H···H 2.0 Å), so they are searched separately: about half
  // the distance tests of one search at the heavy cutoff.
  let nHyd = 0;
  for (let k = 0; k < m; k++) if (el[k] === El.H) nHyd++;
  const heavy = new IntList(m - nHyd);
  const hyd = new IntList(nHyd);
  for (let k = 0; k < m; k++) (el[k] === El.H ? hyd : heavy).push(k);
  const heavyIdx = heavy.data.subarray(0, heavy.length);
  const hIdx = hyd.data.subarray(0, hyd.length);
  // The grid walks below are copies of geometry/grid.ts's forEachPairWithin/forEachWithin (same
  // visiting order, so the same bond lists): here the call to `visit` has one target and V8
  // inlines it, where the shared walks call many modules' callbacks and cannot (about a third of
  // the overlap step's time on the reference set).
  // Coordinates copied into each grid's cell order, so the distance tests read memory in order
  // without going through the atom index (the index is looked up only for pairs within range).
  const cellOrdered = (grid: CellGrid): [Float64Array, Float64Array, Float64Array] => {
    const c = grid.cellAtoms;
    const gx = new Float64Array(c.length);
    const gy = new Float64Array(c.length);
    const gz = new Float64Array(c.length);
    for (let k = 0; k < c.length; k++) {
      gx[k] = xs[c[k]];
      gy[k] = ys[c[k]];
      gz[k] = zs[c[k]];
    }
    return [gx, gy, gz];
  };
  const pairsWithin = (
    grid: CellGrid,
    [gx, gy, gz]: [Float64Array, Float64Array, Float64Array],
    radiusA: number,
  ): void => {
    const { nx, ny, nz, cellStart, cellAtoms } = grid;
    const r2 = radiusA * radiusA;
    const reach = Math.ceil(radiusA / grid.cellSizeA);
    // The cells of one grid row (fixed y, z) hold consecutive atoms, so each neighbouring row is
    // one run of atoms: [first atom of cell x − reach, last atom of cell x + reach]. In the own
    // row only cells x .. x + reach are taken, starting after atom k (each pair once).
    for (let cz = 0; cz < nz; cz++) {
      for (let cy = 0; cy < ny; cy++) {
        for (let cx = 0; cx < nx; cx++) {
          const c = (cz * ny + cy) * nx + cx;
          const s = cellStart[c];
          const e = cellStart[c + 1];
          if (s === e) continue;
          const xLo = cx - reach < 0 ? 0 : cx - reach;
          const xHi = cx + reach >= nx ? nx - 1 : cx + reach;
          for (let dz = 0; dz <= reach; dz++) {
            const oz = cz + dz;
            if (oz >= nz) break;
            for (let dy = dz === 0 ? 0 : -reach; dy <= reach; dy++) {
              const oy = cy + dy;
              if (oy < 0 || oy >= ny) continue;
              const row = (oz * ny + oy) * nx;
              const own = dz === 0 && dy === 0;
              const qs = own ? -1 : cellStart[row + xLo];
              const qe = cellStart[row + xHi + 1];
              for (let k = s; k < e; k++) {
                const ax = gx[k];
                const ay = gy[k];
                const az = gz[k];
                for (let q = own ? k + 1 : qs; q < qe; q++) {
                  const ddx = gx[q] - ax;
                  const ddy = gy[q] - ay;
                  const ddz = gz[q] - az;
                  const d2 = ddx * ddx + ddy * ddy + ddz * ddz;
                  if (d2 <= r2) {
                    const a = cellAtoms[k];
                    const b = cellAtoms[q];
                    if (a < b) visit(a, b, d2);
                    else visit(b, a, d2);
                  }
                }
              }
            }
          }
        }
      }
    }
  };
  const box = new Float64Array(6);
  /** visit(h, a, d2) for every atom a of `grid` within radiusA of atom h, in cell order */
  const around = (
    grid: CellGrid,
    [gx, gy, gz]: [Float64Array, Float64Array, Float64Array],
    h: number,
    radiusA: number,
  ): void => {
    const { nx, ny, cellStart, cellAtoms } = grid;
    const px = xs[h];
    const py = ys[h];
    const pz = zs[h];
    const r2 = radiusA * radiusA;
    if (!cellBox(grid, px, py, pz, radiusA, box)) return;
    const x0 = box[0];
    const x1 = box[1];
    // cells x0..x1 of a row hold consecutive atoms: one run per row
    for (let cz = box[4]; cz <= box[5]; cz++) {
      for (let cy = box[2]; cy <= box[3]; cy++) {
        const row = (cz * ny + cy) * nx;
        for (let k = cellStart[row + x0], e = cellStart[row + x1 + 1]; k < e; k++) {
          const dx = gx[k] - px;
          const dy = gy[k] - py;
          const dz = gz[k] - pz;
          const d2 = dx * dx + dy * dy + dz * dz;
          if (d2 <= r2) visit(h, cellAtoms[k], d2);
        }
      }
    }
  };
  const heavyGrid = buildCellGrid(xs, ys, zs, { subset: heavyIdx, cellSizeA: maxContact });
  const heavyCoords = cellOrdered(heavyGrid);
  pairsWithin(heavyGrid, heavyCoords, maxContact);
  const hHeavyCut = Math.max(
    BONDI_RADII_A[El.H] + heavyBondi - severeA + hMargin,
    COVALENT_RADII_A[El.H] + heavyCov + BOND_TOLERANCE_A,
  );
  const hHCut = Math.max(2 * BONDI_RADII_A[El.H] - severeA + 2 * hMargin, 0);
  if (hIdx.length > 0) {
    const hGrid = buildCellGrid(xs, ys, zs, { subset: hIdx, cellSizeA: hHeavyCut });
    pairsWithin(hGrid, cellOrdered(hGrid), hHCut);
    for (let q = 0; q < hIdx.length; q++) around(heavyGrid, heavyCoords, hIdx[q], hHeavyCut);
  }
  for (let h = all.modelAtoms; h < n; h++) {
    const a = local[h];
    const b = local[all.parent[h]];
    if (a >= 0 && b >= 0) {
      bonds.push(a, b);
    }
  }
  const deg = new Int32Array(m + 1);
  const bd = bonds.data;
  for (let k = 0; k < bonds.length; k++) {
    deg[bd[2 * k] + 1]++;
    deg[bd[2 * k + 1] + 1]++;
  }
  for (let i = 0; i < m; i++) deg[i + 1] += deg[i];
  const adjStart = deg;
  const adj = new Int32Array(adjStart[m]);
  const fill = adjStart.slice(0, m);
  for (let k = 0; k < bonds.length; k++) {
    const a = bd[2 * k];
    const b = bd[2 * k + 1];
    adj[fill[a]++] = b;
    adj[fill[b]++] = a;
  }
  rescaleDepositedHydrogens(conv, hIdx, adjStart, adj, xs, ys, zs, el, fromModel);
  for (let q = 0; q < hIdx.length; q++) {
    const k = hIdx[q];
    if (fromModel[k] === 1) {
      all.x[perm[k]] = xs[k];
      all.y[perm[k]] = ys[k];
      all.z[perm[k]] = zs[k];
    }
  }
  /** the number of bonds between i and j when at most four, else 5 (nested walk, early exit) */
  const bondsApart = (i: number, j: number): number => {
    let best = 5;
    for (let p = adjStart[i]; p < adjStart[i + 1]; p++) {
      const a = adj[p];
      if (a === j) return 1;
      for (let q = adjStart[a]; q < adjStart[a + 1]; q++) {
        const b = adj[q];
        if (b === j) return 2;
        if (b === i || best <= 3) continue;
        for (let r = adjStart[b]; r < adjStart[b + 1]; r++) {
          const c = adj[r];
          if (c === j) {
            best = 3;
            break;
          }
          if (c === a || best <= 4) continue;
          for (let u = adjStart[c]; u < adjStart[c + 1]; u++)
            if (adj[u] === j) {
              best = 4;
              break;
            }
        }
      }
    }
    return best;
  };
  /** polar H: bonded to N or O */
  const polarH = (i: number): boolean => {
    if (el[i] !== El.H) return false;
    for (let p = adjStart[i]; p < adjStart[i + 1]; p++)
      if (el[adj[p]] === El.N || el[adj[p]] === El.O) return true;
    return false;
  };
  const isNO = (e: number) => e === El.N || e === El.O;
  const isOC = (i: number, j: number): boolean =>
    (el[i] === El.O && el[j] === El.C) || (el[i] === El.C && el[j] === El.O);

  const severe: OverlapPair[] = [];
  const cd = cands.data;
  for (let c = 0; c < cands.length; c++) {
    const i = cd[2 * c];
    const j = cd[2 * c + 1];
    // A water next to a partially occupied atom (or a partially occupied water) is an
    // alternative site: of another water (often written without altloc ids, e.g. 1OLR HOH
    // 2140/2142, 0.7 Å apart) or of a side-chain conformer (1OLR HOH 2126, 1.3 Å from Lys 69
    // NZ of altloc A at occupancy 0.6). Such pairs are never present together.
    if ((water[i] === 1 || water[j] === 1) && (partial[i] === 1 || partial[j] === 1)) continue;
    const dx = xs[i] - xs[j];
    const dy = ys[i] - ys[j];
    const dz = zs[i] - zs[j];
    const raw =
      BONDI_RADII_A[el[i]] + BONDI_RADII_A[el[j]] - Math.sqrt(dx * dx + dy * dy + dz * dz);
    let allowance = 0;
    if (
      (el[i] === El.H && isNO(el[j]) && polarH(i)) ||
      (el[j] === El.H && isNO(el[i]) && polarH(j))
    )
      allowance = HBOND_H_ALLOWANCE_A;
    else if (isNO(el[i]) && isNO(el[j])) allowance = HBOND_HEAVY_ALLOWANCE_A;
    if (raw - allowance < severeA) continue; // most candidates end here, before any graph walk
    // Pairs up to three bonds apart never count; with a hydrogen, up to four (an H's position
    // follows its parent, so an H four bonds from an atom is set by one torsion of the parent's
    // framework: Word et al. 1999 extend the exclusion to four bonds for H, from memory).
    const apart = bondsApart(i, j);
    if (apart <= EXCLUDED_BONDS) continue;
    if (apart <= H_EXCLUDED_BONDS && (el[i] === El.H || el[j] === El.H)) continue;
    if (apart === 4 && isOC(i, j)) allowance = CARBONYL_1_5_ALLOWANCE_A;
    const ov = raw - allowance;
    if (ov >= severeA) {
      const a = perm[i];
      const b = perm[j];
      severe.push({ a: Math.min(a, b), b: Math.max(a, b), overlapA: Math.round(ov * 1000) / 1000 });
    }
  }
  // deterministic order: largest overlap first, then atom indices
  severe.sort((p, q) => q.overlapA - p.overlapA || p.a - q.a || p.b - q.b);
  const hydrogens =
    all.addedHydrogens === 0 && all.depositedHydrogens > 0
      ? 'deposited'
      : all.depositedHydrogens === 0
        ? 'added'
        : 'mixed';
  return {
    all,
    atomsAnalysed: sub.length,
    severe,
    perThousandAtoms:
      sub.length > 0 ? Math.round(((severe.length * 1000) / sub.length) * 100) / 100 : 0,
    hydrogens,
    xhConvention: conv,
  };
}

/** Report form of one overlap (atom identities as users see them). */
export function overlapForReport(
  structure: Structure,
  model: Model,
  all: AllAtomModel,
  p: OverlapPair,
): Overlap {
  const S = structure.strings;
  const who = (i: number) => {
    const r = all.residue[i];
    return {
      chain: S[model.chains.authId[model.residues.chain[r]]],
      seq: model.residues.authSeq[r],
      icode: S[model.residues.icode[r]],
      name: S[model.residues.name[r]],
      altloc: S[all.altloc[i]],
      atom: all.names[all.name[i]],
    };
  };
  return { a: who(p.a), b: who(p.b), overlapA: p.overlapA };
}
