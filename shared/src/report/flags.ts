/**
 * Residue flags that make a residue an outlier worth an author's attention (a "verdict"). One
 * list for the service's ledger and the UI's quality views, so both count the same things.
 * Pure constant with a type-only import: the UI may pull it in without engine code.
 */
import type { ResidueFlag } from './types';

export const OUTLIER_FLAGS: readonly ResidueFlag[] = [
  'rama-outlier',
  'rotamer-outlier',
  'steric-disallowed',
  'cb-deviation',
  'bond-outlier',
  'angle-outlier',
  'severe-overlap',
  'd-residue',
  'twisted-peptide',
];
