/**
 * Side-chain internal coordinates for the demo models (atoms beyond CB). Bond lengths and angles
 * are typical values of the trade (from memory, approximate; rounded Engh & Huber-like values —
 * the engine's covalent checks stop at CB, so these are not used as reference values anywhere).
 * Each atom is placed from three earlier atoms of the residue with a bond, an angle and a torsion
 * that is either fixed or one of the chi angles plus an offset.
 */
export interface SideChainAtom {
  name: string;
  element: string;
  from: [string, string, string];
  bondA: number;
  angleDeg: number;
  /** chi index (1-based), 0 for a fixed torsion */
  chi: number;
  offsetDeg: number;
}

const at = (
  name: string,
  element: string,
  from: [string, string, string],
  bondA: number,
  angleDeg: number,
  chi: number,
  offsetDeg = 0,
): SideChainAtom => ({ name, element, from, bondA, angleDeg, chi, offsetDeg });

const N_CA_CB: [string, string, string] = ['N', 'CA', 'CB'];

export const SIDE_CHAINS: Record<string, SideChainAtom[]> = {
  GLY: [],
  ALA: [],
  SER: [at('OG', 'O', N_CA_CB, 1.417, 111.1, 1)],
  THR: [at('OG1', 'O', N_CA_CB, 1.433, 109.6, 1), at('CG2', 'C', N_CA_CB, 1.521, 110.5, 1, -120)],
  VAL: [at('CG1', 'C', N_CA_CB, 1.521, 110.5, 1), at('CG2', 'C', N_CA_CB, 1.521, 110.5, 1, 120)],
  ILE: [
    at('CG1', 'C', N_CA_CB, 1.53, 110.4, 1),
    at('CG2', 'C', N_CA_CB, 1.521, 110.5, 1, -120),
    at('CD1', 'C', ['CA', 'CB', 'CG1'], 1.513, 113.8, 2),
  ],
  LEU: [
    at('CG', 'C', N_CA_CB, 1.53, 116.3, 1),
    at('CD1', 'C', ['CA', 'CB', 'CG'], 1.524, 110.7, 2),
    at('CD2', 'C', ['CA', 'CB', 'CG'], 1.525, 110.7, 2, 120),
  ],
  LYS: [
    at('CG', 'C', N_CA_CB, 1.52, 114.1, 1),
    at('CD', 'C', ['CA', 'CB', 'CG'], 1.52, 111.3, 2),
    at('CE', 'C', ['CB', 'CG', 'CD'], 1.52, 111.3, 3),
    at('NZ', 'N', ['CG', 'CD', 'CE'], 1.489, 111.9, 4),
  ],
  GLU: [
    at('CG', 'C', N_CA_CB, 1.52, 114.1, 1),
    at('CD', 'C', ['CA', 'CB', 'CG'], 1.516, 112.6, 2),
    at('OE1', 'O', ['CB', 'CG', 'CD'], 1.249, 118.4, 3),
    at('OE2', 'O', ['CB', 'CG', 'CD'], 1.249, 118.4, 3, 180),
  ],
  GLN: [
    at('CG', 'C', N_CA_CB, 1.52, 114.1, 1),
    at('CD', 'C', ['CA', 'CB', 'CG'], 1.516, 112.6, 2),
    at('OE1', 'O', ['CB', 'CG', 'CD'], 1.231, 120.8, 3),
    at('NE2', 'N', ['CB', 'CG', 'CD'], 1.328, 116.4, 3, 180),
  ],
  ASP: [
    at('CG', 'C', N_CA_CB, 1.516, 112.6, 1),
    at('OD1', 'O', ['CA', 'CB', 'CG'], 1.249, 118.4, 2),
    at('OD2', 'O', ['CA', 'CB', 'CG'], 1.249, 118.4, 2, 180),
  ],
  ASN: [
    at('CG', 'C', N_CA_CB, 1.516, 112.6, 1),
    at('OD1', 'O', ['CA', 'CB', 'CG'], 1.231, 120.8, 2),
    at('ND2', 'N', ['CA', 'CB', 'CG'], 1.328, 116.4, 2, 180),
  ],
};

export const ONE_TO_THREE: Record<string, string> = {
  G: 'GLY',
  A: 'ALA',
  S: 'SER',
  T: 'THR',
  V: 'VAL',
  I: 'ILE',
  L: 'LEU',
  K: 'LYS',
  E: 'GLU',
  Q: 'GLN',
  D: 'ASP',
  N: 'ASN',
};
