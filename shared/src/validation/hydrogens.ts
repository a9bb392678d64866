/**
 * Riding hydrogens for all-atom contact analysis (Word et al. 1999, J Mol Biol 285:1711): added
 * to protein residues that carry none, at ideal geometry from their heavy-atom neighbours;
 * rotatable groups (methyl, NH3+, OH, SH) staggered.
 *
 * Choices (stated here and in DEVELOPERS.md):
 *  - Names follow the PDB (version 3) atom nomenclature, so they compare with deposited files.
 *  - His is placed as the neutral Nε2–H tautomer (HE2, no HD1) — common practice, from memory.
 *  - Waters and ligands get no hydrogens (no dictionary at hand; water H would need optimisation).
 *  - A residue that already carries any H/D keeps its deposited hydrogens and gets none added.
 *  - X–H lengths in two conventions (see XH_LENGTHS_A); the overlap analysis uses electron-cloud
 *    lengths by default, the convention of X-ray refinement.
 *
 * Pure TypeScript, no Node or DOM APIs.
 */
import type { Model, Structure } from '../model/types';
import { ResidueKind } from '../model/types';
import { buildConformers, type ConformerTable } from '../model/conformers';

export type XhConvention = 'nuclear' | 'electron-cloud';

/** Geometry of a hydrogen group. */
type GroupType = 'tet1' | 'tet2' | 'tri1' | 'methyl' | 'hydroxyl' | 'planar2';

/**
 * X–H lengths in Å. Nuclear: neutron-diffraction positions (N–H 1.01, C–H 1.09; SCIENCE.md;
 * 1EJG's deposited H measured with gemmi give N–H 1.01, C–H 1.10). Electron-cloud: the
 * shortened riding-H lengths of X-ray refinement (N–H 0.86, C–H 0.96–0.98, aromatic C–H 0.93,
 * O–H 0.82), from memory; 1OLR's deposited H measured with gemmi give N–H 0.86, C–H 0.96–0.98.
 */
export const XH_LENGTHS_A: Record<XhConvention, Record<string, number>> = {
  nuclear: {
    'C-tet1': 1.09,
    'C-tet2': 1.09,
    'C-methyl': 1.09,
    'C-tri1': 1.08,
    N: 1.01,
    O: 0.96,
    S: 1.34,
  },
  'electron-cloud': {
    'C-tet1': 0.98,
    'C-tet2': 0.97,
    'C-methyl': 0.96,
    'C-tri1': 0.93,
    N: 0.86,
    O: 0.82,
    S: 1.2,
  },
};

/** Default X–H convention of the overlap analysis (X-ray models: electron-cloud). */
export const OVERLAP_XH_CONVENTION: XhConvention = 'electron-cloud';

type Spec = [parent: string, names: string[], type: GroupType, refs: string[]];

const CB2 = (g: string): Spec => ['CB', ['HB2', 'HB3'], 'tet2', ['CA', g]];
const RING_PHE: Spec[] = [
  ['CD1', ['HD1'], 'tri1', ['CG', 'CE1']],
  ['CD2', ['HD2'], 'tri1', ['CG', 'CE2']],
  ['CE1', ['HE1'], 'tri1', ['CD1', 'CZ']],
  ['CE2', ['HE2'], 'tri1', ['CD2', 'CZ']],
];

