/**
 * Residue conformers: the unit every per-residue analysis works on. A residue without alternate
 * locations has one conformer (altloc ''); a residue with altlocs A, B… has one conformer per
 * altloc, made of that altloc's atoms plus the shared ('') atoms. Each conformer knows its
 * backbone atoms and its polymer neighbours, with chain breaks detected by the C(i-1)–N(i)
 * distance (> 2.0 Å is a break: common practice, no source).
 *
 * Stored column-wise (one entry per conformer, no object per atom).
 */
import type { Model, Structure } from './types';
import { ResidueKind } from './types';

/** C(i-1)–N(i) longer than this is a chain break (common practice, no source). */
export const PEPTIDE_BREAK_A = 2.0;
/** CA(i-1)–CA(i) longer than this is a break when C/N are absent (common practice, no source). */
export const CA_BREAK_A = 4.2;

export interface ConformerTable {
  count: number;
  /** owning residue index */
  residue: Int32Array;
  /** altloc of the conformer, index into Structure.strings ('' = the residue has no altlocs) */
  altloc: Int32Array;
  /** backbone and Cβ atom indices, -1 when absent */
  n: Int32Array;
  ca: Int32Array;
  c: Int32Array;
  o: Int32Array;
  cb: Int32Array;
  /** conformer of the previous / next residue of the same polymer chain, -1 at ends and breaks */
  prev: Int32Array;
  next: Int32Array;
  /**
   * 1 when the residue follows a chain break: C(i-1)–N(i) > 2.0 Å; when C or N is absent,
   * CA(i-1)–CA(i) > 4.2 Å; when those are absent too, always
   */
  breakBefore: Uint8Array;
  /** first conformer index of each residue and the count (residue → conformers) */
  firstOfResidue: Int32Array;
  countOfResidue: Int32Array;
}

const NO_ALTLOCS: number[] = [];

/** Altlocs present in a residue, in order of appearance, as string indices (empty when none). */
export function residueAltlocs(model: Model, r: number): number[] {
  const { atomStart, atomEnd } = model.residues;
  const alt = model.atoms.altloc;
  const out: number[] = [];
  for (let i = atomStart[r]; i < atomEnd[r]; i++) {
    const a = alt[i];
    if (a !== 0 && !out.includes(a)) out.push(a);
  }
  return out;
}

/**
 * Index of the atom called `name` in residue `r` for conformer altloc `altloc` (string index;
 * 0 = none): an atom with that altloc, else a shared atom; for altloc 0 the first atom of that
 * name. -1 when absent.
 */
export function findAtom(model: Model, r: number, nameIdx: number, altloc: number): number {
  const { atomStart, atomEnd } = model.residues;
  const names = model.atoms.name;
  const alts = model.atoms.altloc;
  let shared = -1;
  for (let i = atomStart[r]; i < atomEnd[r]; i++) {
    if (names[i] !== nameIdx) continue;
    const a = alts[i];
    if (altloc === 0) return i;
    if (a === altloc) return i;
    if (a === 0 && shared < 0) shared = i;
  }
  return shared;
}

/** Same as findAtom with the atom name as a string. */
export function findAtomByName(
  structure: Structure,
  model: Model,
  r: number,
  name: string,
  altloc: number,
): number {
  const idx = stringIndex(structure, name);
  return idx < 0 ? -1 : findAtom(model, r, idx, altloc);
}

const indexCache = new WeakMap<string[], Map<string, number>>();

/** Index of a string in the structure's table, -1 when it never occurs. */
export function stringIndex(structure: Structure, s: string): number {
  let m = indexCache.get(structure.strings);
  if (m === undefined || m.size !== structure.strings.length) {
    m = new Map();
    structure.strings.forEach((v, i) => m!.set(v, i));
    indexCache.set(structure.strings, m);
  }
  return m.get(s) ?? -1;
}

