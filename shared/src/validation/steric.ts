/**
 * Hard-sphere steric maps of the (phi, psi) plane, after Ramachandran, Ramakrishnan &
 * Sasisekharan 1963 (J Mol Biol 7:95), Ramakrishnan & Ramachandran 1965 (Biophys J 5:909) and
 * Ramachandran & Sasisekharan 1968 (Adv Protein Chem 23:283).
 *
 * A dipeptide of standard (Corey–Pauling-like) geometry is built from internal coordinates,
 * phi and psi are rotated on a grid, and each conformation is called
 *  - 'full'        when no counted pair is closer than the "normal" contact distance,
 *  - 'outer-limit' when none is closer than the "outer limit",
 *  - 'disallowed'  otherwise.
 *
 * Choices (they change the maps; the figure caption repeats them):
 *  - Geometry: planar trans peptides (omega 180°), bond lengths and angles below; τ(N–CA–C)
 *    is a parameter (110° by default, the classic value).
 *  - Atoms: backbone heavy atoms, amide H, HA; Cβ as a single carbon without its hydrogens
 *    (as in the classic work). Gly has two HA; Pro has CD on N instead of H and its ring
 *    closure restricts phi.
 *  - Pairs counted: every pair whose distance changes with phi or psi, 1–4 pairs included
 *    (the classic maps count them: the C(i−1)···C(i) 1–4 contact limits the α region).
 *
 * Pure TypeScript, no Node or DOM APIs.
 */
import type { StericStatus } from '../report/types';

export type StericKind = 'ala' | 'gly' | 'pro';

/** Grid codes in a map: 0 disallowed, 1 outer limit, 2 fully allowed. */
export const STERIC_DISALLOWED = 0;
export const STERIC_OUTER = 1;
export const STERIC_FULL = 2;

type Vec = [number, number, number];
type Element = 'C' | 'N' | 'O' | 'H';

/** Contact distances in Å [normal, outer limit], Ramachandran & Sasisekharan 1968 table, from memory (SCIENCE.md). */
const CONTACT_A: Record<string, [number, number]> = {
  HH: [2.0, 1.9],
  HO: [2.4, 2.2],
  HN: [2.4, 2.2],
  HC: [2.4, 2.2],
  OO: [2.7, 2.6],
  NO: [2.7, 2.6],
  CO: [2.8, 2.7],
  NN: [2.7, 2.6],
  CN: [2.9, 2.8],
  CC: [3.2, 3.0],
};

function contact(a: Element, b: Element): [number, number] {
  const c = CONTACT_A[a + b] ?? CONTACT_A[b + a];
  if (!c) throw new Error(`No contact distance for ${a}···${b}; add it to the steric table.`);
  return c;
}

/**
 * Standard geometry (Å, degrees): Corey & Pauling 1953 peptide values as used by Ramachandran
 * & Sasisekharan 1968, from memory: N–CA 1.47, CA–C 1.53, C–N 1.32, C=O 1.24, N–H 1.00,
 * CA–CB 1.54, C–H 1.09 (common practice), CA–C–N 114°, C–N–CA 123°, O=C–N 125°, C–N–H 123°,
 * tetrahedral 109.5° at CA for the substituents.
 */
export const STANDARD_GEOMETRY = {
  nCaA: 1.47,
  caCA: 1.53,
  cNA: 1.32,
  cOA: 1.24,
  nHA: 1.0,
  caCbA: 1.54,
  chA: 1.09,
  nCdA: 1.47,
  caCNDeg: 114,
  cNCaDeg: 123,
  oCNDeg: 125,
  cNHDeg: 123,
  tetraDeg: 109.5,
} as const;

const D2R = Math.PI / 180;