/** Side-chain hydrogen groups per residue (PDB v3 names). Backbone H and HA are added separately. */
const SIDE_CHAIN: Record<string, Spec[]> = {
  ALA: [['CB', ['HB1', 'HB2', 'HB3'], 'methyl', ['CA', 'N']]],
  ARG: [
    CB2('CG'),
    ['CG', ['HG2', 'HG3'], 'tet2', ['CB', 'CD']],
    ['CD', ['HD2', 'HD3'], 'tet2', ['CG', 'NE']],
    ['NE', ['HE'], 'tri1', ['CD', 'CZ']],
    ['NH1', ['HH11', 'HH12'], 'planar2', ['CZ', 'NE']],
    ['NH2', ['HH21', 'HH22'], 'planar2', ['CZ', 'NE']],
  ],
  ASN: [CB2('CG'), ['ND2', ['HD21', 'HD22'], 'planar2', ['CG', 'OD1']]],
  ASP: [CB2('CG')],
  CYS: [CB2('SG'), ['SG', ['HG'], 'hydroxyl', ['CB', 'CA']]],
  GLN: [
    CB2('CG'),
    ['CG', ['HG2', 'HG3'], 'tet2', ['CB', 'CD']],
    ['NE2', ['HE21', 'HE22'], 'planar2', ['CD', 'OE1']],
  ],
  GLU: [CB2('CG'), ['CG', ['HG2', 'HG3'], 'tet2', ['CB', 'CD']]],
  HIS: [
    CB2('CG'),
    ['CD2', ['HD2'], 'tri1', ['CG', 'NE2']],
    ['CE1', ['HE1'], 'tri1', ['ND1', 'NE2']],
    ['NE2', ['HE2'], 'tri1', ['CD2', 'CE1']],
  ],
  ILE: [
    ['CB', ['HB'], 'tet1', ['CA', 'CG1', 'CG2']],
    ['CG1', ['HG12', 'HG13'], 'tet2', ['CB', 'CD1']],
    ['CG2', ['HG21', 'HG22', 'HG23'], 'methyl', ['CB', 'CA']],
    ['CD1', ['HD11', 'HD12', 'HD13'], 'methyl', ['CG1', 'CB']],
  ],
  LEU: [
    CB2('CG'),
    ['CG', ['HG'], 'tet1', ['CB', 'CD1', 'CD2']],
    ['CD1', ['HD11', 'HD12', 'HD13'], 'methyl', ['CG', 'CB']],
    ['CD2', ['HD21', 'HD22', 'HD23'], 'methyl', ['CG', 'CB']],
  ],
  LYS: [
    CB2('CG'),
    ['CG', ['HG2', 'HG3'], 'tet2', ['CB', 'CD']],
    ['CD', ['HD2', 'HD3'], 'tet2', ['CG', 'CE']],
    ['CE', ['HE2', 'HE3'], 'tet2', ['CD', 'NZ']],
    ['NZ', ['HZ1', 'HZ2', 'HZ3'], 'methyl', ['CE', 'CD']],
  ],
  MET: [
    CB2('CG'),
    ['CG', ['HG2', 'HG3'], 'tet2', ['CB', 'SD']],
    ['CE', ['HE1', 'HE2', 'HE3'], 'methyl', ['SD', 'CG']],
  ],
  PHE: [CB2('CG'), ...RING_PHE, ['CZ', ['HZ'], 'tri1', ['CE1', 'CE2']]],
  PRO: [
    CB2('CG'),
    ['CG', ['HG2', 'HG3'], 'tet2', ['CB', 'CD']],
    ['CD', ['HD2', 'HD3'], 'tet2', ['CG', 'N']],
  ],
  SER: [CB2('OG'), ['OG', ['HG'], 'hydroxyl', ['CB', 'CA']]],
  THR: [
    ['CB', ['HB'], 'tet1', ['CA', 'OG1', 'CG2']],
    ['OG1', ['HG1'], 'hydroxyl', ['CB', 'CA']],
    ['CG2', ['HG21', 'HG22', 'HG23'], 'methyl', ['CB', 'CA']],
  ],
  TRP: [
    CB2('CG'),
    ['CD1', ['HD1'], 'tri1', ['CG', 'NE1']],
    ['NE1', ['HE1'], 'tri1', ['CD1', 'CE2']],
    ['CE3', ['HE3'], 'tri1', ['CD2', 'CZ3']],
    ['CZ2', ['HZ2'], 'tri1', ['CE2', 'CH2']],
    ['CZ3', ['HZ3'], 'tri1', ['CE3', 'CH2']],
    ['CH2', ['HH2'], 'tri1', ['CZ2', 'CZ3']],
  ],
  TYR: [CB2('CG'), ...RING_PHE, ['OH', ['HH'], 'hydroxyl', ['CZ', 'CE1']]],
  VAL: [
    ['CB', ['HB'], 'tet1', ['CA', 'CG1', 'CG2']],
    ['CG1', ['HG11', 'HG12', 'HG13'], 'methyl', ['CB', 'CA']],
    ['CG2', ['HG21', 'HG22', 'HG23'], 'methyl', ['CB', 'CA']],
  ],
};