/** Atom name → atom index for one conformer (for side-chain work; backbone is in the table). */
export function conformerAtoms(
  structure: Structure,
  model: Model,
  table: ConformerTable,
  k: number,
): Map<string, number> {
  const r = table.residue[k];
  const alt = table.altloc[k];
  const out = new Map<string, number>();
  const { atomStart, atomEnd } = model.residues;
  for (let i = atomStart[r]; i < atomEnd[r]; i++) {
    const a = model.atoms.altloc[i];
    if (alt === 0 || a === 0 || a === alt) {
      const nm = structure.strings[model.atoms.name[i]];
      if (!out.has(nm) || (a === alt && alt !== 0 && model.atoms.altloc[out.get(nm)!] === 0))
        out.set(nm, i);
    }
  }
  return out;
}

/**
 * Residues that may share a peptide bond: two protein residues, or a protein residue and an
 * in-chain non-standard group (caps, unknown amino acids) — the C–N distance decides.
 */
function peptideLinkable(a: number, b: number): boolean {
  const okA = a === ResidueKind.Protein || a === ResidueKind.Ligand;
  const okB = b === ResidueKind.Protein || b === ResidueKind.Ligand;
  return okA && okB && (a === ResidueKind.Protein || b === ResidueKind.Protein);
}

function dist2(model: Model, i: number, j: number): number {
  const { x, y, z } = model.atoms;
  const dx = x[i] - x[j];
  const dy = y[i] - y[j];
  const dz = z[i] - z[j];
  return dx * dx + dy * dy + dz * dz;
}

/** Pick the neighbour position's conformer to pair with altloc `alt`: same altloc, else its first. */
function matchConformer(first: number, count: number, altOf: Int32Array, alt: number): number {
  if (alt !== 0) {
    for (let q = first; q < first + count; q++) if (altOf[q] === alt) return q;
  }
  return first;
}

