/**
 * Residue classification tables: standard components, waters, ions and the parents of common
 * modified amino acids.
 */
import { ResidueKind } from '../model/types';

/** The 20 standard amino acids plus SEC and PYL (wwPDB Chemical Component Dictionary). */
export const STANDARD_AMINO_ACIDS: ReadonlySet<string> = new Set([
  'ALA',
  'ARG',
  'ASN',
  'ASP',
  'CYS',
  'GLN',
  'GLU',
  'GLY',
  'HIS',
  'ILE',
  'LEU',
  'LYS',
  'MET',
  'PHE',
  'PRO',
  'SER',
  'THR',
  'TRP',
  'TYR',
  'VAL',
  'SEC',
  'PYL',
]);

/** Standard ribo- and deoxyribonucleotides (wwPDB Chemical Component Dictionary). */
export const STANDARD_NUCLEOTIDES: ReadonlySet<string> = new Set([
  'A',
  'C',
  'G',
  'U',
  'I',
  'N',
  'DA',
  'DC',
  'DG',
  'DT',
  'DI',
  'DU',
  'DN',
]);

/** Water component names (HOH is the wwPDB name; DOD for heavy water; WAT/H2O in old files). */
export const WATER_NAMES: ReadonlySet<string> = new Set([
  'HOH',
  'DOD',
  'WAT',
  'H2O',
  'TIP',
  'TIP3',
  'SOL',
]);

/**
 * Monoatomic ions by component name (wwPDB Chemical Component Dictionary ids of the common
 * metal and halide ions).
 */
export const ION_NAMES: ReadonlySet<string> = new Set([
  'NA',
  'K',
  'LI',
  'RB',
  'CS',
  'MG',
  'CA',
  'SR',
  'BA',
  'ZN',
  'MN',
  'FE',
  'FE2',
  'CO',
  'NI',
  'CU',
  'CU1',
  'CD',
  'HG',
  'PB',
  'PT',
  'AU',
  'AG',
  'YB',
  'SM',
  'GD',
  'LA',
  'TB',
  'EU',
  'CL',
  'BR',
  'IOD',
  'F',
  'AL',
  'GA',
  'TL',
  'CE',
  'HO',
  'LU',
  'PR',
  'ND',
  'CR',
  'V',
  '3CO',
]);

/**
 * Parents of common modified amino acids: `_chem_comp.mon_nstd_parent_comp_id` of each entry in
 * the wwPDB Chemical Component Dictionary. Used when a file carries no modification records
 * (`_pdbx_struct_mod_residue`, MODRES), which take precedence.
 */
export const MODIFIED_PARENTS: ReadonlyMap<string, string> = new Map([
  ['MSE', 'MET'],
  ['MLY', 'LYS'],
  ['M3L', 'LYS'],
  ['MLZ', 'LYS'],
  ['ALY', 'LYS'],
  ['KCX', 'LYS'],
  ['LLP', 'LYS'],
  ['SEP', 'SER'],
  ['TPO', 'THR'],
  ['PTR', 'TYR'],
  ['CSO', 'CYS'],
  ['CSD', 'CYS'],
  ['CME', 'CYS'],
  ['CSS', 'CYS'],
  ['OCS', 'CYS'],
  ['CAS', 'CYS'],
  ['SMC', 'CYS'],
  ['HYP', 'PRO'],
  ['MEN', 'ASN'],
  ['PCA', 'GLN'],
  ['HIC', 'HIS'],
  ['NEP', 'HIS'],
  ['TYS', 'TYR'],
  ['TRQ', 'TRP'],
  ['CGU', 'GLU'],
  ['FME', 'MET'],
  ['MHO', 'MET'],
  ['SAC', 'SER'],
  ['AIB', 'ALA'],
  ['DAL', 'ALA'],
  ['NLE', 'LEU'],
  ['ORN', 'ALA'],
  ['SCH', 'CYS'],
  ['CXM', 'MET'],
  ['OMT', 'MET'],
  ['DDZ', 'ALA'],
]);

/** Kind of a residue from its names and the entity record; modified amino acids count as protein. */
export function classifyResidue(
  name: string,
  parent: string,
  entityType: string | undefined,
  polymerType: string | undefined,
  heavyAtomCount: number,
): ResidueKind {
  if (WATER_NAMES.has(name) || entityType === 'water') return ResidueKind.Water;
  if (STANDARD_AMINO_ACIDS.has(parent)) return ResidueKind.Protein;
  if (STANDARD_NUCLEOTIDES.has(parent)) return ResidueKind.Nucleic;
  if (entityType === 'polymer' && polymerType !== undefined) {
    if (polymerType.startsWith('polypeptide')) return ResidueKind.Protein;
    if (polymerType.startsWith('polydeoxy') || polymerType.startsWith('polyribo'))
      return ResidueKind.Nucleic;
  }
  if (ION_NAMES.has(name) && heavyAtomCount <= 1) return ResidueKind.Ion;
  return ResidueKind.Ligand;
}
