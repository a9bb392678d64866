/**
 * The compact model hierarchy every reader produces: structure → models → chains → residues →
 * atoms, stored column-wise in typed arrays (no object per atom). Strings (atom names,
 * elements, residue names, chain ids, altlocs, insertion codes) are interned in one table per
 * structure and referenced by index; index 0 of the table is always ''.
 *
 * Ownership: the readers in `src/io/` fill it; everything else only reads it.
 * Rules: fields may be added; existing ones keep their meaning.
 */
import type { InputFormat } from '../report/types';

/** Kind of a residue, decided from the component name and the entity records. */
export const enum ResidueKind {
  Protein = 0,
  Nucleic = 1,
  Water = 2,
  Ion = 3,
  Ligand = 4,
}

export interface AtomColumns {
  count: number;
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
  occupancy: Float32Array;
  bIso: Float32Array;
  /** index into Structure.strings */
  name: Int32Array;
  /** index into Structure.strings (upper-case element symbol, e.g. 'C', 'SE') */
  element: Int32Array;
  /** index into Structure.strings ('' = no altloc) */
  altloc: Int32Array;
  /** formal charge, 0 when absent */
  charge: Int8Array;
  /** 1 for HETATM records */
  hetatm: Uint8Array;
  /** atom serial / _atom_site.id as written */
  serial: Int32Array;
  /** owning residue (index into ResidueColumns) */
  residue: Int32Array;
}

export interface ResidueColumns {
  count: number;
  /** first atom (inclusive) and end (exclusive): a residue's atoms are contiguous */
  atomStart: Int32Array;
  atomEnd: Int32Array;
  chain: Int32Array;
  /** component name as written (e.g. MSE), index into strings */
  name: Int32Array;
  /** parent standard residue for modified residues (e.g. MET for MSE), else same as name */
  parent: Int32Array;
  /** auth_seq_id */
  authSeq: Int32Array;
  /** label_seq_id, or -2147483648 when absent (waters, ligands, PDB files without it) */
  labelSeq: Int32Array;
  /** pdbx_PDB_ins_code, index into strings ('' = none) */
  icode: Int32Array;
  /** ResidueKind */
  kind: Uint8Array;
  /** label_asym_id of the residue, index into strings (auth chain id for PDB files) */
  labelAsym: Int32Array;
  /** 1 when the residue maps to a standard parent through a modification record or table */
  modified: Uint8Array;
}

export interface ChainColumns {
  count: number;
  residueStart: Int32Array;
  residueEnd: Int32Array;
  /** auth_asym_id, index into strings */
  authId: Int32Array;
  /** label_asym_id, index into strings (same as authId for PDB files) */
  labelId: Int32Array;
  /** entity id as written, index into strings ('' when unknown) */
  entity: Int32Array;
}

export interface Model {
  /** model number as written (pdbx_PDB_model_num / MODEL n), 1 when absent */
  num: number;
  atoms: AtomColumns;
  residues: ResidueColumns;
  chains: ChainColumns;
}

export interface EntityInfo {
  id: string;
  type: 'polymer' | 'non-polymer' | 'water' | 'branched' | 'macrolide' | 'unknown';
  /** polymer type, e.g. 'polypeptide(L)' */
  polymerType?: string;
  /** declared sequence as component names (from entity_poly_seq / SEQRES), when present */
  sequence?: string[];
}

export interface Structure {
  format: InputFormat;
  gzip: boolean;
  /** interned strings, strings[0] === '' */
  strings: string[];
  models: Model[];
  entities: EntityInfo[];
  /** data block name / PDB id when present */
  id: string;
}
