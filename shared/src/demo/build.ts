/**
 * Demo structures: invented protein models with ideal backbone geometry built from internal
 * coordinates (Engh & Huber 2001 values of validation/ideal/engh-huber.ts, so every backbone
 * and Cβ term sits exactly at its ideal value) and a few deliberate faults the engine must find:
 * a cis peptide before a non-Pro residue, a residue with inverted CA chirality (D), and a
 * stretched bond. Everything here is invented (names, sequences, the lab); the models are
 * written as PDBx/mmCIF by our own writer (`writeMmcif`).
 *
 * `buildDemoStructures()` is what the service's seed step calls.
 */
import {
  caCbBond,
  BACKBONE_BONDS,
  BACKBONE_ANGLES,
  PEPTIDE_ANGLES,
  PEPTIDE_BOND,
  cNCaAngle,
  residueClass,
} from '../validation/ideal/engh-huber';
import { idealCb } from '../validation/chirality';
import { placeAtom } from '../geometry/place';
import type { Vec3 } from '../geometry/place';
import { ONE_TO_THREE, SIDE_CHAINS } from './sidechains';
import { atomSiteLoopHeader } from '../model/tile';

export type DemoFaultKind = 'cis-peptide' | 'd-residue' | 'stretched-bond';

export interface DemoFault {
  kind: DemoFaultKind;
  chain: string;
  /** author residue number; for a cis peptide, the residue before the peptide bond */
  seq: number;
  /** for a stretched bond: the two atoms and the added length */
  atoms?: [string, string];
  addA?: number;
}

export interface DemoChainSpec {
  id: string;
  description: string;
  /** one-letter codes from ONE_TO_THREE */
  sequence: string;
  firstSeq: number;
  /** (phi, psi) per residue, degrees */
  phiPsi: [number, number][];
  /** chi angles per residue type; missing ones are 180° */
  chi?: Partial<Record<string, number[]>>;
}

export interface DemoSpec {
  id: string;
  title: string;
  chains: DemoChainSpec[];
  faults: DemoFault[];
  /** rigid placement of each chain after building: 'bundle' packs chains as parallel/antiparallel helices */
  layout: 'as-built' | 'bundle';
}

export interface DemoAtom {
  chain: string;
  entity: number;
  labelSeq: number;
  seq: number;
  resName: string;
  name: string;
  element: string;
  xyz: Vec3;
  b: number;
}

export interface DemoStructure {
  id: string;
  fileName: string;
  title: string;
  /** PDBx/mmCIF text */
  cif: string;
  faults: DemoFault[];
  atoms: number;
  residues: number;
}

/** Typical rotamer choices for the demo side chains (common practice, no source). */
const DEFAULT_CHI: Record<string, number[]> = {
  SER: [-65],
  THR: [-60],
  VAL: [175],
  ILE: [-65, 170],
  LEU: [-65, 175],
  LYS: [-65, 180, 180, 180],
  GLU: [-65, 180, 0],
  GLN: [-65, 180, 0],
  ASP: [-70, -15],
  ASN: [-70, -20],
};