function sub(a: Vec, b: Vec): Vec {
  return [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
}
function cross(a: Vec, b: Vec): Vec {
  return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
}
function norm(a: Vec): Vec {
  const l = Math.hypot(a[0], a[1], a[2]);
  return [a[0] / l, a[1] / l, a[2] / l];
}

/** Place D so that |CD| = bond, angle B–C–D = angleDeg and torsion A–B–C–D = torsionDeg (NeRF). */
export function placeAtom(
  a: Vec,
  b: Vec,
  c: Vec,
  bondA: number,
  angleDeg: number,
  torsionDeg: number,
): Vec {
  const bc = norm(sub(c, b));
  const n = norm(cross(sub(b, a), bc));
  const m = cross(n, bc);
  const th = angleDeg * D2R;
  const ph = torsionDeg * D2R;
  const d2x = -bondA * Math.cos(th);
  const d2y = bondA * Math.sin(th) * Math.cos(ph);
  const d2z = bondA * Math.sin(th) * Math.sin(ph);
  return [
    c[0] + d2x * bc[0] + d2y * m[0] + d2z * n[0],
    c[1] + d2x * bc[1] + d2y * m[1] + d2z * n[1],
    c[2] + d2x * bc[2] + d2y * m[2] + d2z * n[2],
  ];
}

interface DipeptideAtom {
  name: string;
  element: Element;
  /** 0: before the phi bond (N side), 1: between phi and psi (CA substituents), 2: after the psi bond. */
  side: 0 | 1 | 2;
  pos: Vec;
}

/**
 * Build the dipeptide CA(i−1)–C(i−1)(=O)–N(i)(H)–CA(i)(HA,CB)–C(i)(=O)–N(i+1)(H)–CA(i+1)
 * at the given (phi, psi) and τ. Atoms N(i), CA(i), C(i) sit on the rotation axes.
 */
export function buildDipeptide(
  kind: StericKind,
  phiDeg: number,
  psiDeg: number,
  tauDeg = 110,
): DipeptideAtom[] {
  const g = STANDARD_GEOMETRY;
  // Start frame: C(i−1), N(i), CA(i) placed directly, then everything else by internal coordinates.
  const cPrev: Vec = [0, 0, 0];
  const n: Vec = [g.cNA, 0, 0];
  const ang = (180 - g.cNCaDeg) * D2R;
  const ca: Vec = [n[0] + g.nCaA * Math.cos(ang), g.nCaA * Math.sin(ang), 0];
  const caPrev = placeAtom(ca, n, cPrev, 1.53, g.caCNDeg, 180); // omega(i−1) = 180°
  const oPrev = placeAtom(ca, n, cPrev, g.cOA, g.oCNDeg, 0); // O(i−1) cis to CA(i) in a trans peptide
  const c = placeAtom(cPrev, n, ca, g.caCA, tauDeg, phiDeg);
  const nNext = placeAtom(n, ca, c, g.cNA, g.caCNDeg, psiDeg);
  const o = placeAtom(n, ca, c, g.cOA, 360 - g.caCNDeg - g.oCNDeg, psiDeg + 180);
  const caNext = placeAtom(ca, c, nNext, g.nCaA, g.cNCaDeg, 180);
  const hNext = placeAtom(o, c, nNext, g.nHA, g.cNHDeg, 180);
  const atoms: DipeptideAtom[] = [
    { name: 'CA-1', element: 'C', side: 0, pos: caPrev },
    { name: 'C-1', element: 'C', side: 0, pos: cPrev },
    { name: 'O-1', element: 'O', side: 0, pos: oPrev },
    { name: 'N', element: 'N', side: 0, pos: n },
    { name: 'CA', element: 'C', side: 1, pos: ca },
    { name: 'C', element: 'C', side: 2, pos: c },
    { name: 'O', element: 'O', side: 2, pos: o },
    { name: 'N+1', element: 'N', side: 2, pos: nNext },
    { name: 'H+1', element: 'H', side: 2, pos: hNext },
    { name: 'CA+1', element: 'C', side: 2, pos: caNext },
  ];
  if (kind === 'pro') {
    // CD replaces the amide H, in the peptide plane opposite C(i−1) across N.
    atoms.push({
      name: 'CD',
      element: 'C',
      side: 0,
      pos: placeAtom(oPrev, cPrev, n, g.nCdA, g.cNHDeg, 180),
    });
  } else {
    atoms.push({
      name: 'H',
      element: 'H',
      side: 0,
      pos: placeAtom(oPrev, cPrev, n, g.nHA, g.cNHDeg, 180),
    });
  }
  // Substituents of CA placed from (C, N, CA) at ∓120° (L configuration: CCD ALA ideal
  // coordinates give C–N–CA–CB −120.0° and C–N–CA–HA +120.1°, checked with gemmi).
  if (kind === 'gly') {
    atoms.push({
      name: 'HA2',
      element: 'H',
      side: 1,
      pos: placeAtom(c, n, ca, g.chA, g.tetraDeg, -120),
    });
    atoms.push({
      name: 'HA3',
      element: 'H',
      side: 1,
      pos: placeAtom(c, n, ca, g.chA, g.tetraDeg, 120),
    });
  } else {
    atoms.push({
      name: 'CB',
      element: 'C',
      side: 1,
      pos: placeAtom(c, n, ca, g.caCbA, g.tetraDeg, -120),
    });
    atoms.push({
      name: 'HA',
      element: 'H',
      side: 1,
      pos: placeAtom(c, n, ca, g.chA, g.tetraDeg, 120),
    });
  }
  // Re-tag: N(i) is on the phi axis (side 0 for pairing purposes is fine: its distances to
  // side-2 atoms change with psi); CA is on both axes; C(i) is on the psi axis but moves with phi.
  return atoms;
}

/**
 * Does the distance between two atoms change with phi or psi? N(i), CA(i) lie on the phi axis
 * and CA(i), C(i) on the psi axis, so:
 *  - side-0 vs side-1/2 atoms (except pairs with CA(i)) vary with phi;
 *  - side-1 (and N) vs side-2 atoms (except pairs with CA(i), C(i) for side 1) vary with psi.
 */
function pairVaries(a: DipeptideAtom, b: DipeptideAtom): boolean {
  if (a.name === 'CA' || b.name === 'CA') return false;
  const lo = a.side < b.side ? a : b;
  const hi = a.side < b.side ? b : a;
  if (lo.side === hi.side) return false;
  if (lo.name === 'N' && hi.name === 'C') return false; // both on the axes: fixed by τ
  if (lo.side === 1 && hi.name === 'C') return false; // CA substituent – C(i): fixed
  if (lo.name === 'N' && hi.side === 1) return false; // N – CA substituent: fixed
  if (lo.name === 'CD' && hi.name === 'CB') return false; // Pro ring: 1–3 through CG, fixed by the ring
  return true;
}

export interface StericEvaluation {
  status: StericStatus;
  /** the pair with the smallest distance relative to its normal contact distance */
  limiting: { a: string; b: string; distanceA: number; normalA: number; outerA: number };
}

/**
 * Pairs to test for a kind with their [normal, outer] contact distances, computed once (neither
 * depends on phi/psi; the report judges residues one by one, so the lookup is cached too).
 */
function countedPairs(kind: StericKind): [number, number, number, number][] {
  const atoms = buildDipeptide(kind, -60, -40);
  const pairs: [number, number, number, number][] = [];
  for (let i = 0; i < atoms.length; i++)
    for (let j = i + 1; j < atoms.length; j++)
      if (pairVaries(atoms[i], atoms[j]))
        pairs.push([i, j, ...contact(atoms[i].element, atoms[j].element)]);
  return pairs;
}

/**
 * Pro ring closure: the endocyclic torsion CD–N–CA–CB stays within ±PRO_RING_TORSION_DEG
 * (pyrrolidine puckers keep it small; ±20° from memory of observed proline rings).
 */
export const PRO_RING_TORSION_DEG = 20;

function torsionDeg(a: Vec, b: Vec, c: Vec, d: Vec): number {
  const b1 = sub(b, a);
  const b2 = sub(c, b);
  const b3 = sub(d, c);
  const n1 = cross(b1, b2);
  const n2 = cross(b2, b3);
  const m = cross(n1, norm(b2));
  const x = n1[0] * n2[0] + n1[1] * n2[1] + n1[2] * n2[2];
  const y = m[0] * n2[0] + m[1] * n2[1] + m[2] * n2[2];
  return Math.atan2(y, x) / D2R;
}

/** Evaluate one conformation. */
export function evaluateSteric(
  kind: StericKind,
  phiDeg: number,
  psiDeg: number,
  tauDeg = 110,
): StericEvaluation {
  const atoms = buildDipeptide(kind, phiDeg, psiDeg, tauDeg);
  let status: StericStatus = 'full';
  let worstRatio = Infinity;
  let limiting: StericEvaluation['limiting'] = {
    a: '',
    b: '',
    distanceA: 0,
    normalA: 0,
    outerA: 0,
  };
  for (const [i, j, normal, outer] of pairsFor(kind)) {
    const p = atoms[i].pos;
    const q = atoms[j].pos;
    const d = Math.hypot(p[0] - q[0], p[1] - q[1], p[2] - q[2]);
    if (d < outer) status = 'disallowed';
    else if (d < normal && status === 'full') status = 'outer-limit';
    const ratio = d / normal;
    if (ratio < worstRatio) {
      worstRatio = ratio;
      limiting = {
        a: atoms[i].name,
        b: atoms[j].name,
        distanceA: d,
        normalA: normal,
        outerA: outer,
      };
    }
  }
  if (kind === 'pro') {
    const at = (nm: string) => atoms.find((x) => x.name === nm)!.pos;
    const ring = torsionDeg(at('CD'), at('N'), at('CA'), at('CB'));
    if (Math.abs(ring) > PRO_RING_TORSION_DEG) status = 'disallowed';
  }
  return { status, limiting };
}

const pairCache = new Map<StericKind, [number, number, number, number][]>();
function pairsFor(kind: StericKind): [number, number, number, number][] {
  let p = pairCache.get(kind);
  if (!p) {
    p = countedPairs(kind);
    pairCache.set(kind, p);
  }
  return p;
}

export interface StericMap {
  kind: StericKind;
  tauDeg: number;
  stepDeg: number;
  /** number of grid points per axis (360 / stepDeg) */
  size: number;
  /**
   * codes[iPhi * size + iPsi] for the grid point phi = −180 + (iPhi + 0.5)·step,
   * psi = −180 + (iPsi + 0.5)·step (cell centres, so the map has no point exactly on ±180°).
   */
  codes: Uint8Array;
}

/** Compute a steric map on a grid of stepDeg (≤ 2° by the design notes). */
export function computeStericMap(kind: StericKind, tauDeg = 110, stepDeg = 2): StericMap {
  const size = Math.round(360 / stepDeg);
  if (Math.abs(size * stepDeg - 360) > 1e-9)
    throw new Error(`Grid step ${stepDeg}° does not divide 360°; choose a divisor such as 1 or 2.`);
  const codes = new Uint8Array(size * size);
  for (let i = 0; i < size; i++) {
    const phi = -180 + (i + 0.5) * stepDeg;
    for (let j = 0; j < size; j++) {
      const psi = -180 + (j + 0.5) * stepDeg;
      const s = evaluateSteric(kind, phi, psi, tauDeg).status;
      codes[i * size + j] =
        s === 'full' ? STERIC_FULL : s === 'outer-limit' ? STERIC_OUTER : STERIC_DISALLOWED;
    }
  }
  return { kind, tauDeg, stepDeg, size, codes };
}

/** Grid cell index of an angle in (−180, 180]. */
export function gridIndex(angleDeg: number, stepDeg: number, size: number): number {
  let i = Math.floor((angleDeg + 180) / stepDeg);
  i %= size;
  if (i < 0) i += size;
  return i;
}

/** Steric status of a (phi, psi) pair on a map (nearest cell). */
export function stericStatusAt(map: StericMap, phiDeg: number, psiDeg: number): StericStatus {
  const c =
    map.codes[
      gridIndex(phiDeg, map.stepDeg, map.size) * map.size + gridIndex(psiDeg, map.stepDeg, map.size)
    ];
  return c === STERIC_FULL ? 'full' : c === STERIC_OUTER ? 'outer-limit' : 'disallowed';
}

/** Fractions of the map that are fully allowed and allowed at least at the outer limit. */
export function stericFractions(map: StericMap): { full: number; outerOrBetter: number } {
  let full = 0;
  let outer = 0;
  for (const c of map.codes) {
    if (c === STERIC_FULL) full++;
    if (c >= STERIC_OUTER) outer++;
  }
  return { full: full / map.codes.length, outerOrBetter: outer / map.codes.length };
}

/** Which steric map applies to a residue (by parent component name). */
export function stericKindFor(parentName: string): StericKind {
  if (parentName === 'GLY') return 'gly';
  if (parentName === 'PRO') return 'pro';
  return 'ala';
}
