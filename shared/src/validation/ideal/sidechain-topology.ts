/**
 * Covalent topology of the standard amino-acid side chains (heavy atoms, PDB standard atom
 * names) and the side-chain bond and angle terms derived from it. Used by the side-chain
 * geometry builder (`reference/sidechain-geometry.ts`) and by the covalent analysis
 * (`validation/covalent.ts`): both see exactly the same terms.
 *
 * Bonds: every bond between side-chain heavy atoms beyond CA (CA–CB is a backbone term, checked
 * against Engh & Huber 2001 in `engh-huber.ts`), plus the proline ring closure CD–N.
 * Angles: every angle X–Y–Z of two bonds sharing atom Y where at least one of the bonds is a
 * side-chain bond (so CA–CB–CG and, for Pro, CD–N–CA are in; N–CA–CB and CB–CA–C, which
 * `engh-huber.ts` covers, are not). Bonds N–CA and CA–CB enter only as the second arm of such
 * angles. Pro C(i−1)–N–CD (an inter-residue angle) is not included.
 *
 * Pooling: chemically equivalent atoms whose names differ only by a trailing 1/2 share one term
 * type (their geometry is one population, by symmetry of the group): Asp OD1/OD2 → OD, Glu
 * OE1/OE2 → OE, Phe/Tyr CD1/CD2 → CD and CE1/CE2 → CE, Val CG1/CG2 → CG, Leu CD1/CD2 → CD,
 * Arg NH1/NH2 → NH. Asn/Gln O/N, His, Trp and Ile CG1/CG2 are not equivalent and are not
 * pooled. A term type's key is its atom names after pooling, joined by '-', in the residue's
 * atom order (`atoms` below: outward from CA, ring members by branch), e.g. Phe 'CG-CD-CE'.
 */

/** The phenyl ring of Phe and Tyr from CB outward. */
const PHENYL_BONDS: [string, string][] = [
  ['CB', 'CG'],
  ['CG', 'CD1'],
  ['CG', 'CD2'],
  ['CD1', 'CE1'],
  ['CD2', 'CE2'],
  ['CE1', 'CZ'],
  ['CE2', 'CZ'],
];

/** Side-chain bonds per residue, outward from CB (PDB standard names). */
const BONDS: Record<string, [string, string][]> = {
  ARG: [
    ['CB', 'CG'],
    ['CG', 'CD'],
    ['CD', 'NE'],
    ['NE', 'CZ'],
    ['CZ', 'NH1'],
    ['CZ', 'NH2'],
  ],
  ASN: [
    ['CB', 'CG'],
    ['CG', 'OD1'],
    ['CG', 'ND2'],
  ],
  ASP: [
    ['CB', 'CG'],
    ['CG', 'OD1'],
    ['CG', 'OD2'],
  ],
  CYS: [['CB', 'SG']],
  GLN: [
    ['CB', 'CG'],
    ['CG', 'CD'],
    ['CD', 'OE1'],
    ['CD', 'NE2'],
  ],
  GLU: [
    ['CB', 'CG'],
    ['CG', 'CD'],
    ['CD', 'OE1'],
    ['CD', 'OE2'],
  ],
  HIS: [
    ['CB', 'CG'],
    ['CG', 'ND1'],
    ['CG', 'CD2'],
    ['ND1', 'CE1'],
    ['CD2', 'NE2'],
    ['CE1', 'NE2'],
  ],
  ILE: [
    ['CB', 'CG1'],
    ['CB', 'CG2'],
    ['CG1', 'CD1'],
  ],
  LEU: [
    ['CB', 'CG'],
    ['CG', 'CD1'],
    ['CG', 'CD2'],
  ],
  LYS: [
    ['CB', 'CG'],
    ['CG', 'CD'],
    ['CD', 'CE'],
    ['CE', 'NZ'],
  ],
  MET: [
    ['CB', 'CG'],
    ['CG', 'SD'],
    ['SD', 'CE'],
  ],
  PHE: PHENYL_BONDS,
  PRO: [
    ['CB', 'CG'],
    ['CG', 'CD'],
    ['CD', 'N'],
  ],
  SER: [['CB', 'OG']],
  THR: [
    ['CB', 'OG1'],
    ['CB', 'CG2'],
  ],
  TRP: [
    ['CB', 'CG'],
    ['CG', 'CD1'],
    ['CG', 'CD2'],
    ['CD1', 'NE1'],
    ['NE1', 'CE2'],
    ['CD2', 'CE2'],
    ['CD2', 'CE3'],
    ['CE2', 'CZ2'],
    ['CE3', 'CZ3'],
    ['CZ2', 'CH2'],
    ['CZ3', 'CH2'],
  ],
  TYR: [...PHENYL_BONDS, ['CZ', 'OH']],
  VAL: [
    ['CB', 'CG1'],
    ['CB', 'CG2'],
  ],
};