/** Rotatable groups: their H positions are a choice (staggered), not determined by heavy atoms. */
export function isRotatableGroup(type: GroupType): boolean {
  return type === 'methyl' || type === 'hydroxyl';
}

/** Element codes of the all-atom set. */
export const enum El {
  Other = 0,
  H = 1,
  C = 2,
  N = 3,
  O = 4,
  S = 5,
  Se = 6,
  P = 7,
}

export function elementCode(symbol: string): El {
  switch (symbol) {
    case 'H':
    case 'D':
      return El.H;
    case 'C':
      return El.C;
    case 'N':
      return El.N;
    case 'O':
      return El.O;
    case 'S':
      return El.S;
    case 'SE':
      return El.Se;
    case 'P':
      return El.P;
    default:
      return El.Other;
  }
}

/** The model's atoms followed by the added hydrogens, column-wise. */
export interface AllAtomModel {
  count: number;
  /** atoms [0, modelAtoms) are the model's own, in the model's order */
  modelAtoms: number;
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
  element: Uint8Array;
  residue: Int32Array;
  /** altloc string index (Structure.strings) */
  altloc: Int32Array;
  /** atom name: index into `names` */
  name: Int32Array;
  names: string[];
  /** for added H: the heavy atom it rides on; -1 for model atoms */
  parent: Int32Array;
  /** for added H: 1 when in a rotatable group (methyl, NH3+, OH, SH) */
  rotatable: Uint8Array;
  addedHydrogens: number;
  depositedHydrogens: number;
  convention: XhConvention;
}

/** Tetrahedral angle (109.5°, common practice) and half of the H–C–H angle of a methylene. */
const TETRA_DEG = 109.5;
const HALF_TETRA_RAD = ((TETRA_DEG / 2) * Math.PI) / 180;
const COS_HALF_TETRA = Math.cos(HALF_TETRA_RAD);
const SIN_HALF_TETRA = Math.sin(HALF_TETRA_RAD);

/**
 * Placement without temporary arrays (the H of a large model number in the millions): unit
 * vectors go to the scratch `W`, positions to `out` (x, y, z per H). The arithmetic is the
 * vector form's, term by term, so positions are bit-identical to it.
 */
const W = new Float64Array(12);

/** W[o..o+2] = (x, y, z) / |(x, y, z)| */
function unitTo(o: number, x: number, y: number, z: number): void {
  const l = Math.hypot(x, y, z);
  W[o] = x / l;
  W[o + 1] = y / l;
  W[o + 2] = z / l;
}

/**
 * NeRF frame of the bond B→C with A as the third atom (Parsons et al. 2005, J Comput Chem
 * 26:1063): W[0..2] = unit(C − B), W[3..5] = n = unit((B − A) × bc), W[6..8] = m = n × bc.
 */
function nerfFrame(
  ax: number,
  ay: number,
  az: number,
  bx: number,
  by: number,
  bz: number,
  cx: number,
  cy: number,
  cz: number,
): void {
  unitTo(0, cx - bx, cy - by, cz - bz);
  const b0 = W[0];
  const b1 = W[1];
  const b2 = W[2];
  const ab0 = bx - ax;
  const ab1 = by - ay;
  const ab2 = bz - az;
  unitTo(3, ab1 * b2 - ab2 * b1, ab2 * b0 - ab0 * b2, ab0 * b1 - ab1 * b0);
  const n0 = W[3];
  const n1 = W[4];
  const n2 = W[5];
  W[6] = n1 * b2 - n2 * b1;
  W[7] = n2 * b0 - n0 * b2;
  W[8] = n0 * b1 - n1 * b0;
}

