/**
 * The report contract `foldfolio.report/1`: the versioned JSON document that the engine
 * produces and that every later feature (service, figures, tables, packages, CLI) consumes.
 *
 * Rules: fields may be added (optional) without a schema bump; renaming or removing a field,
 * or changing its meaning or units, needs `foldfolio.report/2`. Angles are degrees in
 * (-180, 180] or null where undefined; lengths in Å; B-factors in Å².
 */
export const REPORT_SCHEMA = 'foldfolio.report/1' as const;

export type InputFormat = 'mmcif' | 'bcif' | 'pdb';

export type RamaClass = 'general' | 'gly' | 'trans-pro' | 'cis-pro' | 'pre-pro' | 'ile-val';
export type Verdict = 'favored' | 'allowed' | 'outlier';
export type StericStatus = 'full' | 'outer-limit' | 'disallowed';

/** Per-residue flags. Kebab-case words of our own. */
export type ResidueFlag =
  | 'cis-peptide' // |omega| < 30°, omega of the peptide that follows this residue
  | 'twisted-peptide' // 30° ≤ |omega| < 150°
  | 'd-residue' // CA chirality inverted (non-Gly)
  | 'cb-deviation' // Cβ > 0.25 Å from its ideal position (Lovell et al. 2003)
  | 'bond-outlier' // a covalent bond > 4σ from ideal
  | 'angle-outlier' // a bond angle > 4σ from ideal
  | 'rama-outlier'
  | 'rama-allowed'
  | 'rotamer-outlier'
  | 'steric-disallowed'
  | 'severe-overlap' // an all-atom overlap ≥ 0.4 Å involves this residue
  | 'chain-break-before' // C(i-1)–N(i) > 2.0 Å
  | 'missing-atoms'
  | 'modified' // modified residue analysed as its parent
  | 'ca-only';

export interface RamaVerdict {
  class: RamaClass;
  verdict: Verdict;
  /** Fraction (0–100) of reference residues of the class lying at lower density than this one. */
  percentile: number;
}

export interface RotamerVerdict {
  name?: string;
  percentile: number;
  verdict: 'favored' | 'allowed' | 'outlier';
}

export interface ResidueRow {
  /** auth_asym_id */
  chain: string;
  /** auth_seq_id */
  seq: number;
  /** pdbx_PDB_ins_code, '' when none */
  icode: string;
  /** residue (component) name as in the file, e.g. MSE */
  name: string;
  /** parent amino acid for modified residues, e.g. MET for MSE; equals name otherwise */
  parent?: string;
  /** alternate location id of this conformer, '' when the residue has none */
  altloc: string;
  labelChain?: string;
  labelSeq?: number | null;
  phi: number | null;
  psi: number | null;
  /** omega of the peptide bond between this residue and the next: CA(i)–C(i)–N(i+1)–CA(i+1) */
  omega: number | null;
  chi: (number | null)[];
  /** DSSP-method code: H B E G I T S P or '-' for none */
  ss: string;
  flags: ResidueFlag[];
  /** mean B of the residue's atoms in this conformer */
  bMean?: number | null;
  occupancyMin?: number | null;
  cbDeviationA?: number | null;
  bondZMax?: number | null;
  angleZMax?: number | null;
  rama?: RamaVerdict | null;
  steric?: StericStatus | null;
  rotamer?: RotamerVerdict | null;
}

export interface GeometryStats {
  count: number;
  rmsd: number | null;
  rmsZ: number | null;
  /** number beyond 4σ */
  outliers: number;
}

export interface GeometryOutlier {
  chain: string;
  seq: number;
  icode: string;
  name: string;
  altloc: string;
  /** atom names, e.g. ['N','CA'] or ['N','CA','C'] */
  atoms: string[];
  observed: number;
  ideal: number;
  sigma: number;
  z: number;
}

export interface Overlap {
  a: { chain: string; seq: number; icode: string; name: string; altloc: string; atom: string };
  b: { chain: string; seq: number; icode: string; name: string; altloc: string; atom: string };
  overlapA: number;
}

export interface Composition {
  chains: number;
  polymerChains: number;
  proteinResidues: number;
  nucleicResidues: number;
  waters: number;
  ions: number;
  ligands: number;
  atoms: number;
  hydrogens: number;
  /** atoms by group: protein, nucleic, water, ion, ligand */
  atomsByGroup: Record<string, number>;
  /** ligand and ion component names with counts */
  hetero: Record<string, number>;
}

export interface BFactorGroupStats {
  group: string;
  atoms: number;
  mean: number | null;
  min: number | null;
  max: number | null;
}

export interface ModelSummary {
  composition: Composition;
  bonds: GeometryStats;
  angles: GeometryStats;
  cisPeptides: number;
  cisProPeptides: number;
  twistedPeptides: number;
  dResidues: number;
  cbOutliers: number;
  /** Ramachandran verdict counts, overall and per class */
  rama?: {
    overall: { favored: number; allowed: number; outlier: number; total: number };
    byClass: Record<string, { favored: number; allowed: number; outlier: number; total: number }>;
  } | null;
  rotamers?: { favored: number; allowed: number; outlier: number; total: number } | null;
  overlaps?: {
    severe: number;
    perThousandAtoms: number;
    hydrogens: 'deposited' | 'added' | 'mixed';
    xhConvention: 'nuclear' | 'electron-cloud';
  } | null;
  bFactors: BFactorGroupStats[];
  occupancy: { partialAtoms: number; zeroAtoms: number };
  secondaryStructure: Record<string, number>;
  /** statistics that could not be computed, with a sentence saying why (e.g. CA-only model) */
  notComputed: { statistic: string; reason: string }[];
  /** gaps between the declared (entity) sequence and the modelled residues */
  sequenceGaps?: { chain: string; afterSeq: number | null; missing: number }[];
}

export interface ModelReport {
  model: number;
  summary: ModelSummary;
  residues: ResidueRow[];
  geometryOutliers?: GeometryOutlier[];
  overlaps?: Overlap[];
}

/** Experimental statistics read from the file (PDBx items or legacy REMARKs), not computed. */
export interface ExperimentalValue {
  value: string | number | null;
  /** where it came from, e.g. '_refine.ls_R_factor_R_free' or 'REMARK 3' */
  source: string;
}

export interface Report {
  schema: typeof REPORT_SCHEMA;
  engine: { version: string };
  reference?: { id: string; sha256: string } | null;
  /** the side-chain ideal-geometry library the covalent statistics used (engine 0.2.0 on) */
  geometryLibrary?: { id: string; sha256: string } | null;
  input: { sha256: string; format: InputFormat; gzip: boolean; sizeBytes: number };
  method?: 'x-ray' | 'electron-microscopy' | 'nmr' | 'neutron' | 'unknown';
  experiment?: Record<string, ExperimentalValue>;
  models: ModelReport[];
  /** NMR ensembles: spread of per-model values and CA RMSD to the first model after superposition */
  ensemble?: {
    models: number;
    caRmsdToFirstA: number[];
    spread: Record<string, { mean: number; sd: number; min: number; max: number }>;
  } | null;
  /** plain-language cautions for the author (values that should worry them) */
  cautions: string[];
}