export function buildConformers(structure: Structure, model: Model): ConformerTable {
  const nr = model.residues.count;
  const idxN = stringIndex(structure, 'N');
  const idxCA = stringIndex(structure, 'CA');
  const idxC = stringIndex(structure, 'C');
  const idxO = stringIndex(structure, 'O');
  const idxCB = stringIndex(structure, 'CB');
  const firstOfResidue = new Int32Array(nr);
  const countOfResidue = new Int32Array(nr);
  const resList: number[] = [];
  const altList: number[] = [];
  for (let r = 0; r < nr; r++) {
    // most residues have no altlocs: check without allocating first
    let anyAlt = false;
    for (let i = model.residues.atomStart[r]; i < model.residues.atomEnd[r]; i++) {
      if (model.atoms.altloc[i] !== 0) {
        anyAlt = true;
        break;
      }
    }
    const alts = anyAlt ? residueAltlocs(model, r) : NO_ALTLOCS;
    firstOfResidue[r] = resList.length;
    if (alts.length === 0) {
      resList.push(r);
      altList.push(0);
    } else {
      const sorted = alts
        .slice()
        .sort((a, b) => (structure.strings[a] < structure.strings[b] ? -1 : 1));
      for (const a of sorted) {
        resList.push(r);
        altList.push(a);
      }
    }
    countOfResidue[r] = resList.length - firstOfResidue[r];
  }
  const count = resList.length;
  const t: ConformerTable = {
    count,
    residue: Int32Array.from(resList),
    altloc: Int32Array.from(altList),
    n: new Int32Array(count).fill(-1),
    ca: new Int32Array(count).fill(-1),
    c: new Int32Array(count).fill(-1),
    o: new Int32Array(count).fill(-1),
    cb: new Int32Array(count).fill(-1),
    prev: new Int32Array(count).fill(-1),
    next: new Int32Array(count).fill(-1),
    breakBefore: new Uint8Array(count),
    firstOfResidue,
    countOfResidue,
  };
  // backbone and Cβ in one pass over each residue: an atom of the conformer's altloc wins over
  // a shared one; for altloc '' the first atom of the name (same rule as findAtom)
  const names = model.atoms.name;
  const alts = model.atoms.altloc;
  const slots = [t.n, t.ca, t.c, t.o, t.cb];
  const slotOf = new Int8Array(structure.strings.length).fill(-1);
  [idxN, idxCA, idxC, idxO, idxCB].forEach((idx, j) => {
    if (idx >= 0) slotOf[idx] = j;
  });
  const { atomStart, atomEnd } = model.residues;
  for (let k = 0; k < count; k++) {
    const r = t.residue[k];
    const a = t.altloc[k];
    for (let i = atomStart[r]; i < atomEnd[r]; i++) {
      const j = slotOf[names[i]];
      if (j < 0) continue;
      const ai = alts[i];
      const slot = slots[j];
      const cur = slot[k];
      if (a === 0) {
        if (cur < 0) slot[k] = i;
      } else if (ai === a) {
        if (cur < 0 || alts[cur] !== a) slot[k] = i;
      } else if (ai === 0 && cur < 0) {
        slot[k] = i;
      }
    }
  }
  const { chain, kind, authSeq, icode } = model.residues;
  const maxD2 = PEPTIDE_BREAK_A * PEPTIDE_BREAK_A;
  // Microheterogeneity: consecutive residues of one chain sharing auth_seq_id + icode (different
  // components at one position, e.g. PRO altloc A / SER altloc B) form one position; neighbours
  // link position to position, so the alternatives never link to each other.
  const posStart: number[] = [];
  for (let r = 0; r < nr; r++) {
    const same =
      r > 0 &&
      chain[r] === chain[r - 1] &&
      authSeq[r] === authSeq[r - 1] &&
      icode[r] === icode[r - 1];
    if (!same) posStart.push(r);
  }
  posStart.push(nr);
  for (let g = 1; g + 1 < posStart.length; g++) {
    const r0 = posStart[g];
    const r1 = posStart[g + 1];
    const q0 = posStart[g - 1];
    if (chain[r0] !== chain[q0]) continue;
    // conformers of a position are contiguous: residues are, and each residue's conformers are
    const prevFirst = firstOfResidue[q0];
    const prevCount = firstOfResidue[r0] - prevFirst;
    const hereFirst = firstOfResidue[r0];
    const hereCount = (r1 < nr ? firstOfResidue[r1] : count) - hereFirst;
    for (let k = hereFirst; k < hereFirst + hereCount; k++) {
      const p = matchConformer(prevFirst, prevCount, t.altloc, t.altloc[k]);
      if (!peptideLinkable(kind[t.residue[k]], kind[t.residue[p]])) continue;
      const cPrev = t.c[p];
      const nHere = t.n[k];
      if (cPrev >= 0 && nHere >= 0) {
        if (dist2(model, cPrev, nHere) <= maxD2) t.prev[k] = p;
        else t.breakBefore[k] = 1;
      } else if (t.ca[p] >= 0 && t.ca[k] >= 0) {
        // no C/N to test (CA-only models): consecutive CAs of a trans peptide are ~3.8 Å apart,
        // so > 4.2 Å is a break (common practice, no source)
        if (dist2(model, t.ca[p], t.ca[k]) > CA_BREAK_A * CA_BREAK_A) t.breakBefore[k] = 1;
      } else {
        t.breakBefore[k] = 1;
      }
    }
    for (let p = prevFirst; p < prevFirst + prevCount; p++) {
      const k = matchConformer(hereFirst, hereCount, t.altloc, t.altloc[p]);
      if (!peptideLinkable(kind[t.residue[k]], kind[t.residue[p]])) continue;
      const cPrev = t.c[p];
      const nHere = t.n[k];
      if (cPrev >= 0 && nHere >= 0 && dist2(model, cPrev, nHere) <= maxD2) t.next[p] = k;
    }
  }
  return t;
}