/** out[o..o+2] = C + D in the frame of `nerfFrame`: |CD| = len, angle B–C–D, torsion A–B–C–D. */
function placeInFrame(
  out: Float64Array,
  o: number,
  cx: number,
  cy: number,
  cz: number,
  len: number,
  angleDeg: number,
  torsionDeg: number,
): void {
  const th = (angleDeg * Math.PI) / 180;
  const ph = (torsionDeg * Math.PI) / 180;
  const dx = -len * Math.cos(th);
  const dy = len * Math.sin(th) * Math.cos(ph);
  const dz = len * Math.sin(th) * Math.sin(ph);
  out[o] = cx + dx * W[0] + dy * W[6] + dz * W[3];
  out[o + 1] = cy + dx * W[1] + dy * W[7] + dz * W[4];
  out[o + 2] = cz + dx * W[2] + dy * W[8] + dz * W[5];
}

/**
 * Positions of a group's hydrogens from the parent X (atom `x`) and its reference atoms
 * (`r0`, `r1`, `r2`; -1 where the group type needs fewer), written to `out` as x, y, z per H;
 * returns the number of H.
 */
export function groupPositionsInto(
  type: GroupType,
  px: Float64Array,
  py: Float64Array,
  pz: Float64Array,
  x: number,
  r0: number,
  r1: number,
  r2: number,
  len: number,
  out: Float64Array,
): number {
  const x0 = px[x];
  const x1 = py[x];
  const x2 = pz[x];
  switch (type) {
    case 'tet1': {
      unitTo(0, px[r0] - x0, py[r0] - x1, pz[r0] - x2);
      unitTo(3, px[r1] - x0, py[r1] - x1, pz[r1] - x2);
      unitTo(6, px[r2] - x0, py[r2] - x1, pz[r2] - x2);
      unitTo(9, -(W[0] + W[3] + W[6]), -(W[1] + W[4] + W[7]), -(W[2] + W[5] + W[8]));
      out[0] = x0 + len * W[9];
      out[1] = x1 + len * W[10];
      out[2] = x2 + len * W[11];
      return 1;
    }
    case 'tri1': {
      unitTo(0, px[r0] - x0, py[r0] - x1, pz[r0] - x2);
      unitTo(3, px[r1] - x0, py[r1] - x1, pz[r1] - x2);
      unitTo(6, -(W[0] + W[3]), -(W[1] + W[4]), -(W[2] + W[5]));
      out[0] = x0 + len * W[6];
      out[1] = x1 + len * W[7];
      out[2] = x2 + len * W[8];
      return 1;
    }
    case 'tet2': {
      unitTo(0, px[r0] - x0, py[r0] - x1, pz[r0] - x2);
      unitTo(3, px[r1] - x0, py[r1] - x1, pz[r1] - x2);
      const a0 = W[0];
      const a1 = W[1];
      const a2 = W[2];
      const b0 = W[3];
      const b1 = W[4];
      const b2 = W[5];
      unitTo(6, -(a0 + b0), -(a1 + b1), -(a2 + b2));
      unitTo(9, a1 * b2 - a2 * b1, a2 * b0 - a0 * b2, a0 * b1 - a1 * b0);
      const c = COS_HALF_TETRA;
      const s = SIN_HALF_TETRA;
      out[0] = x0 + len * (c * W[6] + s * W[9]);
      out[1] = x1 + len * (c * W[7] + s * W[10]);
      out[2] = x2 + len * (c * W[8] + s * W[11]);
      out[3] = x0 + len * (c * W[6] - s * W[9]);
      out[4] = x1 + len * (c * W[7] - s * W[10]);
      out[5] = x2 + len * (c * W[8] - s * W[11]);
      return 2;
    }
    case 'methyl':
      // staggered: torsion Z–Y–X–H at 180°, +60°, −60°
      nerfFrame(px[r1], py[r1], pz[r1], px[r0], py[r0], pz[r0], x0, x1, x2);
      placeInFrame(out, 0, x0, x1, x2, len, TETRA_DEG, 180);
      placeInFrame(out, 3, x0, x1, x2, len, TETRA_DEG, 60);
      placeInFrame(out, 6, x0, x1, x2, len, TETRA_DEG, -60);
      return 3;
    case 'hydroxyl':
      nerfFrame(px[r1], py[r1], pz[r1], px[r0], py[r0], pz[r0], x0, x1, x2);
      placeInFrame(out, 0, x0, x1, x2, len, TETRA_DEG, 180);
      return 1;
    case 'planar2':
      // sp2 NH2 in the plane of Y and Z: one H cis, one trans to Z (120° angles)
      nerfFrame(px[r1], py[r1], pz[r1], px[r0], py[r0], pz[r0], x0, x1, x2);
      placeInFrame(out, 0, x0, x1, x2, len, 120, 0);
      placeInFrame(out, 3, x0, x1, x2, len, 120, 180);
      return 2;
  }
}

