/**
 * Secondary structure by the method of Kabsch & Sander 1983 (Biopolymers 22:2577), "DSSP".
 *
 * 1. Backbone H-bonds from the electrostatic energy
 *    E = 0.084·332·(1/r(ON) + 1/r(CH) − 1/r(OH) − 1/r(CN)) kcal/mol (q1 = 0.42e, q2 = 0.20e),
 *    a bond when E < −0.5 kcal/mol. The amide H sits 1.0 Å from N opposite the previous C=O
 *    (H = N + unit(C(i−1) − O(i−1))); Pro donates none. Pairs are evaluated when their CA atoms
 *    are closer than 9 Å, and each NH keeps its two best (lowest-energy) acceptors, as the
 *    published program does; E is rounded to 0.001 kcal/mol and floored at −9.9 kcal/mol, and
 *    any atom pair closer than 0.5 Å gives −9.9.
 * 2. n-turns (n = 3, 4, 5): Hbond(CO(i) → NH(i+n)). Minimal helices: two consecutive n-turns
 *    at i−1 and i give H (n = 4, residues i..i+3), G (n = 3) and I (n = 5).
 * 3. Bridges: parallel [Hbond(i−1, j) and Hbond(j, i+1)] or [Hbond(j−1, i) and Hbond(i, j+1)];
 *    antiparallel [Hbond(i, j) and Hbond(j, i)] or [Hbond(i−1, j+1) and Hbond(j−1, i+1)].
 *    Consecutive bridges form ladders; ladders joined across a β-bulge (gap of at most one
 *    residue on one strand and four on the other) are merged. A ladder of one bridge is B,
 *    longer ones E (over the full span).
 * 4. Priority H > B/E > G > I, except that a π-helix replaces an α-helix (the order of the
 *    published program since 2012, which the checks compare against); then T (residues inside
 *    an n-turn) and S (bend: the CA(i−2)→CA(i) / CA(i)→CA(i+2) angle above 70°).
 * 5. Polyproline II ('P'), as the reference program (mkdssp 4.2) outputs by default: three
 *    consecutive residues with phi in −75° ± 29° and psi in 145° ± 29°, on residues still
 *    without another code.
 *
 * Residues: protein residues with N, CA, C and O (the first conformer of each); a chain break
 * (new chain, or C(i)–N(i+1) > 2.5 Å, the reference program's limit) ends every pattern.
 */
import { buildCellGrid, cellBox } from '../geometry/grid';
import type { ConformerTable } from '../model/conformers';
import type { Model, Structure } from '../model/types';
import { ResidueKind } from '../model/types';

/** Kabsch & Sander 1983: 0.42·0.20·332 kcal·Å/mol, negative for the sign convention used below. */
const COUPLING = -27.888;
const MIN_ENERGY = -9.9;
const MAX_HBOND_ENERGY = -0.5;
const MIN_DISTANCE_A = 0.5;
const CA_CUTOFF_A = 9.0;
const PEPTIDE_BREAK_A = 2.5;
const BEND_DEG = 70;
const PP_PHI = -75;
const PP_PSI = 145;
const PP_EPS = 29;

export type SsCode = 'H' | 'B' | 'E' | 'G' | 'I' | 'T' | 'S' | 'P' | '-';

export interface SecondaryStructureResult {
  /** code per model residue ('-' for none and for residues not analysed) */
  ss: SsCode[];
  /** residues analysed (protein with complete backbone) */
  analysed: number;
  /** counts by code over analysed residues */
  counts: Record<string, number>;
}

const enum Flag {
  None = 0,
  Start = 1,
  End = 2,
  StartAndEnd = 3,
  Middle = 4,
}

interface Bridge {
  parallel: boolean;
  i: number[];
  j: number[];
  chain: string;
}

