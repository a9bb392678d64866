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

type V = [number, number, number];

function unit(a: V): V {
  const l = Math.hypot(a[0], a[1], a[2]);
  return [a[0] / l, a[1] / l, a[2] / l];
}

/** NeRF placement: D with |CD| = len, angle B–C–D, torsion A–B–C–D. */
function place(a: V, b: V, c: V, len: number, angleDeg: number, torsionDeg: number): V {
  const bc = unit([c[0] - b[0], c[1] - b[1], c[2] - b[2]]);
  const ab: V = [b[0] - a[0], b[1] - a[1], b[2] - a[2]];
  const n = unit([
    ab[1] * bc[2] - ab[2] * bc[1],
    ab[2] * bc[0] - ab[0] * bc[2],
    ab[0] * bc[1] - ab[1] * bc[0],
  ]);
  const m: V = [
    n[1] * bc[2] - n[2] * bc[1],
    n[2] * bc[0] - n[0] * bc[2],
    n[0] * bc[1] - n[1] * bc[0],
  ];
  const th = (angleDeg * Math.PI) / 180;
  const ph = (torsionDeg * Math.PI) / 180;
  const dx = -len * Math.cos(th);
  const dy = len * Math.sin(th) * Math.cos(ph);
  const dz = len * Math.sin(th) * Math.sin(ph);
  return [
    c[0] + dx * bc[0] + dy * m[0] + dz * n[0],
    c[1] + dx * bc[1] + dy * m[1] + dz * n[1],
    c[2] + dx * bc[2] + dy * m[2] + dz * n[2],
  ];
}

/** Tetrahedral angle (109.5°, common practice) and half of the H–C–H angle of a methylene. */
const TETRA_DEG = 109.5;

