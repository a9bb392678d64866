/**
 * Ideal backbone and Cβ geometry of amino-acid residues: Engh & Huber 2001, International
 * Tables for Crystallography Vol. F (2006), ch. 18.3, section 18.3.2.3, the table "Bond
 * lengths (Å) and angles (°) of peptide backbone fragments" ("the backbone table" below),
 * columns Peptide / Proline / Glycine; the CA–CB rows use the table's substitution classes
 * (CH3 = Ala, CH = Ile/Thr/Val, CH2 = the others). Values were read from the table text;
 * sigmas are the table's (on the last digit there).
 *
 * Coverage: backbone bonds and angles, the peptide bond C(i)–N(i+1) and the angles across it,
 * CA–CB and the two angles at CA involving CB. Side-chain bonds and angles beyond CA–CB are
 * checked against our own library built by Engh & Huber's method (`sidechain-library.ts`):
 * the published side-chain tables (ITC F Tables 18.3.2.1/18.3.2.2) could only partly be read.
 *
 * Assignment of the peptide terms (inter-residue): a term whose atoms include the N of a Pro
 * takes the Proline column; otherwise a term that includes a Gly CA or the Gly carbonyl takes
 * the Glycine column; else the Peptide column. C(i)–N(i+1)–CA(i+1) of a Pro uses the table's
 * trans or cis value by the omega of that peptide.
 */

export interface IdealValue {
  /** Å for bonds, degrees for angles */
  ideal: number;
  sigma: number;
}

export type ResidueClass = 'general' | 'gly' | 'pro';

const v = (ideal: number, sigma: number): IdealValue => ({ ideal, sigma });

/** Intra-residue backbone bonds by residue class (backbone table (a)). */
export const BACKBONE_BONDS: Record<'N-CA' | 'CA-C' | 'C-O', Record<ResidueClass, IdealValue>> = {
  'N-CA': { general: v(1.459, 0.02), pro: v(1.468, 0.017), gly: v(1.456, 0.015) },
  'CA-C': { general: v(1.525, 0.026), pro: v(1.524, 0.02), gly: v(1.514, 0.016) },
  'C-O': { general: v(1.229, 0.019), pro: v(1.228, 0.02), gly: v(1.232, 0.016) },
};

/** The peptide bond C(i)–N(i+1) (backbone table (a), row C–N). */
export const PEPTIDE_BOND: Record<ResidueClass, IdealValue> = {
  general: v(1.336, 0.023),
  pro: v(1.338, 0.019),
  gly: v(1.326, 0.018),
};

/** CA–CB by substitution at CB (backbone table (a)): CH3 Ala, CH Ile/Thr/Val, CH2 others; Pro. */
const CA_CB_CH3 = v(1.521, 0.033);
const CA_CB_CH = v(1.542, 0.023);
const CA_CB_PRO = v(1.531, 0.02);
const CA_CB_CH2 = v(1.535, 0.022);
export function caCbBond(parent: string): IdealValue {
  if (parent === 'ALA') return CA_CB_CH3;
  if (parent === 'ILE' || parent === 'THR' || parent === 'VAL') return CA_CB_CH;
  if (parent === 'PRO') return CA_CB_PRO;
  return CA_CB_CH2;
}

/** Intra-residue backbone angles (backbone table (b)). */
export const BACKBONE_ANGLES: Record<'N-CA-C' | 'CA-C-O', Record<ResidueClass, IdealValue>> = {
  'N-CA-C': { general: v(111.0, 2.7), pro: v(112.1, 2.6), gly: v(113.1, 2.5) },
  'CA-C-O': { general: v(120.1, 2.1), pro: v(120.2, 2.4), gly: v(120.6, 1.8) },
};

/** Angles across the peptide bond (backbone table (b)). */
export const PEPTIDE_ANGLES: Record<'CA-C-N' | 'O-C-N', Record<ResidueClass, IdealValue>> = {
  'CA-C-N': { general: v(117.2, 2.2), pro: v(117.1, 2.8), gly: v(116.2, 2.0) },
  'O-C-N': { general: v(122.7, 1.6), pro: v(121.1, 1.9), gly: v(123.2, 1.7) },
};

/** C(i)–N(i+1)–CA(i+1) (backbone table (b)); Pro has separate trans and cis values. */
const C_N_CA_PRO_CIS = v(127.0, 2.4);
const C_N_CA_PRO_TRANS = v(119.3, 1.5);
const C_N_CA_GLY = v(122.3, 2.1);
const C_N_CA = v(121.7, 2.5);
export function cNCaAngle(nextParent: string, cisPeptide: boolean): IdealValue {
  if (nextParent === 'PRO') return cisPeptide ? C_N_CA_PRO_CIS : C_N_CA_PRO_TRANS;
  if (nextParent === 'GLY') return C_N_CA_GLY;
  return C_N_CA;
}

/**
 * N–CA–CB and CB–CA–C (backbone table (b)): Ala uses the CH3 row, Pro its own column, the
 * others the "all" row (the table also splits CH and CH2; we use the pooled row for them).
 */
const CB_ANGLES_ALA = { nCaCb: v(110.4, 1.5), cbCaC: v(110.5, 1.5) };
const CB_ANGLES_PRO = { nCaCb: v(103.1, 1.2), cbCaC: v(111.8, 2.0) };
const CB_ANGLES_ALL = { nCaCb: v(110.6, 2.1), cbCaC: v(110.6, 2.3) };
export function cbAngles(parent: string): { nCaCb: IdealValue; cbCaC: IdealValue } {
  if (parent === 'ALA') return CB_ANGLES_ALA;
  if (parent === 'PRO') return CB_ANGLES_PRO;
  return CB_ANGLES_ALL;
}

export function residueClass(parent: string): ResidueClass {
  if (parent === 'GLY') return 'gly';
  if (parent === 'PRO') return 'pro';
  return 'general';
}
