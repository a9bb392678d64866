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
import { buildConformers, conformerAtoms, type ConformerTable } from '../model/conformers';

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

function lengthFor(conv: XhConvention, parentEl: El, type: GroupType): number {
  const t = XH_LENGTHS_A[conv];
  if (parentEl === El.C) return t[`C-${type === 'hydroxyl' || type === 'planar2' ? 'tet2' : type}`];
  if (parentEl === El.N) return t.N;
  if (parentEl === El.O) return t.O;
  return t.S;
}

interface Pending {
  x: number;
  y: number;
  z: number;
  residue: number;
  altloc: number;
  name: string;
  parent: number;
  rotatable: boolean;
}

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
  const pending: Pending[] = [];
  let deposited = 0;
  for (let i = 0; i < atoms.count; i++) if (elementCode(S[atoms.element[i]]) === El.H) deposited++;
  const pos = (i: number): V => [atoms.x[i], atoms.y[i], atoms.z[i]];
  const hasH = new Uint8Array(model.residues.count);
  for (let r = 0; r < model.residues.count; r++)
    for (let i = atomStart[r]; i < atomEnd[r]; i++)
      if (elementCode(S[atoms.element[i]]) === El.H) hasH[r] = 1;

  for (let k = 0; k < t.count; k++) {
    const r = t.residue[k];
    if (kind[r] !== ResidueKind.Protein || (hasH[r] && !options.ignoreDeposited)) continue;
    const firstConformer = k === t.firstOfResidue[r];
    const confAlt = t.altloc[k];
    const res = S[parentName[r]];
    const map = conformerAtoms(structure, model, t, k);
    const emit = (parentAtom: number, names: string[], type: GroupType, refIdx: number[]) => {
      // An H whose parent and references are all shared atoms is added once (first conformer);
      // otherwise it belongs to this conformer's altloc.
      let shared = atoms.altloc[parentAtom] === 0;
      for (const q of refIdx) if (atoms.altloc[q] !== 0) shared = false;
      if (shared && !firstConformer) return;
      const hAlt = shared ? 0 : confAlt;
      const len = lengthFor(convention, elementCode(S[atoms.element[parentAtom]]), type);
      const ps = groupPositions(type, pos(parentAtom), refIdx.map(pos), len);
      for (let h = 0; h < ps.length; h++)
        pending.push({
          x: ps[h][0],
          y: ps[h][1],
          z: ps[h][2],
          residue: r,
          altloc: hAlt,
          name: names[h],
          parent: parentAtom,
          rotatable: isRotatableGroup(type),
        });
    };
    const n = t.n[k];
    const ca = t.ca[k];
    const c = t.c[k];
    // Backbone amide H (not Pro): in the peptide plane, bisecting C(i−1)–N–CA outward.
    if (n >= 0 && ca >= 0 && res !== 'PRO') {
      const p = t.prev[k];
      if (p >= 0 && t.c[p] >= 0) emit(n, ['H'], 'tri1', [ca, t.c[p]]);
      else if (t.prev[k] < 0 && t.breakBefore[k] === 0 && c >= 0)
        emit(n, ['H1', 'H2', 'H3'], 'methyl', [ca, c]);
    }
    if (ca >= 0 && n >= 0 && c >= 0) {
      if (res === 'GLY') emit(ca, ['HA2', 'HA3'], 'tet2', [n, c]);
      else if (t.cb[k] >= 0) emit(ca, ['HA'], 'tet1', [n, c, t.cb[k]]);
    }
    const specs = SIDE_CHAIN[res];
    if (!specs) continue;
    for (const [par, names, type, refs] of specs) {
      const pa = map.get(par);
      if (pa === undefined) continue;
      const ri: number[] = [];
      for (const rn of refs) {
        const q = map.get(rn);
        if (q === undefined) break;
        ri.push(q);
      }
      if (ri.length === refs.length) emit(pa, names, type, ri);
    }
  }

  const m = atoms.count;
  const total = m + pending.length;
  const out: AllAtomModel = {
    count: total,
    modelAtoms: m,
    x: new Float64Array(total),
    y: new Float64Array(total),
    z: new Float64Array(total),
    element: new Uint8Array(total),
    residue: new Int32Array(total),
    altloc: new Int32Array(total),
    name: new Int32Array(total),
    names: [],
    parent: new Int32Array(total).fill(-1),
    rotatable: new Uint8Array(total),
    addedHydrogens: pending.length,
    depositedHydrogens: deposited,
    convention,
  };
  const nameIndex = new Map<string, number>();
  const intern = (s: string): number => {
    let i = nameIndex.get(s);
    if (i === undefined) {
      i = out.names.length;
      out.names.push(s);
      nameIndex.set(s, i);
    }
    return i;
  };
  const elCache = new Map<number, El>();
  for (let i = 0; i < m; i++) {
    out.x[i] = atoms.x[i];
    out.y[i] = atoms.y[i];
    out.z[i] = atoms.z[i];
    let e = elCache.get(atoms.element[i]);
    if (e === undefined) {
      e = elementCode(S[atoms.element[i]]);
      elCache.set(atoms.element[i], e);
    }
    out.element[i] = e;
    out.residue[i] = atoms.residue[i];
    out.altloc[i] = atoms.altloc[i];
    out.name[i] = intern(S[atoms.name[i]]);
  }
  for (let h = 0; h < pending.length; h++) {
    const p = pending[h];
    const i = m + h;
    out.x[i] = p.x;
    out.y[i] = p.y;
    out.z[i] = p.z;
    out.element[i] = El.H;
    out.residue[i] = p.residue;
    out.altloc[i] = p.altloc;
    out.name[i] = intern(p.name);
    out.parent[i] = p.parent;
    out.rotatable[i] = p.rotatable ? 1 : 0;
  }
  return out;
}
