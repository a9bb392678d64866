/**
 * Covalent geometry of protein residues. Backbone: bonds and angles, CA–CB and the angles at CA
 * involving CB, and the peptide bond C(i)–N(i+1) with the angles across it, against the Engh &
 * Huber 2001 ideal values (`ideal/engh-huber.ts`). Side chains: every bond and bond angle beyond
 * CA–CB (from CA–CB–XG outward, ring angles, Pro CD–N and CD–N–CA; terms in
 * `ideal/sidechain-topology.ts`) against our own library built by Engh & Huber's method
 * (`ideal/sidechain-library.ts`, `reference/data/sidechain-geometry.json`). Both enter the same
 * RMSD, RMS-Z and the terms beyond 4σ (common practice, no source), reported per model.
 *
 * Only residues whose parent is a standard amino acid are measured (modified residues through
 * their parent, e.g. MSE as MET; side-chain atoms whose names differ from the parent's, like
 * MSE SE, are not measured); other components are skipped. Every conformer is measured
 * (altlocs: a residue is an outlier if any conformer is); a term shared by two conformers is
 * counted once per conformer. Terms across a chain break (C(i)–N(i+1) > 2.0 Å, see
 * model/conformers.ts) are not measured.
 */
import type { ConformerTable } from '../model/conformers';
import type { Model, Structure } from '../model/types';
import { ResidueKind } from '../model/types';
import { STANDARD_AMINO_ACIDS } from '../io/residue-tables';
import type { GeometryOutlier, GeometryStats } from '../report/types';
import {
  BACKBONE_ANGLES,
  BACKBONE_BONDS,
  PEPTIDE_ANGLES,
  PEPTIDE_BOND,
  caCbBond,
  cbAngles,
  cNCaAngle,
  residueClass,
} from './ideal/engh-huber';
import type { IdealValue } from './ideal/engh-huber';
import { defaultSideChainLibrary, type LoadedSideChainLibrary } from './ideal/sidechain-library';
import { stringIndex } from '../model/conformers';
import { angleDeg, distanceA } from '../geometry/vec';
import { torsionDeg } from '../geometry/torsion';

/** |z| above this is an outlier (common practice, no source). */
export const COVALENT_OUTLIER_Z = 4;

export interface CovalentTerm {
  /** conformer that owns the term (the first residue of a peptide term) */
  conformer: number;
  kind: 'bond' | 'angle';
  /** atom names, with a '+' suffix for atoms of the following residue */
  atoms: string[];
  observed: number;
  ideal: number;
  sigma: number;
  z: number;
}

export interface CovalentResult {
  bonds: GeometryStats;
  angles: GeometryStats;
  /** every term beyond 4σ, in conformer order */
  outliers: CovalentTerm[];
  /** largest |z| per conformer, NaN when nothing was measured */
  bondZMax: Float64Array;
  angleZMax: Float64Array;
  /** mean observed length of each backbone bond type (for checks against the ideal values) */
  meanBondA: Record<string, { mean: number; count: number }>;
}

export function parentName(structure: Structure, model: Model, residue: number): string {
  return structure.strings[model.residues.parent[residue]];
}

// Atom-name lists of the terms (one shared array each: also the keys of the mean-bond table).
const T_N_CA = ['N', 'CA'] as const;
const T_CA_C = ['CA', 'C'] as const;
const T_C_O = ['C', 'O'] as const;
const T_N_CA_C = ['N', 'CA', 'C'] as const;
const T_CA_C_O = ['CA', 'C', 'O'] as const;
const T_CA_CB = ['CA', 'CB'] as const;
const T_N_CA_CB = ['N', 'CA', 'CB'] as const;
const T_CB_CA_C = ['CB', 'CA', 'C'] as const;
const T_C_N = ['C', 'N+'] as const;
const T_CA_C_N = ['CA', 'C', 'N+'] as const;
const T_O_C_N = ['O', 'C', 'N+'] as const;
const T_C_N_CA = ['C', 'N+', 'CA+'] as const;