const GROUP_TYPES: GroupType[] = ['tet1', 'tet2', 'tri1', 'methyl', 'hydroxyl', 'planar2'];

function lengthFor(conv: XhConvention, parentEl: El, type: GroupType): number {
  const t = XH_LENGTHS_A[conv];
  if (parentEl === El.C) return t[`C-${type === 'hydroxyl' || type === 'planar2' ? 'tet2' : type}`];
  if (parentEl === El.N) return t.N;
  if (parentEl === El.O) return t.O;
  return t.S;
}

/**
 * Growable column store of the all-atom set (no object per atom): the model's atoms first, then
 * the added hydrogens, written in place, so the result needs no second copy.
 */
class AtomColumns {
  n = 0;
  cap: number;
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
  element: Uint8Array;
  residue: Int32Array;
  altloc: Int32Array;
  name: Int32Array;
  parent: Int32Array;
  rotatable: Uint8Array;
  constructor(cap: number) {
    this.cap = Math.max(16, cap);
    this.x = new Float64Array(this.cap);
    this.y = new Float64Array(this.cap);
    this.z = new Float64Array(this.cap);
    this.element = new Uint8Array(this.cap);
    this.residue = new Int32Array(this.cap);
    this.altloc = new Int32Array(this.cap);
    this.name = new Int32Array(this.cap);
    this.parent = new Int32Array(this.cap);
    this.rotatable = new Uint8Array(this.cap);
  }
  private grow(): void {
    this.cap *= 2;
    const g = <T extends Float64Array | Int32Array | Uint8Array>(a: T): T => {
      const b = new (a.constructor as new (n: number) => T)(this.cap);
      b.set(a);
      return b;
    };
    this.x = g(this.x);
    this.y = g(this.y);
    this.z = g(this.z);
    this.element = g(this.element);
    this.residue = g(this.residue);
    this.altloc = g(this.altloc);
    this.name = g(this.name);
    this.parent = g(this.parent);
    this.rotatable = g(this.rotatable);
  }
  /** appends an added hydrogen */
  push(
    x: number,
    y: number,
    z: number,
    residue: number,
    altloc: number,
    name: number,
    parent: number,
    rotatable: boolean,
  ): void {
    if (this.n === this.cap) this.grow();
    const i = this.n++;
    this.x[i] = x;
    this.y[i] = y;
    this.z[i] = z;
    this.element[i] = El.H;
    this.residue[i] = residue;
    this.altloc[i] = altloc;
    this.name[i] = name;
    this.parent[i] = parent;
    this.rotatable[i] = rotatable ? 1 : 0;
  }
}

