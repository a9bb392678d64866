/**
 * Backbone and side-chain torsions per residue conformer.
 *
 * Definitions: IUPAC-IUB Commission on Biochemical Nomenclature 1970 (Biochemistry 9:3471).
 *   phi(i)   = C(i-1)–N(i)–CA(i)–C(i)
 *   psi(i)   = N(i)–CA(i)–C(i)–N(i+1)
 *   omega(i) = CA(i)–C(i)–N(i+1)–CA(i+1)  (attached to the residue BEFORE the peptide bond)
 * Angles in degrees, (−180, 180]; NaN where undefined (chain end, chain break, missing atom).
 * Neighbours and breaks come from the conformer table (C(i-1)–N(i) > 2.0 Å is a break).
 */
import type { Model, Structure } from '../model/types';
import { ResidueKind } from '../model/types';
import type { ConformerTable } from '../model/conformers';
import { findAtom, stringIndex } from '../model/conformers';
import { torsionDeg } from '../geometry/torsion';

/** Side-chain chi atoms per residue (IUPAC-IUB 1970; same atoms as Biopython's ic_data). */
export const CHI_ATOMS: Readonly<
  Record<string, readonly (readonly [string, string, string, string])[]>
> = {
  ARG: [
    ['N', 'CA', 'CB', 'CG'],
    ['CA', 'CB', 'CG', 'CD'],
    ['CB', 'CG', 'CD', 'NE'],
    ['CG', 'CD', 'NE', 'CZ'],
    ['CD', 'NE', 'CZ', 'NH1'],
  ],
  ASN: [
    ['N', 'CA', 'CB', 'CG'],
    ['CA', 'CB', 'CG', 'OD1'],
  ],
  ASP: [
    ['N', 'CA', 'CB', 'CG'],
    ['CA', 'CB', 'CG', 'OD1'],
  ],
  CYS: [['N', 'CA', 'CB', 'SG']],
  GLN: [
    ['N', 'CA', 'CB', 'CG'],
    ['CA', 'CB', 'CG', 'CD'],
    ['CB', 'CG', 'CD', 'OE1'],
  ],
  GLU: [
    ['N', 'CA', 'CB', 'CG'],
    ['CA', 'CB', 'CG', 'CD'],
    ['CB', 'CG', 'CD', 'OE1'],
  ],
  HIS: [
    ['N', 'CA', 'CB', 'CG'],
    ['CA', 'CB', 'CG', 'ND1'],
  ],
  ILE: [
    ['N', 'CA', 'CB', 'CG1'],
    ['CA', 'CB', 'CG1', 'CD1'],
  ],
  LEU: [
    ['N', 'CA', 'CB', 'CG'],
    ['CA', 'CB', 'CG', 'CD1'],
  ],
  LYS: [
    ['N', 'CA', 'CB', 'CG'],
    ['CA', 'CB', 'CG', 'CD'],
    ['CB', 'CG', 'CD', 'CE'],
    ['CG', 'CD', 'CE', 'NZ'],
  ],
  MET: [
    ['N', 'CA', 'CB', 'CG'],
    ['CA', 'CB', 'CG', 'SD'],
    ['CB', 'CG', 'SD', 'CE'],
  ],
  // selenomethionine: Se takes the place of Sδ
  MSE: [
    ['N', 'CA', 'CB', 'CG'],
    ['CA', 'CB', 'CG', 'SE'],
    ['CB', 'CG', 'SE', 'CE'],
  ],
  PHE: [
    ['N', 'CA', 'CB', 'CG'],
    ['CA', 'CB', 'CG', 'CD1'],
  ],
  PRO: [
    ['N', 'CA', 'CB', 'CG'],
    ['CA', 'CB', 'CG', 'CD'],
  ],
  SER: [['N', 'CA', 'CB', 'OG']],
  THR: [['N', 'CA', 'CB', 'OG1']],
  TRP: [
    ['N', 'CA', 'CB', 'CG'],
    ['CA', 'CB', 'CG', 'CD1'],
  ],
  TYR: [
    ['N', 'CA', 'CB', 'CG'],
    ['CA', 'CB', 'CG', 'CD1'],
  ],
  VAL: [['N', 'CA', 'CB', 'CG1']],
};

export const MAX_CHI = 5;

export interface TorsionTable {
  /** per conformer, degrees, NaN where undefined */
  phi: Float64Array;
  psi: Float64Array;
  omega: Float64Array;
  /** per conformer × MAX_CHI (chi1 at k*5), NaN where undefined or not defined for the type */
  chi: Float64Array;
  /** number of chi angles the residue type defines (0–5) per conformer */
  chiCount: Uint8Array;
}

/** phi, psi and omega only (the fast path used by the benchmark and the report). */
export function computeBackboneTorsions(
  model: Model,
  t: ConformerTable,
): Pick<TorsionTable, 'phi' | 'psi' | 'omega'> {
  const n = t.count;
  const phi = new Float64Array(n).fill(NaN);
  const psi = new Float64Array(n).fill(NaN);
  const omega = new Float64Array(n).fill(NaN);
  const atoms = model.atoms;
  const kind = model.residues.kind;
  for (let k = 0; k < n; k++) {
    if (kind[t.residue[k]] !== ResidueKind.Protein) continue;
    const p = t.prev[k];
    const q = t.next[k];
    if (p >= 0) phi[k] = torsionDeg(atoms, t.c[p], t.n[k], t.ca[k], t.c[k]);
    if (q >= 0) {
      psi[k] = torsionDeg(atoms, t.n[k], t.ca[k], t.c[k], t.n[q]);
      omega[k] = torsionDeg(atoms, t.ca[k], t.c[k], t.n[q], t.ca[q]);
    }
  }
  return { phi, psi, omega };
}

export function computeTorsions(
  structure: Structure,
  model: Model,
  t: ConformerTable,
): TorsionTable {
  const bb = computeBackboneTorsions(model, t);
  const n = t.count;
  const chi = new Float64Array(n * MAX_CHI).fill(NaN);
  const chiCount = new Uint8Array(n);
  const { kind, name, parent } = model.residues;
  // resolve chi atom names to string indices once per residue type
  const resolved = new Map<number, number[][] | null>();
  const defFor = (r: number): number[][] | null => {
    const key = name[r];
    let d = resolved.get(key);
    if (d !== undefined) return d;
    const def = CHI_ATOMS[structure.strings[name[r]]] ?? CHI_ATOMS[structure.strings[parent[r]]];
    d = def === undefined ? null : def.map((quad) => quad.map((a) => stringIndex(structure, a)));
    resolved.set(key, d);
    return d;
  };
  for (let k = 0; k < n; k++) {
    const r = t.residue[k];
    if (kind[r] !== ResidueKind.Protein) continue;
    const def = defFor(r);
    if (def === null) continue;
    chiCount[k] = def.length;
    const alt = t.altloc[k];
    for (let j = 0; j < def.length; j++) {
      const q = def[j];
      if (q[0] < 0 || q[1] < 0 || q[2] < 0 || q[3] < 0) continue;
      chi[k * MAX_CHI + j] = torsionDeg(
        model.atoms,
        findAtom(model, r, q[0], alt),
        findAtom(model, r, q[1], alt),
        findAtom(model, r, q[2], alt),
        findAtom(model, r, q[3], alt),
      );
    }
  }
  return { ...bb, chi, chiCount };
}