/** Per-call lookup of the side-chain terms: residue types by parent string index. */
interface SideChainLookup {
  /** parent string index → residue type number, -1 for none */
  typeOf: Int32Array;
  /** per type: atom-name string indices of its topology slots (-1 when absent from the file) */
  names: Int32Array[];
  ideals: ReturnType<LoadedSideChainLibrary['residues']['get']>[];
}

function sideChainLookup(structure: Structure, lib: LoadedSideChainLibrary): SideChainLookup {
  const typeOf = new Int32Array(structure.strings.length).fill(-1);
  const names: Int32Array[] = [];
  const ideals: SideChainLookup['ideals'] = [];
  for (const [res, ideal] of lib.residues) {
    const si = stringIndex(structure, res);
    if (si < 0) continue;
    typeOf[si] = names.length;
    names.push(Int32Array.from(ideal.topology.atoms, (a) => stringIndex(structure, a)));
    ideals.push(ideal);
  }
  return { typeOf, names, ideals };
}

/** Largest number of atoms in a side-chain topology (Trp: 11). */
const MAX_SLOTS = 16;

/** Receives one measured term: conformer, kind, atom names, observed value, ideal and σ. */
export type TermVisitor = (
  k: number,
  kind: 'bond' | 'angle',
  names: readonly string[],
  observed: number,
  ideal: number,
  sigma: number,
) => void;

/**
 * Measures the side-chain terms of conformer k (a standard amino acid or a modified one by its
 * parent) and hands each to `visit`. The topology's atoms are resolved once per conformer as
 * findAtom does (the conformer's altloc first, else the shared atom; without altloc the first
 * atom of the name) into `slots`; nothing is allocated per term.
 */
function measureSideChain(
  model: Model,
  t: ConformerTable,
  k: number,
  sc: SideChainLookup,
  slots: Int32Array,
  visit: TermVisitor,
): void {
  const r = t.residue[k];
  const type = sc.typeOf[model.residues.parent[r]];
  if (type < 0) return;
  const atoms = model.atoms;
  const atomName = atoms.name;
  const atomAlt = atoms.altloc;
  const want = sc.names[type];
  const m = want.length;
  const alt = t.altloc[k];
  slots.fill(-1, 0, m);
  for (let i = model.residues.atomStart[r]; i < model.residues.atomEnd[r]; i++) {
    const a = atomAlt[i];
    if (alt !== 0 && a !== 0 && a !== alt) continue;
    const nm = atomName[i];
    for (let s = 0; s < m; s++) {
      if (want[s] !== nm) continue;
      const prev = slots[s];
      if (prev < 0 || (alt !== 0 && a === alt && atomAlt[prev] === 0)) slots[s] = i;
      break;
    }
  }
  const id = sc.ideals[type]!;
  const topo = id.topology;
  const bs = topo.bondSlots;
  for (let b = 0; b < topo.bondKeys.length; b++) {
    const i = slots[bs[2 * b]];
    const j = slots[bs[2 * b + 1]];
    if (i < 0 || j < 0 || !(id.bondSigma[b] > 0)) continue;
    visit(k, 'bond', topo.bondNames[b], distanceA(atoms, i, j), id.bondIdeal[b], id.bondSigma[b]);
  }
  const as = topo.angleSlots;
  for (let g = 0; g < topo.angleKeys.length; g++) {
    const i = slots[as[3 * g]];
    const j = slots[as[3 * g + 1]];
    const l = slots[as[3 * g + 2]];
    if (i < 0 || j < 0 || l < 0 || !(id.angleSigma[g] > 0)) continue;
    visit(
      k,
      'angle',
      topo.angleNames[g],
      angleDeg(atoms, i, j, l),
      id.angleIdeal[g],
      id.angleSigma[g],
    );
  }
}