function buildChain(spec: DemoChainSpec, faults: DemoFault[], entity: number): DemoAtom[] {
  const names = [...spec.sequence].map((c) => {
    const n = ONE_TO_THREE[c];
    if (!n)
      throw new Error(
        `Demo sequence letter ${c} has no side-chain template; use one of ${Object.keys(ONE_TO_THREE).join('')}.`,
      );
    return n;
  });
  if (spec.phiPsi.length !== names.length)
    throw new Error(`Demo chain ${spec.id} needs one (phi, psi) per residue.`);
  const seqOf = (i: number): number => spec.firstSeq + i;
  const fault = (kind: DemoFaultKind, i: number): DemoFault | undefined =>
    faults.find((f) => f.kind === kind && f.chain === spec.id && f.seq === seqOf(i));
  const stretch = (i: number, a: string, b: string): number => {
    const f = fault('stretched-bond', i);
    return f &&
      f.atoms &&
      ((f.atoms[0] === a && f.atoms[1] === b) || (f.atoms[0] === b && f.atoms[1] === a))
      ? (f.addA ?? 0)
      : 0;
  };
  const bb: { N: Vec3; CA: Vec3; C: Vec3 }[] = [];
  // Seed frame for the first residue.
  const cls0 = residueClass(names[0]);
  const n0: Vec3 = [0, 0, 0];
  const ca0: Vec3 = [BACKBONE_BONDS['N-CA'][cls0].ideal + stretch(0, 'N', 'CA'), 0, 0];
  const a0 = (BACKBONE_ANGLES['N-CA-C'][cls0].ideal * Math.PI) / 180;
  const lc = BACKBONE_BONDS['CA-C'][cls0].ideal + stretch(0, 'CA', 'C');
  const c0: Vec3 = [ca0[0] - lc * Math.cos(a0), lc * Math.sin(a0), 0];
  bb.push({ N: n0, CA: ca0, C: c0 });
  for (let i = 1; i < names.length; i++) {
    const prev = bb[i - 1];
    const pcls = residueClass(names[i - 1]);
    const cls = residueClass(names[i]);
    const pepCls = names[i] === 'PRO' ? 'pro' : pcls === 'gly' ? 'gly' : 'general';
    const cis = fault('cis-peptide', i - 1) !== undefined;
    const omega = cis ? 0 : 180;
    const N = placeAtom(
      prev.N,
      prev.CA,
      prev.C,
      PEPTIDE_BOND[pepCls].ideal + stretch(i - 1, 'C', 'N+'),
      PEPTIDE_ANGLES['CA-C-N'][pepCls].ideal,
      spec.phiPsi[i - 1][1],
    );
    const CA = placeAtom(
      prev.CA,
      prev.C,
      N,
      BACKBONE_BONDS['N-CA'][cls].ideal + stretch(i, 'N', 'CA'),
      cNCaAngle(names[i], cis).ideal,
      omega,
    );
    const C = placeAtom(
      prev.C,
      N,
      CA,
      BACKBONE_BONDS['CA-C'][cls].ideal + stretch(i, 'CA', 'C'),
      BACKBONE_ANGLES['N-CA-C'][cls].ideal,
      spec.phiPsi[i][0],
    );
    bb.push({ N, CA, C });
  }
  const atoms: DemoAtom[] = [];
  names.forEach((resName, i) => {
    const { N, CA, C } = bb[i];
    const cls = residueClass(resName);
    const pos = new Map<string, Vec3>([
      ['N', N],
      ['CA', CA],
      ['C', C],
    ]);
    // O opposite N(i+1) in the peptide plane: torsion N–CA–C–O = psi + 180°.
    const O = placeAtom(
      N,
      CA,
      C,
      BACKBONE_BONDS['C-O'][cls].ideal + stretch(i, 'C', 'O'),
      BACKBONE_ANGLES['CA-C-O'][cls].ideal,
      spec.phiPsi[i][1] + 180,
    );
    pos.set('O', O);
    if (resName !== 'GLY') {
      let cb = idealCb(N, CA, C, resName)!;
      const extra = stretch(i, 'CA', 'CB');
      if (extra) {
        const d = caCbBond(resName).ideal;
        cb = [
          CA[0] + ((cb[0] - CA[0]) * (d + extra)) / d,
          CA[1] + ((cb[1] - CA[1]) * (d + extra)) / d,
          CA[2] + ((cb[2] - CA[2]) * (d + extra)) / d,
        ];
      }
      if (fault('d-residue', i)) cb = mirrorThroughPlane(cb, N, CA, C);
      pos.set('CB', cb);
      const chi = spec.chi?.[resName] ?? DEFAULT_CHI[resName] ?? [];
      for (const sc of SIDE_CHAINS[resName]) {
        const t = sc.chi === 0 ? sc.offsetDeg : (chi[sc.chi - 1] ?? 180) + sc.offsetDeg;
        pos.set(
          sc.name,
          placeAtom(
            pos.get(sc.from[0])!,
            pos.get(sc.from[1])!,
            pos.get(sc.from[2])!,
            sc.bondA,
            sc.angleDeg,
            t,
          ),
        );
      }
    }
    if (i === names.length - 1) {
      // Terminal carboxylate: OXT in the peptide plane, opposite O (torsion N–CA–C–OXT = psi).
      pos.set(
        'OXT',
        placeAtom(
          N,
          CA,
          C,
          BACKBONE_BONDS['C-O'][cls].ideal,
          BACKBONE_ANGLES['CA-C-O'][cls].ideal,
          spec.phiPsi[i][1],
        ),
      );
    }
    const order = ['N', 'CA', 'C', 'O', 'CB', ...SIDE_CHAINS[resName].map((s) => s.name), 'OXT'];
    for (const name of order) {
      const xyz = pos.get(name);
      if (!xyz) continue;
      const element =
        name === 'OXT'
          ? 'O'
          : (SIDE_CHAINS[resName].find((s) => s.name === name)?.element ?? name[0]);
      // Invented B-factors: low in the middle of the chain, higher at the ends and on side chains.
      const fromEnd = Math.min(i, names.length - 1 - i);
      const b = 12 + 18 / (1 + fromEnd) + (['N', 'CA', 'C', 'O'].includes(name) ? 0 : 4);
      atoms.push({
        chain: spec.id,
        entity,
        labelSeq: i + 1,
        seq: seqOf(i),
        resName,
        name,
        element,
        xyz,
        b,
      });
    }
  });
  return atoms;
}