/** A group spec with atom names resolved to indices into the name table. */
type ResolvedSpec = [parent: number, names: number[], type: GroupType, refs: number[]];

/**
 * Add riding hydrogens to every protein residue conformer of `model` that has no hydrogens.
 * Returns the combined atom set; the model itself is not changed.
 */
export function addRidingHydrogens(
  structure: Structure,
  model: Model,
  convention: XhConvention = OVERLAP_XH_CONVENTION,
  table?: ConformerTable,
  options: { ignoreDeposited?: boolean } = {},
): AllAtomModel {
  const t = table ?? buildConformers(structure, model);
  const S = structure.strings;
  const atoms = model.atoms;
  const { kind, parent: parentName, atomStart, atomEnd } = model.residues;
  // Name table: the structure's strings, then H names it lacks. Model atoms keep their indices.
  const names = S.slice();
  const nameIndex = new Map<string, number>();
  for (let i = names.length - 1; i >= 0; i--) nameIndex.set(names[i], i);
  const intern = (nm: string): number => {
    let i = nameIndex.get(nm);
    if (i === undefined) {
      i = names.length;
      names.push(nm);
      nameIndex.set(nm, i);
    }
    return i;
  };
  const lengthCache = new Map<number, number>();
  const lengthOf = (e: number, type: GroupType): number => {
    const key = e * 8 + GROUP_TYPES.indexOf(type);
    let l = lengthCache.get(key);
    if (l === undefined) {
      l = lengthFor(convention, e as El, type);
      lengthCache.set(key, l);
    }
    return l;
  };
  const elOfStr = new Uint8Array(S.length);
  for (let i = 0; i < S.length; i++) elOfStr[i] = elementCode(S[i]);
  const m = atoms.count;
  let deposited = 0;
  const hasH = new Uint8Array(model.residues.count);
  for (let i = 0; i < m; i++)
    if (elOfStr[atoms.element[i]] === El.H) {
      deposited++;
      hasH[atoms.residue[i]] = 1;
    }
  const resolved = new Map<string, ResolvedSpec[]>();
  const specsFor = (res: string): ResolvedSpec[] => {
    let r = resolved.get(res);
    if (!r) {
      r = (SIDE_CHAIN[res] ?? []).map(([p, nm, ty, refs]) => [
        intern(p),
        nm.map(intern),
        ty,
        refs.map(intern),
      ]);
      resolved.set(res, r);
    }
    return r;
  };
  const nH = intern('H');
  const nH123 = ['H1', 'H2', 'H3'].map(intern);
  const nHA = intern('HA');
  const nHA23 = ['HA2', 'HA3'].map(intern);
  for (const res of Object.keys(SIDE_CHAIN)) specsFor(res); // intern every name before sizing `slot`
  // slot[name] = atom index of the current conformer, -1 otherwise (reset after each conformer)
  const slot = new Int32Array(names.length).fill(-1);
  // room for the model's atoms and about one added H per heavy atom (grows if needed)
  const out = new AtomColumns(m + Math.ceil(m * 1.1));
  out.x.set(atoms.x);
  out.y.set(atoms.y);
  out.z.set(atoms.z);
  out.residue.set(atoms.residue);
  out.altloc.set(atoms.altloc);
  out.name.set(atoms.name);
  for (let i = 0; i < m; i++) out.element[i] = elOfStr[atoms.element[i]];
  out.parent.fill(-1, 0, m);
  out.n = m;
  const ax = atoms.x;
  const ay = atoms.y;
  const az = atoms.z;
  const ps = new Float64Array(9);
  // conformer state read by `emit` (set at the top of each conformer)
  let r = 0;
  let firstConformer = true;
  let confAlt = 0;
  /** adds a group's H (references r0..r2, -1 where unused) to this conformer */
  const emit = (
    parentAtom: number,
    hNames: readonly number[],
    type: GroupType,
    r0: number,
    r1: number,
    r2: number,
  ): void => {
    // An H whose parent and references are all shared atoms is added once (first conformer);
    // otherwise it belongs to this conformer's altloc.
    const shared =
      atoms.altloc[parentAtom] === 0 &&
      atoms.altloc[r0] === 0 &&
      (r1 < 0 || atoms.altloc[r1] === 0) &&
      (r2 < 0 || atoms.altloc[r2] === 0);
    if (shared && !firstConformer) return;
    const hAlt = shared ? 0 : confAlt;
    const len = lengthOf(elOfStr[atoms.element[parentAtom]], type);
    const count = groupPositionsInto(type, ax, ay, az, parentAtom, r0, r1, r2, len, ps);
    const rot = isRotatableGroup(type);
    for (let h = 0; h < count; h++)
      out.push(ps[3 * h], ps[3 * h + 1], ps[3 * h + 2], r, hAlt, hNames[h], parentAtom, rot);
  };
  const nHs = [nH];
  const nHAs = [nHA];

  for (let k = 0; k < t.count; k++) {
    r = t.residue[k];
    if (kind[r] !== ResidueKind.Protein || (hasH[r] && !options.ignoreDeposited)) continue;
    firstConformer = k === t.firstOfResidue[r];
    confAlt = t.altloc[k];
    const res = S[parentName[r]];
    const n = t.n[k];
    const ca = t.ca[k];
    const c = t.c[k];
    // Backbone amide H (not Pro): in the peptide plane, bisecting C(i−1)–N–CA outward.
    if (n >= 0 && ca >= 0 && res !== 'PRO') {
      const p = t.prev[k];
      if (p >= 0 && t.c[p] >= 0) emit(n, nHs, 'tri1', ca, t.c[p], -1);
      else if (t.prev[k] < 0 && t.breakBefore[k] === 0 && c >= 0)
        emit(n, nH123, 'methyl', ca, c, -1);
    }
    if (ca >= 0 && n >= 0 && c >= 0) {
      if (res === 'GLY') emit(ca, nHA23, 'tet2', n, c, -1);
      else if (t.cb[k] >= 0) emit(ca, nHAs, 'tet1', n, c, t.cb[k]);
    }
    const specs = specsFor(res);
    if (specs.length === 0) continue;
    // this conformer's atoms by name (its altloc preferred over shared atoms)
    for (let i = atomStart[r]; i < atomEnd[r]; i++) {
      const a = atoms.altloc[i];
      if (confAlt === 0 || a === 0 || a === confAlt) {
        const nm = atoms.name[i];
        const cur = slot[nm];
        if (cur < 0 || (a === confAlt && confAlt !== 0 && atoms.altloc[cur] === 0)) slot[nm] = i;
      }
    }
    for (const [par, hNames, type, refs] of specs) {
      const pa = slot[par];
      if (pa < 0) continue;
      // up to three references (tet1); -1 marks an unused slot
      const q0 = slot[refs[0]];
      const q1 = refs.length > 1 ? slot[refs[1]] : -1;
      const q2 = refs.length > 2 ? slot[refs[2]] : -1;
      if (q0 < 0 || (refs.length > 1 && q1 < 0) || (refs.length > 2 && q2 < 0)) continue;
      emit(pa, hNames, type, q0, q1, q2);
    }
    for (let i = atomStart[r]; i < atomEnd[r]; i++) slot[atoms.name[i]] = -1;
  }

  const total = out.n;
  const added = total - m;
  return {
    count: total,
    modelAtoms: m,
    x: out.x.subarray(0, total),
    y: out.y.subarray(0, total),
    z: out.z.subarray(0, total),
    element: out.element.subarray(0, total),
    residue: out.residue.subarray(0, total),
    altloc: out.altloc.subarray(0, total),
    name: out.name.subarray(0, total),
    names,
    parent: out.parent.subarray(0, total),
    rotatable: out.rotatable.subarray(0, total),
    addedHydrogens: added,
    depositedHydrogens: deposited,
    convention,
  };
}