/**
 * Every side-chain term of every protein conformer whose parent is a standard amino acid, as
 * analyseCovalent measures them (same code), in conformer order (for checks and tools).
 */
export function forEachSideChainTerm(
  structure: Structure,
  model: Model,
  t: ConformerTable,
  visit: TermVisitor,
  library: LoadedSideChainLibrary = defaultSideChainLibrary(),
): void {
  const sc = sideChainLookup(structure, library);
  const slots = new Int32Array(MAX_SLOTS);
  for (let k = 0; k < t.count; k++) {
    const r = t.residue[k];
    if (model.residues.kind[r] !== ResidueKind.Protein) continue;
    if (!STANDARD_AMINO_ACIDS.has(parentName(structure, model, r))) continue;
    measureSideChain(model, t, k, sc, slots, visit);
  }
}

/** Measures every covalent term of every protein conformer of the model. */
export function analyseCovalent(
  structure: Structure,
  model: Model,
  t: ConformerTable,
  library: LoadedSideChainLibrary = defaultSideChainLibrary(),
): CovalentResult {
  const atoms = model.atoms;
  const bondZMax = new Float64Array(t.count).fill(NaN);
  const angleZMax = new Float64Array(t.count).fill(NaN);
  const sums = { bond: [0, 0, 0], angle: [0, 0, 0] }; // count, Σd², Σz²
  const outCount = { bond: 0, angle: 0 };
  const meanAcc = new Map<readonly string[], { sum: number; count: number }>();
  const outliers: CovalentTerm[] = [];

  const score: TermVisitor = (k, kind, names, observed, ideal, sigma) => {
    const d = observed - ideal;
    const z = d / sigma;
    const s = sums[kind];
    s[0]++;
    s[1] += d * d;
    s[2] += z * z;
    const zmax = kind === 'bond' ? bondZMax : angleZMax;
    const az = Math.abs(z);
    if (!(az <= zmax[k])) zmax[k] = az;
    if (az > COVALENT_OUTLIER_Z) {
      outCount[kind]++;
      outliers.push({
        conformer: k,
        kind,
        atoms: [...names],
        observed,
        ideal,
        sigma,
        z,
      });
    }
  };
  const add = (
    k: number,
    kind: 'bond' | 'angle',
    names: readonly string[],
    observed: number,
    ref: IdealValue,
  ): void => {
    score(k, kind, names, observed, ref.ideal, ref.sigma);
    if (kind === 'bond') {
      const m = meanAcc.get(names);
      if (m) {
        m.sum += observed;
        m.count++;
      } else meanAcc.set(names, { sum: observed, count: 1 });
    }
  };

  const sc = sideChainLookup(structure, library);
  const slots = new Int32Array(MAX_SLOTS);

  for (let k = 0; k < t.count; k++) {
    const r = t.residue[k];
    if (model.residues.kind[r] !== ResidueKind.Protein) continue;
    const parent = parentName(structure, model, r);
    // Engh & Huber values apply to the standard amino acids (and modified ones through their
    // parent); other components may reuse the names CA, C… for different chemistry.
    if (!STANDARD_AMINO_ACIDS.has(parent)) continue;
    const cls = residueClass(parent);
    const n = t.n[k];
    const ca = t.ca[k];
    const c = t.c[k];
    const o = t.o[k];
    const cb = t.cb[k];
    if (n >= 0 && ca >= 0)
      add(k, 'bond', T_N_CA, distanceA(atoms, n, ca), BACKBONE_BONDS['N-CA'][cls]);
    if (ca >= 0 && c >= 0)
      add(k, 'bond', T_CA_C, distanceA(atoms, ca, c), BACKBONE_BONDS['CA-C'][cls]);
    if (c >= 0 && o >= 0) add(k, 'bond', T_C_O, distanceA(atoms, c, o), BACKBONE_BONDS['C-O'][cls]);
    if (n >= 0 && ca >= 0 && c >= 0) {
      add(k, 'angle', T_N_CA_C, angleDeg(atoms, n, ca, c), BACKBONE_ANGLES['N-CA-C'][cls]);
    }
    if (ca >= 0 && c >= 0 && o >= 0) {
      add(k, 'angle', T_CA_C_O, angleDeg(atoms, ca, c, o), BACKBONE_ANGLES['CA-C-O'][cls]);
    }
    if (cb >= 0 && ca >= 0 && cls !== 'gly') {
      add(k, 'bond', T_CA_CB, distanceA(atoms, ca, cb), caCbBond(parent));
      const ang = cbAngles(parent);
      if (n >= 0) add(k, 'angle', T_N_CA_CB, angleDeg(atoms, n, ca, cb), ang.nCaCb);
      if (c >= 0) add(k, 'angle', T_CB_CA_C, angleDeg(atoms, cb, ca, c), ang.cbCaC);
    }
    measureSideChain(model, t, k, sc, slots, score);
    const q = t.next[k];
    if (q < 0 || c < 0) continue;
    const nn = t.n[q];
    const nca = t.ca[q];
    if (nn < 0) continue;
    const nextParent = parentName(structure, model, t.residue[q]);
    if (!STANDARD_AMINO_ACIDS.has(nextParent)) continue;
    // Pro N takes the proline column; otherwise this residue's Gly carbonyl/CA the glycine column.
    const pepCls = nextParent === 'PRO' ? 'pro' : cls === 'gly' ? 'gly' : 'general';
    add(k, 'bond', T_C_N, distanceA(atoms, c, nn), PEPTIDE_BOND[pepCls]);
    if (ca >= 0)
      add(k, 'angle', T_CA_C_N, angleDeg(atoms, ca, c, nn), PEPTIDE_ANGLES['CA-C-N'][pepCls]);
    if (o >= 0)
      add(k, 'angle', T_O_C_N, angleDeg(atoms, o, c, nn), PEPTIDE_ANGLES['O-C-N'][pepCls]);
    if (nca >= 0) {
      const cis = ca >= 0 && Math.abs(torsionDeg(atoms, ca, c, nn, nca)) < 30;
      add(k, 'angle', T_C_N_CA, angleDeg(atoms, c, nn, nca), cNCaAngle(nextParent, cis));
    }
  }

  const stats = (kind: 'bond' | 'angle'): GeometryStats => {
    const [count, d2, z2] = sums[kind];
    return {
      count,
      rmsd: count > 0 ? Math.sqrt(d2 / count) : null,
      rmsZ: count > 0 ? Math.sqrt(z2 / count) : null,
      outliers: outCount[kind],
    };
  };
  const meanBondA: Record<string, { mean: number; count: number }> = {};
  for (const [names, m] of meanAcc)
    meanBondA[names.join('-')] = { mean: m.sum / m.count, count: m.count };
  return { bonds: stats('bond'), angles: stats('angle'), outliers, bondZMax, angleZMax, meanBondA };
}

/** Converts covalent outliers to the report's list, naming residues by their author ids. */
export function covalentOutlierRows(
  structure: Structure,
  model: Model,
  t: ConformerTable,
  outliers: CovalentTerm[],
): GeometryOutlier[] {
  const s = structure.strings;
  const res = model.residues;
  return outliers.map((o) => {
    const r = t.residue[o.conformer];
    return {
      chain: s[model.chains.authId[res.chain[r]]],
      seq: res.authSeq[r],
      icode: s[res.icode[r]],
      name: s[res.name[r]],
      altloc: s[t.altloc[o.conformer]],
      atoms: o.atoms,
      observed: round(o.observed, o.kind === 'bond' ? 3 : 1),
      ideal: o.ideal,
      sigma: o.sigma,
      z: round(o.z, 2),
    };
  });
}

function round(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}