export function assignSecondaryStructure(
  structure: Structure,
  model: Model,
  t: ConformerTable,
): SecondaryStructureResult {
  const atoms = model.atoms;
  const res = model.residues;
  // Residue list: first conformer of each protein residue with a complete backbone.
  const list: number[] = [];
  const conf: number[] = [];
  for (let r = 0; r < res.count; r++) {
    if (res.kind[r] !== ResidueKind.Protein) continue;
    const k = t.firstOfResidue[r];
    if (t.n[k] < 0 || t.ca[k] < 0 || t.c[k] < 0 || t.o[k] < 0) continue;
    list.push(r);
    conf.push(k);
  }
  const n = list.length;
  const P = (name: 'n' | 'ca' | 'c' | 'o'): Float64Array => {
    const out = new Float64Array(3 * n);
    const col = t[name];
    for (let i = 0; i < n; i++) {
      const a = col[conf[i]];
      out[3 * i] = atoms.x[a];
      out[3 * i + 1] = atoms.y[a];
      out[3 * i + 2] = atoms.z[a];
    }
    return out;
  };
  const N = P('n');
  const CA = P('ca');
  const C = P('c');
  const O = P('o');
  const chainName = (i: number): string =>
    structure.strings[model.chains.authId[res.chain[list[i]]]];
  const isPro = (i: number): boolean => structure.strings[res.parent[list[i]]] === 'PRO';
  const dist = (A: Float64Array, i: number, B: Float64Array, j: number): number => {
    const dx = A[3 * i] - B[3 * j];
    const dy = A[3 * i + 1] - B[3 * j + 1];
    const dz = A[3 * i + 2] - B[3 * j + 2];
    return Math.sqrt(dx * dx + dy * dy + dz * dz);
  };

  // Chain breaks: segment id per residue; NoChainBreak(i, j) ⇔ same segment.
  const seg = new Int32Array(n);
  for (let i = 1; i < n; i++) {
    const brk =
      res.chain[list[i]] !== res.chain[list[i - 1]] ||
      chainName(i) !== chainName(i - 1) ||
      dist(C, i - 1, N, i) > PEPTIDE_BREAK_A;
    seg[i] = seg[i - 1] + (brk ? 1 : 0);
  }
  const noBreak = (i: number, j: number): boolean => seg[i] === seg[j];

  // Amide hydrogens.
  const H = new Float64Array(N);
  for (let i = 1; i < n; i++) {
    if (isPro(i) || !noBreak(i - 1, i)) continue;
    const dx = C[3 * (i - 1)] - O[3 * (i - 1)];
    const dy = C[3 * (i - 1) + 1] - O[3 * (i - 1) + 1];
    const dz = C[3 * (i - 1) + 2] - O[3 * (i - 1) + 2];
    const l = Math.sqrt(dx * dx + dy * dy + dz * dz);
    H[3 * i] += dx / l;
    H[3 * i + 1] += dy / l;
    H[3 * i + 2] += dz / l;
  }

  // Two best acceptors of each NH.
  const acc0 = new Int32Array(n).fill(-1);
  const acc1 = new Int32Array(n).fill(-1);
  const e0 = new Float64Array(n);
  const e1 = new Float64Array(n);
  const pro = new Uint8Array(n);
  for (let i = 0; i < n; i++) pro[i] = isPro(i) ? 1 : 0;
  // Hot loop (every residue pair with CA closer than 9 Å): distances inlined.
  const energy = (d: number, a: number): void => {
    if (pro[d] === 1) return; // E = 0 never enters the best-two lists (they start at 0)
    const hx = H[3 * d];
    const hy = H[3 * d + 1];
    const hz = H[3 * d + 2];
    const nx = N[3 * d];
    const ny = N[3 * d + 1];
    const nz = N[3 * d + 2];
    const ox = O[3 * a];
    const oy = O[3 * a + 1];
    const oz = O[3 * a + 2];
    const cx = C[3 * a];
    const cy = C[3 * a + 1];
    const cz = C[3 * a + 2];
    const dHO = Math.sqrt((hx - ox) ** 2 + (hy - oy) ** 2 + (hz - oz) ** 2);
    const dHC = Math.sqrt((hx - cx) ** 2 + (hy - cy) ** 2 + (hz - cz) ** 2);
    const dNC = Math.sqrt((nx - cx) ** 2 + (ny - cy) ** 2 + (nz - cz) ** 2);
    const dNO = Math.sqrt((nx - ox) ** 2 + (ny - oy) ** 2 + (nz - oz) ** 2);
    let e: number;
    if (
      dHO < MIN_DISTANCE_A ||
      dHC < MIN_DISTANCE_A ||
      dNC < MIN_DISTANCE_A ||
      dNO < MIN_DISTANCE_A
    ) {
      e = MIN_ENERGY;
    } else {
      e = COUPLING / dHO - COUPLING / dHC + COUPLING / dNC - COUPLING / dNO;
    }
    e = roundHalfAway(e * 1000) / 1000;
    if (e < MIN_ENERGY) e = MIN_ENERGY;
    if (e < e0[d]) {
      acc1[d] = acc0[d];
      e1[d] = e0[d];
      acc0[d] = a;
      e0[d] = e;
    } else if (e < e1[d]) {
      acc1[d] = a;
      e1[d] = e;
    }
  };
  const xs = new Float64Array(n);
  const ys = new Float64Array(n);
  const zs = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    xs[i] = CA[3 * i];
    ys[i] = CA[3 * i + 1];
    zs[i] = CA[3 * i + 2];
  }
  const grid = buildCellGrid(xs, ys, zs, { cellSizeA: CA_CUTOFF_A });
  const near: number[] = [];
  const { cellStart, cellAtoms, nx, ny } = grid;
  const box = new Float64Array(6);
  const cut2 = CA_CUTOFF_A * CA_CUTOFF_A;
  for (let i = 0; i + 1 < n; i++) {
    near.length = 0;
    // CA atoms j > i closer than the cutoff: the cells around i, one run of atoms per grid row
    // (the cells x0..x1 of a row hold consecutive atoms); inlined rather than a callback walk
    const px = xs[i];
    const py = ys[i];
    const pz = zs[i];
    if (!cellBox(grid, px, py, pz, CA_CUTOFF_A, box)) continue;
    const x0 = box[0];
    const x1 = box[1];
    for (let cz = box[4]; cz <= box[5]; cz++)
      for (let cy = box[2]; cy <= box[3]; cy++) {
        const row = (cz * ny + cy) * nx;
        for (let q = cellStart[row + x0], e = cellStart[row + x1 + 1]; q < e; q++) {
          const j = cellAtoms[q];
          if (j <= i) continue;
          const dx = xs[j] - px;
          const dy = ys[j] - py;
          const dz = zs[j] - pz;
          if (dx * dx + dy * dy + dz * dz < cut2) near.push(j);
        }
      }
    near.sort((p, q) => p - q); // the reference program's evaluation order (ties keep the first)
    for (const j of near) {
      energy(i, j);
      if (j !== i + 1) energy(j, i);
    }
  }
  /** NH of a bonded to CO of b */
  const bond = (a: number, b: number): boolean =>
    (acc0[a] === b && e0[a] < MAX_HBOND_ENERGY) || (acc1[a] === b && e1[a] < MAX_HBOND_ENERGY);

  const ss: SsCode[] = new Array<SsCode>(n).fill('-');

  // Bridges and ladders.
  const bridges: Bridge[] = [];
  // Every bridge pattern contains an H-bond between {i−1, i, i+1} and {j−1, j, j+1}, so only
  // partners of those bonds are candidates: linear cost instead of testing all pairs. They are
  // visited in ascending j, the order of the published program's double loop.
  const donorsOf: number[][] = Array.from({ length: n }, () => []);
  for (let d = 0; d < n; d++) {
    if (acc0[d] >= 0 && e0[d] < MAX_HBOND_ENERGY) donorsOf[acc0[d]].push(d);
    if (acc1[d] >= 0 && e1[d] < MAX_HBOND_ENERGY) donorsOf[acc1[d]].push(d);
  }
  // candidate partners j of residue i, ascending and without repeats (one reused array)
  const js: number[] = [];
  const addAround = (i: number, y: number): void => {
    for (let j = y - 1; j <= y + 1; j++) if (j >= i + 3 && j + 1 < n) js.push(j);
  };
  for (let i = 1; i + 4 < n; i++) {
    js.length = 0;
    for (let x = i - 1; x <= i + 1; x++) {
      if (acc0[x] >= 0 && e0[x] < MAX_HBOND_ENERGY) addAround(i, acc0[x]);
      if (acc1[x] >= 0 && e1[x] < MAX_HBOND_ENERGY) addAround(i, acc1[x]);
      for (const d of donorsOf[x]) addAround(i, d);
    }
    if (js.length === 0) continue;
    js.sort((p, q) => p - q);
    let u = 1;
    for (let q = 1; q < js.length; q++) if (js[q] !== js[u - 1]) js[u++] = js[q];
    js.length = u;
    for (const j of js) {
      if (!noBreak(i - 1, i + 1) || !noBreak(j - 1, j + 1)) continue;
      const a = i - 1;
      const b = i;
      const c = i + 1;
      const d = j - 1;
      const e = j;
      const f = j + 1;
      let type = 0; // 1 parallel, 2 antiparallel
      if ((bond(c, e) && bond(e, a)) || (bond(f, b) && bond(b, d))) type = 1;
      else if ((bond(c, d) && bond(f, a)) || (bond(e, b) && bond(b, e))) type = 2;
      if (type === 0) continue;
      let found = false;
      for (const br of bridges) {
        if ((type === 1) !== br.parallel || i !== br.i[br.i.length - 1] + 1) continue;
        if (type === 1 && br.j[br.j.length - 1] + 1 === j) {
          br.i.push(i);
          br.j.push(j);
          found = true;
          break;
        }
        if (type === 2 && br.j[0] - 1 === j) {
          br.i.push(i);
          br.j.unshift(j);
          found = true;
          break;
        }
      }
      if (!found) bridges.push({ parallel: type === 1, i: [i], j: [j], chain: chainName(i) });
    }
  }
  bridges.sort((p, q) => (p.chain < q.chain ? -1 : p.chain > q.chain ? 1 : p.i[0] - q.i[0]));
  // Unsigned differences as in the reference program: a negative difference never passes "< k".
  const ud = (p: number, q: number): number => (p - q < 0 ? Infinity : p - q);
  for (let x = 0; x < bridges.length; x++) {
    for (let y = x + 1; y < bridges.length; y++) {
      const bx = bridges[x];
      const by = bridges[y];
      // Sorted by chain and first residue: a bridge of another chain, or one starting six or more
      // residues after bx ends, can never merge, nor can any later one (bx only grows at its end
      // through merges, which need exactly such a close bridge). Same result as the full loop.
      if (by.chain !== bx.chain || by.i[0] - bx.i[bx.i.length - 1] >= 6) break;
      const ibi = bx.i[0];
      const iei = bx.i[bx.i.length - 1];
      const jbi = bx.j[0];
      const jei = bx.j[bx.j.length - 1];
      const ibj = by.i[0];
      const iej = by.i[by.i.length - 1];
      const jbj = by.j[0];
      const jej = by.j[by.j.length - 1];
      if (
        bx.parallel !== by.parallel ||
        !noBreak(Math.min(ibi, ibj), Math.max(iei, iej)) ||
        !noBreak(Math.min(jbi, jbj), Math.max(jei, jej)) ||
        ud(ibj, iei) >= 6 ||
        (iei >= ibj && ibi <= iej)
      ) {
        continue;
      }
      const bulge = bx.parallel
        ? (ud(jbj, jei) < 6 && ud(ibj, iei) < 3) || ud(jbj, jei) < 3
        : (ud(jbi, jej) < 6 && ud(ibj, iei) < 3) || ud(jbi, jej) < 3;
      if (bulge) {
        bx.i.push(...by.i);
        if (bx.parallel) bx.j.push(...by.j);
        else bx.j.unshift(...by.j);
        bridges.splice(y, 1);
        y--;
      }
    }
  }
  for (const br of bridges) {
    const code: SsCode = br.i.length > 1 ? 'E' : 'B';
    for (let i = br.i[0]; i <= br.i[br.i.length - 1]; i++) if (ss[i] !== 'E') ss[i] = code;
    for (let j = br.j[0]; j <= br.j[br.j.length - 1]; j++) if (ss[j] !== 'E') ss[j] = code;
  }

  // n-turns and helices.
  const flags = [3, 4, 5].map(() => new Uint8Array(n));
  for (let stride = 3; stride <= 5; stride++) {
    const fl = flags[stride - 3];
    for (let i = 0; i + stride < n; i++) {
      if (noBreak(i, i + stride) && bond(i + stride, i)) {
        fl[i + stride] = Flag.End;
        for (let j = i + 1; j < i + stride; j++) if (fl[j] === Flag.None) fl[j] = Flag.Middle;
        fl[i] = fl[i] === Flag.End ? Flag.StartAndEnd : Flag.Start;
      }
    }
  }
  const start = (i: number, stride: number): boolean => {
    const f = flags[stride - 3][i];
    return f === Flag.Start || f === Flag.StartAndEnd;
  };
  for (let i = 1; i + 4 < n; i++) {
    if (start(i, 4) && start(i - 1, 4)) for (let j = i; j <= i + 3; j++) ss[j] = 'H';
  }
  for (let i = 1; i + 3 < n; i++) {
    if (start(i, 3) && start(i - 1, 3)) {
      let empty = true;
      for (let j = i; empty && j <= i + 2; j++) empty = ss[j] === '-' || ss[j] === 'G';
      if (empty) for (let j = i; j <= i + 2; j++) ss[j] = 'G';
    }
  }
  for (let i = 1; i + 5 < n; i++) {
    if (start(i, 5) && start(i - 1, 5)) {
      let empty = true;
      for (let j = i; empty && j <= i + 4; j++)
        empty = ss[j] === '-' || ss[j] === 'I' || ss[j] === 'H';
      if (empty) for (let j = i; j <= i + 4; j++) ss[j] = 'I';
    }
  }
  for (let i = 1; i + 1 < n; i++) {
    if (ss[i] !== '-') continue;
    let turn = false;
    for (let stride = 3; stride <= 5 && !turn; stride++) {
      for (let k = 1; k < stride && !turn; k++) turn = i >= k && start(i - k, stride);
    }
    if (turn) ss[i] = 'T';
    else if (i >= 2 && i + 2 < n && noBreak(i - 2, i + 2) && kappaDeg(CA, i) > BEND_DEG)
      ss[i] = 'S';
  }

  // Polyproline II.
  const phi = new Float64Array(n).fill(360);
  const psi = new Float64Array(n).fill(360);
  for (let i = 0; i < n; i++) {
    if (i > 0 && noBreak(i - 1, i)) phi[i] = dihedral(C, i - 1, N, i, CA, i, C, i);
    if (i + 1 < n && noBreak(i, i + 1)) psi[i] = dihedral(N, i, CA, i, C, i, N, i + 1);
  }
  const inPP = (i: number): boolean =>
    phi[i] >= PP_PHI - PP_EPS &&
    phi[i] <= PP_PHI + PP_EPS &&
    psi[i] >= PP_PSI - PP_EPS &&
    psi[i] <= PP_PSI + PP_EPS;
  for (let i = 1; i + 3 < n; i++) {
    if (inPP(i) && inPP(i + 1) && inPP(i + 2)) {
      for (let j = i; j <= i + 2; j++) if (ss[j] === '-') ss[j] = 'P';
    }
  }

  const out: SsCode[] = new Array<SsCode>(res.count).fill('-');
  const counts: Record<string, number> = {};
  for (let i = 0; i < n; i++) {
    out[list[i]] = ss[i];
    counts[ss[i]] = (counts[ss[i]] ?? 0) + 1;
  }
  return { ss: out, analysed: n, counts };
}