function mirrorThroughPlane(p: Vec3, a: Vec3, b: Vec3, c: Vec3): Vec3 {
  const u: Vec3 = [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
  const v: Vec3 = [c[0] - b[0], c[1] - b[1], c[2] - b[2]];
  const n: Vec3 = [u[1] * v[2] - u[2] * v[1], u[2] * v[0] - u[0] * v[2], u[0] * v[1] - u[1] * v[0]];
  const l = Math.hypot(n[0], n[1], n[2]);
  const w: Vec3 = [n[0] / l, n[1] / l, n[2] / l];
  const d = (p[0] - b[0]) * w[0] + (p[1] - b[1]) * w[1] + (p[2] - b[2]) * w[2];
  return [p[0] - 2 * d * w[0], p[1] - 2 * d * w[1], p[2] - 2 * d * w[2]];
}

/** Helix axis of a chain from the centroids of its first and last four CA atoms. */
function placeAsBundle(chains: DemoAtom[][]): void {
  const radiusA = 9.0; // inter-axis distance ≈ 15.6 Å: a loose invented bundle without clashes
  chains.forEach((atoms, k) => {
    const ca = atoms.filter((a) => a.name === 'CA').map((a) => a.xyz);
    const mean = (pts: Vec3[]): Vec3 =>
      [0, 1, 2].map((d) => pts.reduce((s, p) => s + p[d], 0) / pts.length) as Vec3;
    const start = mean(ca.slice(0, 4));
    const end = mean(ca.slice(-4));
    const centre = mean(ca);
    let axis: Vec3 = [end[0] - start[0], end[1] - start[1], end[2] - start[2]];
    const l = Math.hypot(axis[0], axis[1], axis[2]);
    axis = [axis[0] / l, axis[1] / l, axis[2] / l];
    // Rotation taking axis to +z (or −z for antiparallel odd chains), then about z by 120°·k.
    const target: Vec3 = k % 2 === 0 ? [0, 0, 1] : [0, 0, -1];
    const R = rotationBetween(axis, target);
    const phi = (2 * Math.PI * k) / chains.length;
    const cz = Math.cos(phi);
    const sz = Math.sin(phi);
    for (const a of atoms) {
      const p: Vec3 = [a.xyz[0] - centre[0], a.xyz[1] - centre[1], a.xyz[2] - centre[2]];
      const q: Vec3 = [
        R[0] * p[0] + R[1] * p[1] + R[2] * p[2],
        R[3] * p[0] + R[4] * p[1] + R[5] * p[2],
        R[6] * p[0] + R[7] * p[1] + R[8] * p[2],
      ];
      a.xyz = [cz * q[0] - sz * q[1] + radiusA * cz, sz * q[0] + cz * q[1] + radiusA * sz, q[2]];
    }
  });
}

/** Rotation matrix (row-major) turning unit vector a onto unit vector b (Rodrigues). */
function rotationBetween(a: Vec3, b: Vec3): number[] {
  const v: Vec3 = [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
  const c = a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
  if (c < -0.999999) return [1, 0, 0, 0, -1, 0, 0, 0, -1]; // 180° about x
  const k = 1 / (1 + c);
  return [
    v[0] * v[0] * k + c,
    v[0] * v[1] * k - v[2],
    v[0] * v[2] * k + v[1],
    v[1] * v[0] * k + v[2],
    v[1] * v[1] * k + c,
    v[1] * v[2] * k - v[0],
    v[2] * v[0] * k - v[1],
    v[2] * v[1] * k + v[0],
    v[2] * v[2] * k + c,
  ];
}

/** Quote a PDBx value when needed (STAR rules: spaces, quotes, leading special characters). */
function cifValue(s: string): string {
  if (s === '') return '?';
  if (/^[^\s'"_#$;[\]]\S*$/.test(s) && !/^(data_|loop_|save_|global_|stop_)/i.test(s)) return s;
  if (!s.includes("'")) return `'${s}'`;
  return `"${s}"`;
}

/** Writes the atoms as PDBx/mmCIF: entry, title, entities with sequences, and _atom_site. */
export function writeMmcif(spec: DemoSpec, atoms: DemoAtom[]): string {
  const out: string[] = [];
  out.push(
    `data_${spec.id}`,
    '#',
    `_entry.id ${spec.id}`,
    '#',
    `_struct.entry_id ${spec.id}`,
    `_struct.title ${cifValue(spec.title)}`,
    '#',
  );
  out.push('loop_', '_entity.id', '_entity.type', '_entity.pdbx_description');
  spec.chains.forEach((c, i) => out.push(`${i + 1} polymer ${cifValue(c.description)}`));
  out.push(
    '#',
    'loop_',
    '_entity_poly.entity_id',
    '_entity_poly.type',
    '_entity_poly.pdbx_seq_one_letter_code',
    '_entity_poly.pdbx_strand_id',
  );
  spec.chains.forEach((c, i) => out.push(`${i + 1} polypeptide(L) ${c.sequence} ${c.id}`));
  out.push(
    '#',
    'loop_',
    '_entity_poly_seq.entity_id',
    '_entity_poly_seq.num',
    '_entity_poly_seq.mon_id',
    '_entity_poly_seq.hetero',
  );
  spec.chains.forEach((c, i) =>
    [...c.sequence].forEach((l, j) => out.push(`${i + 1} ${j + 1} ${ONE_TO_THREE[l]} n`)),
  );
  out.push('#', 'loop_', '_struct_asym.id', '_struct_asym.entity_id');
  spec.chains.forEach((c, i) => out.push(`${c.id} ${i + 1}`));
  // Components and the residue-numbering scheme: readers that build polymers from the scheme
  // (rather than from _atom_site alone) need them.
  const comps = [
    ...new Set(spec.chains.flatMap((c) => [...c.sequence].map((l) => ONE_TO_THREE[l]))),
  ].sort();
  out.push('#', 'loop_', '_chem_comp.id', '_chem_comp.type');
  for (const c of comps)
    out.push(`${c} ${c === 'GLY' ? "'peptide linking'" : "'L-peptide linking'"}`);
  out.push('#', 'loop_');
  for (const item of [
    'asym_id',
    'entity_id',
    'seq_id',
    'mon_id',
    'ndb_seq_num',
    'pdb_seq_num',
    'auth_seq_num',
    'pdb_mon_id',
    'auth_mon_id',
    'pdb_strand_id',
    'pdb_ins_code',
    'hetero',
  ]) {
    out.push(`_pdbx_poly_seq_scheme.${item}`);
  }
  spec.chains.forEach((c, i) =>
    [...c.sequence].forEach((l, j) => {
      const m = ONE_TO_THREE[l];
      const n = c.firstSeq + j;
      out.push(`${c.id} ${i + 1} ${j + 1} ${m} ${j + 1} ${n} ${n} ${m} ${m} ${c.id} . n`);
    }),
  );
  out.push('#', ...atomSiteLoopHeader());
  atoms.forEach((a, i) => {
    out.push(
      [
        'ATOM',
        i + 1,
        a.element,
        a.name,
        '.',
        a.resName,
        a.chain,
        a.entity,
        a.labelSeq,
        '?',
        a.xyz[0].toFixed(3),
        a.xyz[1].toFixed(3),
        a.xyz[2].toFixed(3),
        '1.00',
        a.b.toFixed(2),
        '?',
        a.seq,
        a.resName,
        a.chain,
        a.name,
        1,
      ].join(' '),
    );
  });
  out.push('#', '');
  return out.join('\n');
}

export function buildDemoStructure(spec: DemoSpec): DemoStructure {
  const chains = spec.chains.map((c, i) => buildChain(c, spec.faults, i + 1));
  if (spec.layout === 'bundle') placeAsBundle(chains);
  const atoms = chains.flat();
  // -0.000 would make equal inputs print differently across platforms' zero signs: normalise.
  for (const a of atoms) a.xyz = a.xyz.map((v) => (Math.abs(v) < 5e-4 ? 0 : v)) as Vec3;
  return {
    id: spec.id,
    fileName: `${spec.id.toLowerCase()}.cif`,
    title: spec.title,
    cif: writeMmcif(spec, atoms),
    faults: spec.faults,
    atoms: atoms.length,
    residues: spec.chains.reduce((s, c) => s + c.sequence.length, 0),
  };
}

const helix = (n: number): [number, number][] =>
  Array.from({ length: n }, () => [-57, -47] as [number, number]);

/**
 * The two invented demo models of the Foldfolio demo lab.
 * - FFDM1, "Tribundlin": three helices (chains A, B, C) packed as a bundle; chain B residue 105
 *   (Ala) is modelled as D (inverted CA) and the N–CA bond of chain C residue 214 is stretched by 0.15 Å.
 * - FFDM2, "Loopwing hairpin": two β-strands joined by a two-residue turn, after a short tail;
 *   the peptide between residues 3 and 4 (Ser–Thr) is cis.
 */
export function demoSpecs(): DemoSpec[] {
  const seqA = 'SPEELLKKAEELLKKAEELLKKG'.replace('P', 'A');
  const seqB = 'SAEEALKKLEELAKKLEELAKKG';
  const seqC = 'SEELKKKLEELLKKAEELLKKNG';
  const bundle: DemoSpec = {
    id: 'FFDM1',
    title:
      'Tribundlin, an invented three-helix bundle (Foldfolio demo model with deliberate faults)',
    layout: 'bundle',
    chains: [
      {
        id: 'A',
        description: 'Tribundlin helix 1 (invented)',
        sequence: seqA,
        firstSeq: 1,
        phiPsi: helix(seqA.length),
      },
      {
        id: 'B',
        description: 'Tribundlin helix 2 (invented)',
        sequence: seqB,
        firstSeq: 101,
        phiPsi: helix(seqB.length),
      },
      {
        id: 'C',
        description: 'Tribundlin helix 3 (invented)',
        sequence: seqC,
        firstSeq: 201,
        phiPsi: helix(seqC.length),
      },
    ],
    faults: [
      { kind: 'd-residue', chain: 'B', seq: 105 },
      { kind: 'stretched-bond', chain: 'C', seq: 214, atoms: ['N', 'CA'], addA: 0.15 },
    ],
  };
  // β-strands (−110°, 125°) around an Asn–Gly type I' turn near (60°, 35°), (80°, 10°) (type I'
  // turn values near the classic ones, Sibanda & Thornton 1985, from memory; tuned so that the
  // invented model has no clashes).
  const strand = (n: number): [number, number][] =>
    Array.from({ length: n }, () => [-110, 125] as [number, number]);
  const seqH = 'GSSTKVEVAVNGKGTVEVKES';
  const phiPsiH: [number, number][] = [
    [-80, 150],
    [-80, 150],
    [-80, 150],
    ...strand(7),
    [60, 35],
    [80, 10],
    ...strand(9),
  ];
  const hairpin: DemoSpec = {
    id: 'FFDM2',
    title:
      'Loopwing, an invented beta-hairpin protein (Foldfolio demo model with a deliberate fault)',
    layout: 'as-built',
    chains: [
      {
        id: 'A',
        description: 'Loopwing hairpin (invented)',
        sequence: seqH,
        firstSeq: 1,
        phiPsi: phiPsiH,
      },
    ],
    faults: [{ kind: 'cis-peptide', chain: 'A', seq: 3 }],
  };
  return [bundle, hairpin];
}

/** The demo models as mmCIF text with their planted faults (called by the service's seed step). */
export function buildDemoStructures(): DemoStructure[] {
  return demoSpecs().map(buildDemoStructure);
}
