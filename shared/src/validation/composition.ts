/**
 * B-factor and occupancy summaries by group, and gaps between the declared and the modelled
 * sequence. (Counts of chains, residues and atoms by kind are filled by the report builder's
 * composition step.)
 *
 * Groups for B-factors: all atoms, protein, protein main chain (N, CA, C, O, OXT), protein side
 * chain (the other protein atoms), nucleic, water, ligand, ion; hydrogens count like any atom.
 * Every alternate-location atom counts once.
 *
 * Sequence gaps: for PDBx/mmCIF input, declared positions are 1…n of the entity's sequence
 * (`_entity_poly_seq`) and modelled positions the residues' label_seq_id; each maximal run of
 * unmodelled positions is a gap, placed after the last modelled residue before it (author
 * number; null when the gap starts the chain). Files without label_seq_id (legacy PDB) fall back
 * to author numbering: a jump of more than one between consecutive residues of a chain is a gap
 * of that many minus one (terminal gaps cannot be told without an alignment and are not listed).
 */
import type { Model, Structure } from '../model/types';
import { ResidueKind } from '../model/types';
import type { BFactorGroupStats } from '../report/types';

const NO_LABEL_SEQ = -2147483648;
const MAIN_CHAIN = new Set(['N', 'CA', 'C', 'O', 'OXT']);
const GROUPS = [
  'all',
  'protein',
  'main-chain',
  'side-chain',
  'nucleic',
  'water',
  'ligand',
  'ion',
] as const;

export interface OccupancySummary {
  partialAtoms: number;
  zeroAtoms: number;
}

export interface SequenceGap {
  chain: string;
  afterSeq: number | null;
  missing: number;
}

export function bFactorSummary(structure: Structure, model: Model): BFactorGroupStats[] {
  const acc = GROUPS.map(() => ({ n: 0, sum: 0, min: Infinity, max: -Infinity }));
  const add = (g: number, b: number): void => {
    const a = acc[g];
    a.n++;
    a.sum += b;
    if (b < a.min) a.min = b;
    if (b > a.max) a.max = b;
  };
  const { residues, atoms } = model;
  for (let r = 0; r < residues.count; r++) {
    const kind = residues.kind[r];
    for (let i = residues.atomStart[r]; i < residues.atomEnd[r]; i++) {
      const b = atoms.bIso[i];
      add(0, b);
      if (kind === ResidueKind.Protein) {
        add(1, b);
        add(MAIN_CHAIN.has(structure.strings[atoms.name[i]]) ? 2 : 3, b);
      } else if (kind === ResidueKind.Nucleic) add(4, b);
      else if (kind === ResidueKind.Water) add(5, b);
      else if (kind === ResidueKind.Ligand) add(6, b);
      else if (kind === ResidueKind.Ion) add(7, b);
    }
  }
  const out: BFactorGroupStats[] = [];
  GROUPS.forEach((group, g) => {
    const a = acc[g];
    if (a.n === 0 && group !== 'all') return;
    out.push({
      group,
      atoms: a.n,
      mean: a.n ? round2(a.sum / a.n) : null,
      min: a.n ? round2(a.min) : null,
      max: a.n ? round2(a.max) : null,
    });
  });
  return out;
}

export function occupancySummary(model: Model): OccupancySummary {
  let partialAtoms = 0;
  let zeroAtoms = 0;
  const occ = model.atoms.occupancy;
  for (let i = 0; i < model.atoms.count; i++) {
    if (occ[i] <= 0) zeroAtoms++;
    else if (occ[i] < 1) partialAtoms++;
  }
  return { partialAtoms, zeroAtoms };
}

/** Gaps of polymer chains; `basis` says whether label_seq_id or author numbering was used. */
export function sequenceGaps(
  structure: Structure,
  model: Model,
): { gaps: SequenceGap[]; basis: 'label-seq' | 'author-numbering' | 'none' } {
  const { residues, chains } = model;
  const s = structure.strings;
  const entityLength = new Map<string, number>();
  for (const e of structure.entities)
    if (e.type === 'polymer' && e.sequence) entityLength.set(e.id, e.sequence.length);
  // Polymer residues grouped by label_asym (a chain may be split into several runs).
  const byLabel = new Map<number, number[]>();
  let anyLabelSeq = false;
  for (let r = 0; r < residues.count; r++) {
    const kind = residues.kind[r];
    if (kind !== ResidueKind.Protein && kind !== ResidueKind.Nucleic) continue;
    const list = byLabel.get(residues.labelAsym[r]);
    if (list) list.push(r);
    else byLabel.set(residues.labelAsym[r], [r]);
    if (residues.labelSeq[r] !== NO_LABEL_SEQ) anyLabelSeq = true;
  }
  if (byLabel.size === 0) return { gaps: [], basis: 'none' };
  const gaps: SequenceGap[] = [];
  if (anyLabelSeq) {
    for (const list of byLabel.values()) {
      const entity = s[chains.entity[residues.chain[list[0]]]];
      const length = entityLength.get(entity);
      if (length === undefined) continue;
      const authOf = new Map<number, number>();
      for (const r of list)
        if (residues.labelSeq[r] !== NO_LABEL_SEQ && !authOf.has(residues.labelSeq[r]))
          authOf.set(residues.labelSeq[r], residues.authSeq[r]);
      const chain = s[chains.authId[residues.chain[list[0]]]];
      let last: number | null = null;
      let run = 0;
      for (let p = 1; p <= length; p++) {
        const a = authOf.get(p);
        if (a === undefined) {
          run++;
          continue;
        }
        if (run > 0) gaps.push({ chain, afterSeq: last, missing: run });
        run = 0;
        last = a;
      }
      if (run > 0 && authOf.size > 0) gaps.push({ chain, afterSeq: last, missing: run });
    }
    return { gaps, basis: 'label-seq' };
  }
  for (const list of byLabel.values()) {
    const chain = s[chains.authId[residues.chain[list[0]]]];
    for (let k = 1; k < list.length; k++) {
      const jump = residues.authSeq[list[k]] - residues.authSeq[list[k - 1]];
      if (jump > 1)
        gaps.push({ chain, afterSeq: residues.authSeq[list[k - 1]], missing: jump - 1 });
    }
  }
  return { gaps, basis: 'author-numbering' };
}

function round2(x: number): number {
  return Math.round(x * 100) / 100;
}
