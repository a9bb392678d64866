/**
 * Peptide-bond conformation: omega(i) = CA(i)–C(i)–N(i+1)–CA(i+1) (IUPAC-IUB 1970), attached to
 * residue i (the peptide that follows it). |omega| < 30° is cis, 30° ≤ |omega| < 150° twisted
 * (common practice, no source). A cis peptide whose following residue is Pro counts as cis-Pro.
 * Expected frequencies for comparison (Jabs, Weiss & Hilgenfeld 1999, J Mol Biol 286:291, from
 * memory): about 5 % of Xaa–Pro bonds cis, about 0.03 % of the others.
 */
import type { ConformerTable } from '../model/conformers';
import type { Model, Structure } from '../model/types';
import { ResidueKind } from '../model/types';
import { torsionDeg } from '../geometry/torsion';

export const CIS_LIMIT_DEG = 30;
export const TRANS_LIMIT_DEG = 150;

export type PeptideState = 'trans' | 'cis' | 'twisted';

export interface PeptideResult {
  /** omega per conformer, NaN where undefined (chain end, break, missing atoms) */
  omegaDeg: Float64Array;
  /** 0 none/trans, 1 cis, 2 twisted per conformer */
  state: Uint8Array;
  /** counts by residue (a residue counts once if any conformer is cis / twisted) */
  cis: number;
  cisPro: number;
  twisted: number;
  /** peptides measured, and those preceding a Pro */
  measured: number;
  measuredPro: number;
}

export function classifyOmega(omegaDeg: number): PeptideState {
  const a = Math.abs(omegaDeg);
  if (a < CIS_LIMIT_DEG) return 'cis';
  if (a < TRANS_LIMIT_DEG) return 'twisted';
  return 'trans';
}

export function analysePeptides(
  structure: Structure,
  model: Model,
  t: ConformerTable,
): PeptideResult {
  const omegaDeg = new Float64Array(t.count).fill(NaN);
  const state = new Uint8Array(t.count);
  const atoms = model.atoms;
  let cis = 0;
  let cisPro = 0;
  let twisted = 0;
  let measured = 0;
  let measuredPro = 0;
  const nres = model.residues.count;
  for (let r = 0; r < nres; r++) {
    if (model.residues.kind[r] !== ResidueKind.Protein) continue;
    let anyCis = false;
    let anyTwisted = false;
    let anyMeasured = false;
    let nextIsPro = false;
    for (let k = t.firstOfResidue[r]; k < t.firstOfResidue[r] + t.countOfResidue[r]; k++) {
      const q = t.next[k];
      if (q < 0 || t.ca[k] < 0 || t.c[k] < 0 || t.n[q] < 0 || t.ca[q] < 0) continue;
      const w = torsionDeg(atoms, t.ca[k], t.c[k], t.n[q], t.ca[q]);
      omegaDeg[k] = w;
      anyMeasured = true;
      nextIsPro = structure.strings[model.residues.parent[t.residue[q]]] === 'PRO';
      const st = classifyOmega(w);
      if (st === 'cis') {
        state[k] = 1;
        anyCis = true;
      } else if (st === 'twisted') {
        state[k] = 2;
        anyTwisted = true;
      }
    }
    if (anyMeasured) {
      measured++;
      if (nextIsPro) measuredPro++;
    }
    if (anyCis) {
      cis++;
      if (nextIsPro) cisPro++;
    } else if (anyTwisted) twisted++;
  }
  return { omegaDeg, state, cis, cisPro, twisted, measured, measuredPro };
}