function roundHalfAway(x: number): number {
  return x < 0 ? -Math.round(-x) : Math.round(x);
}

/** Angle between CA(i−2)→CA(i) and CA(i)→CA(i+2), degrees. */
function kappaDeg(CA: Float64Array, i: number): number {
  const ax = CA[3 * i] - CA[3 * (i - 2)];
  const ay = CA[3 * i + 1] - CA[3 * (i - 2) + 1];
  const az = CA[3 * i + 2] - CA[3 * (i - 2) + 2];
  const bx = CA[3 * (i + 2)] - CA[3 * i];
  const by = CA[3 * (i + 2) + 1] - CA[3 * i + 1];
  const bz = CA[3 * (i + 2) + 2] - CA[3 * i + 2];
  const c =
    (ax * bx + ay * by + az * bz) /
    Math.sqrt((ax * ax + ay * ay + az * az) * (bx * bx + by * by + bz * bz));
  return (Math.acos(Math.max(-1, Math.min(1, c))) * 180) / Math.PI;
}

function dihedral(
  A: Float64Array,
  a: number,
  B: Float64Array,
  b: number,
  Cc: Float64Array,
  c: number,
  D: Float64Array,
  d: number,
): number {
  const b1 = [B[3 * b] - A[3 * a], B[3 * b + 1] - A[3 * a + 1], B[3 * b + 2] - A[3 * a + 2]];
  const b2 = [Cc[3 * c] - B[3 * b], Cc[3 * c + 1] - B[3 * b + 1], Cc[3 * c + 2] - B[3 * b + 2]];
  const b3 = [D[3 * d] - Cc[3 * c], D[3 * d + 1] - Cc[3 * c + 1], D[3 * d + 2] - Cc[3 * c + 2]];
  const n1 = cross(b1, b2);
  const n2 = cross(b2, b3);
  const l = Math.sqrt(b2[0] * b2[0] + b2[1] * b2[1] + b2[2] * b2[2]);
  const m1 = cross(n1, [b2[0] / l, b2[1] / l, b2[2] / l]);
  const x = n1[0] * n2[0] + n1[1] * n2[1] + n1[2] * n2[2];
  const y = m1[0] * n2[0] + m1[1] * n2[1] + m1[2] * n2[2];
  return (Math.atan2(-y, x) * 180) / Math.PI;
}

function cross(p: number[], q: number[]): number[] {
  return [p[1] * q[2] - p[2] * q[1], p[2] * q[0] - p[0] * q[2], p[0] * q[1] - p[1] * q[0]];
}