/** Pooled names of chemically equivalent atoms (see the header). */
const POOL: Record<string, Record<string, string>> = {
  ARG: { NH1: 'NH', NH2: 'NH' },
  ASP: { OD1: 'OD', OD2: 'OD' },
  GLU: { OE1: 'OE', OE2: 'OE' },
  LEU: { CD1: 'CD', CD2: 'CD' },
  PHE: { CD1: 'CD', CD2: 'CD', CE1: 'CE', CE2: 'CE' },
  TYR: { CD1: 'CD', CD2: 'CD', CE1: 'CE', CE2: 'CE' },
  VAL: { CG1: 'CG', CG2: 'CG' },
};

export interface SideChainTopology {
  /** the residue's atoms taking part in its terms, in atom order (slot = position here) */
  atoms: string[];
  /** bond terms: two slots each (flat), and the term-type key of each */
  bondSlots: Int32Array;
  bondKeys: string[];
  /** the atom names of each bond term as written (unpooled), e.g. ['CD2', 'CE2'] */
  bondNames: string[][];
  /** angle terms: three slots each (flat, the middle one is the vertex), and the keys */
  angleSlots: Int32Array;
  angleKeys: string[];
  angleNames: string[][];
  /** distinct term-type keys, sorted */
  bondTypes: string[];
  angleTypes: string[];
}

function derive(residue: string): SideChainTopology {
  const side = BONDS[residue];
  const pool = POOL[residue] ?? {};
  // Atom order: CA, CB, then the side-chain atoms by first appearance in the bond list.
  // (Pro's N comes last, through the ring closure CD–N.)
  const atoms: string[] = ['CA', 'CB'];
  for (const [a, b] of side) for (const x of [a, b]) if (!atoms.includes(x)) atoms.push(x);
  const slot = (name: string): number => atoms.indexOf(name);
  const key = (names: string[]): string => names.map((n) => pool[n] ?? n).join('-');
  const bondSlots: number[] = [];
  const bondKeys: string[] = [];
  for (const [a, b] of side) {
    const [p, q] = slot(a) < slot(b) ? [a, b] : [b, a];
    bondSlots.push(slot(p), slot(q));
    bondKeys.push(key([p, q]));
  }
  // Arms: side-chain bonds plus CA–CB (and N–CA for Pro), each flagged side-chain or not.
  const arms: [number, number, boolean][] = side.map(([a, b]) => [slot(a), slot(b), true]);
  arms.push([slot('CA'), slot('CB'), false]);
  if (residue === 'PRO') arms.push([slot('N'), slot('CA'), false]);
  const angleSlots: number[] = [];
  const angleKeys: string[] = [];
  for (let v = 0; v < atoms.length; v++) {
    const nb: [number, boolean][] = [];
    for (const [a, b, sc] of arms) {
      if (a === v) nb.push([b, sc]);
      else if (b === v) nb.push([a, sc]);
    }
    nb.sort((x, y) => x[0] - y[0]);
    for (let i = 0; i < nb.length; i++)
      for (let j = i + 1; j < nb.length; j++) {
        if (!nb[i][1] && !nb[j][1]) continue;
        angleSlots.push(nb[i][0], v, nb[j][0]);
        angleKeys.push(key([atoms[nb[i][0]], atoms[v], atoms[nb[j][0]]]));
      }
  }
  const names = (sl: number[], width: number): string[][] => {
    const out: string[][] = [];
    for (let i = 0; i < sl.length; i += width)
      out.push(sl.slice(i, i + width).map((s) => atoms[s]));
    return out;
  };
  return {
    atoms,
    bondSlots: Int32Array.from(bondSlots),
    bondKeys,
    bondNames: names(bondSlots, 2),
    angleSlots: Int32Array.from(angleSlots),
    angleKeys,
    angleNames: names(angleSlots, 3),
    bondTypes: [...new Set(bondKeys)].sort(),
    angleTypes: [...new Set(angleKeys)].sort(),
  };
}

/** Residues with side-chain terms (Ala and Gly have none beyond CB), sorted. */
export const SIDE_CHAIN_RESIDUES: readonly string[] = Object.keys(BONDS).sort();

/** Topology per standard residue name (built once at load). */
export const SIDE_CHAIN_TOPOLOGY: ReadonlyMap<string, SideChainTopology> = new Map(
  SIDE_CHAIN_RESIDUES.map((r) => [r, derive(r)]),
);