/** Positions of a group's hydrogens from the parent X and its reference atoms. */
export function groupPositions(type: GroupType, x: V, refs: V[], len: number): V[] {
  const u = (r: V): V => unit([r[0] - x[0], r[1] - x[1], r[2] - x[2]]);
  const along = (d: V): V => [x[0] + len * d[0], x[1] + len * d[1], x[2] + len * d[2]];
  switch (type) {
    case 'tet1': {
      const a = u(refs[0]);
      const b = u(refs[1]);
      const c = u(refs[2]);
      return [along(unit([-(a[0] + b[0] + c[0]), -(a[1] + b[1] + c[1]), -(a[2] + b[2] + c[2])]))];
    }
    case 'tri1': {
      const a = u(refs[0]);
      const b = u(refs[1]);
      return [along(unit([-(a[0] + b[0]), -(a[1] + b[1]), -(a[2] + b[2])]))];
    }
    case 'tet2': {
      const a = u(refs[0]);
      const b = u(refs[1]);
      const d = unit([-(a[0] + b[0]), -(a[1] + b[1]), -(a[2] + b[2])]);
      const p = unit([
        a[1] * b[2] - a[2] * b[1],
        a[2] * b[0] - a[0] * b[2],
        a[0] * b[1] - a[1] * b[0],
      ]);
      const half = ((TETRA_DEG / 2) * Math.PI) / 180;
      const c = Math.cos(half);
      const s = Math.sin(half);
      return [
        along([c * d[0] + s * p[0], c * d[1] + s * p[1], c * d[2] + s * p[2]]),
        along([c * d[0] - s * p[0], c * d[1] - s * p[1], c * d[2] - s * p[2]]),
      ];
    }
    case 'methyl':
      // staggered: torsion Z–Y–X–H at 180°, +60°, −60°
      return [180, 60, -60].map((t) => place(refs[1], refs[0], x, len, TETRA_DEG, t));
    case 'hydroxyl':
      return [place(refs[1], refs[0], x, len, TETRA_DEG, 180)];
    case 'planar2':
      // sp2 NH2 in the plane of Y and Z: one H cis, one trans to Z (120° angles)
      return [place(refs[1], refs[0], x, len, 120, 0), place(refs[1], refs[0], x, len, 120, 180)];
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

/** Growable column store for the added hydrogens (no object per atom). */
class AddedColumns {
  n = 0;
  cap: number;
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
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
    this.residue = g(this.residue);
    this.altloc = g(this.altloc);
    this.name = g(this.name);
    this.parent = g(this.parent);
    this.rotatable = g(this.rotatable);
  }
  push(
    p: V,
    residue: number,
    altloc: number,
    name: number,
    parent: number,
    rotatable: boolean,
  ): void {
    if (this.n === this.cap) this.grow();
    const i = this.n++;
    this.x[i] = p[0];
    this.y[i] = p[1];
    this.z[i] = p[2];
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
  const out = new AddedColumns(Math.ceil(m * 1.1));
  const ax = atoms.x;
  const ay = atoms.y;
  const az = atoms.z;
  const pos = (i: number): V => [ax[i], ay[i], az[i]];

  for (let k = 0; k < t.count; k++) {
    const r = t.residue[k];
    if (kind[r] !== ResidueKind.Protein || (hasH[r] && !options.ignoreDeposited)) continue;
    const firstConformer = k === t.firstOfResidue[r];
    const confAlt = t.altloc[k];
    const res = S[parentName[r]];
    const emit = (parentAtom: number, hNames: number[], type: GroupType, refIdx: number[]) => {
      // An H whose parent and references are all shared atoms is added once (first conformer);
      // otherwise it belongs to this conformer's altloc.
      let shared = atoms.altloc[parentAtom] === 0;
      for (const q of refIdx) if (atoms.altloc[q] !== 0) shared = false;
      if (shared && !firstConformer) return;
      const hAlt = shared ? 0 : confAlt;
      const len = lengthOf(elOfStr[atoms.element[parentAtom]], type);
      const ps = groupPositions(type, pos(parentAtom), refIdx.map(pos), len);
      const rot = isRotatableGroup(type);
      for (let h = 0; h < ps.length; h++) out.push(ps[h], r, hAlt, hNames[h], parentAtom, rot);
    };
    const n = t.n[k];
    const ca = t.ca[k];
    const c = t.c[k];
    // Backbone amide H (not Pro): in the peptide plane, bisecting C(i−1)–N–CA outward.
    if (n >= 0 && ca >= 0 && res !== 'PRO') {
      const p = t.prev[k];
      if (p >= 0 && t.c[p] >= 0) emit(n, [nH], 'tri1', [ca, t.c[p]]);
      else if (t.prev[k] < 0 && t.breakBefore[k] === 0 && c >= 0) emit(n, nH123, 'methyl', [ca, c]);
    }
    if (ca >= 0 && n >= 0 && c >= 0) {
      if (res === 'GLY') emit(ca, nHA23, 'tet2', [n, c]);
      else if (t.cb[k] >= 0) emit(ca, [nHA], 'tet1', [n, c, t.cb[k]]);
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
      const ri: number[] = [];
      for (const rn of refs) {
        const q = slot[rn];
        if (q < 0) break;
        ri.push(q);
      }
      if (ri.length === refs.length) emit(pa, hNames, type, ri);
    }
    for (let i = atomStart[r]; i < atomEnd[r]; i++) slot[atoms.name[i]] = -1;
  }

  const added = out.n;
  const total = m + added;
  const element = new Uint8Array(total);
  for (let i = 0; i < m; i++) element[i] = elOfStr[atoms.element[i]];
  element.fill(El.H, m);
  const cat = <T extends Float64Array | Int32Array | Uint8Array>(
    a: ArrayLike<number>,
    b: T,
    make: new (n: number) => T,
  ): T => {
    const o = new make(total);
    o.set(a as unknown as T);
    o.set(b.subarray(0, added) as T, m);
    return o;
  };
  const parent = new Int32Array(total).fill(-1);
  parent.set(out.parent.subarray(0, added), m);
  const rotatable = new Uint8Array(total);
  rotatable.set(out.rotatable.subarray(0, added), m);
  return {
    count: total,
    modelAtoms: m,
    x: cat(atoms.x, out.x, Float64Array),
    y: cat(atoms.y, out.y, Float64Array),
    z: cat(atoms.z, out.z, Float64Array),
    element,
    residue: cat(atoms.residue, out.residue, Int32Array),
    altloc: cat(atoms.altloc, out.altloc, Int32Array),
    name: cat(atoms.name, out.name, Int32Array),
    names,
    parent,
    rotatable,
    addedHydrogens: added,
    depositedHydrogens: deposited,
    convention,
  };
}
