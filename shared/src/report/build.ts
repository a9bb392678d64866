/**
 * The report builder: input bytes → `foldfolio.report/1`.
 *
 * Flow: hash the input, read the structure, then per model build the residue conformer table,
 * the torsions, one row per polymer residue conformer, and the summary. Each further analysis
 * (covalent geometry, peptides, chirality, secondary structure, Ramachandran/rotamer verdicts,
 * overlaps…) is a function of a `ModelContext` listed in MODEL_ANALYSES, run in order; it
 * writes into the rows (via `rowOfConformer`) and the summary, and calls `markComputed`.
 * Report-wide analyses (NMR ensemble, experiment, cautions) go in REPORT_ANALYSES.
 */
import type { Model, Structure } from '../model/types';
import { ResidueKind } from '../model/types';
import { buildConformers } from '../model/conformers';
import type { ConformerTable } from '../model/conformers';
import { computeTorsions, MAX_CHI } from '../validation/torsions';
import type { TorsionTable } from '../validation/torsions';
import { readStructure } from '../io/read';
import type { ReadOptions } from '../io/read';
import { StructureReadError } from '../io/errors';
import {
  ensembleStep,
  GEOMETRY_MODEL_ANALYSES,
  geometryLibraryStep,
} from '../validation/geometry-analyses';
import { referenceStep, VERDICT_MODEL_ANALYSES } from '../validation/verdict-analyses';
import { sha256Hex } from './sha256';
import { experimentRecord, readExperimentFromBytes } from '../experiment/read';
import { reportCautions } from './cautions';
import { ENGINE_VERSION } from './version';
import { REPORT_SCHEMA } from './types';
import type {
  Composition,
  ModelReport,
  ModelSummary,
  Report,
  ResidueFlag,
  ResidueRow,
} from './types';

export interface ReportOptions extends ReadOptions {
  /** original file name (shapes error messages only) */
  filename?: string;
  /** analyse only this model number (as written in the file); default: every model */
  model?: number;
  /** when given, collects milliseconds per step (benchmarks; the report is unchanged) */
  timings?: Record<string, number>;
  /** platform SHA-256 (hex) to use instead of the pure-JS one, e.g. Node's crypto at the edge */
  sha256?: (bytes: Uint8Array) => string;
  /** called before each per-model analysis step (progress reporting); the report is unchanged */
  onStep?: (step: string, modelIndex: number, modelCount: number) => void;
  /**
   * 'full' (default): every analysis. 'geometry': the coordinate geometry only — torsions,
   * covalent geometry, peptides, chirality and Cβ, secondary structure, composition, B-factors —
   * without the reference verdicts and the all-atom overlaps, which the report then lists as not
   * computed (a quick look at a very large model).
   */
  scope?: ReportScope;
}

export type ReportScope = 'full' | 'geometry';

/** Statistics a geometry-only report leaves out, with the reason it gives. */
const GEOMETRY_ONLY_SKIPPED = ['ramachandran', 'rotamers', 'overlaps'];
const GEOMETRY_ONLY_REASON =
  'Not requested: this is a geometry-only report (reference verdicts and all-atom overlaps are left out); run the full report for them.';

/** Everything one model's analyses share. */
export interface ModelContext {
  structure: Structure;
  model: Model;
  conformers: ConformerTable;
  torsions: TorsionTable;
  /** row index of each conformer in `report.residues`, -1 for conformers without a row */
  rowOfConformer: Int32Array;
  report: ModelReport;
  /** true when the protein residues carry only CA atoms */
  caOnly: boolean;
}

export interface ReportContext {
  structure: Structure;
  bytes: Uint8Array;
  report: Report;
  models: ModelContext[];
}

/** Statistics the base summary cannot fill by itself; each analysis removes its own entry. */
const PENDING: { statistic: string; reason: string }[] = [
  {
    statistic: 'covalent-geometry',
    reason: 'Bond and angle statistics are not computed by this engine build.',
  },
  {
    statistic: 'peptides',
    reason: 'Cis and twisted peptides are not computed by this engine build.',
  },
  {
    statistic: 'chirality',
    reason: 'CA chirality and Cβ deviation are not computed by this engine build.',
  },
  {
    statistic: 'secondary-structure',
    reason: 'Secondary structure is not computed by this engine build.',
  },
  {
    statistic: 'ramachandran',
    reason: 'Ramachandran verdicts are not computed by this engine build.',
  },
];

/** An analysis calls this when it has filled its part of the summary. */
export function markComputed(summary: ModelSummary, statistic: string): void {
  summary.notComputed = summary.notComputed.filter((n) => n.statistic !== statistic);
}

/** Per-model analyses, in order. Add yours here (see DEVELOPERS.md). */
export const MODEL_ANALYSES: ((ctx: ModelContext) => void)[] = [
  ...GEOMETRY_MODEL_ANALYSES,
  ...VERDICT_MODEL_ANALYSES,
];

/** Report-wide analyses (after every model), in order. */
export const REPORT_ANALYSES: ((ctx: ReportContext) => void)[] = [
  ensembleStep,
  referenceStep,
  geometryLibraryStep,
];

/** The same for a geometry-only report: no reference distributions are used, none is named. */
const GEOMETRY_REPORT_ANALYSES = REPORT_ANALYSES.filter((a) => a !== referenceStep);

function timed<T>(timings: Record<string, number> | undefined, key: string, f: () => T): T {
  if (timings === undefined) return f();
  const t = performance.now();
  const v = f();
  timings[key] = (timings[key] ?? 0) + performance.now() - t;
  return v;
}

/** Angle for JSON: degrees rounded to 0.001°, null where undefined. */
function angle(v: number): number | null {
  return Number.isNaN(v) ? null : Math.round(v * 1000) / 1000;
}

function composition(structure: Structure, model: Model): Composition {
  const { residues, atoms, chains } = model;
  const byGroup: Record<string, number> = { protein: 0, nucleic: 0, water: 0, ion: 0, ligand: 0 };
  const groupName = ['protein', 'nucleic', 'water', 'ion', 'ligand'];
  const counts = [0, 0, 0, 0, 0];
  const hetero: Record<string, number> = {};
  for (let r = 0; r < residues.count; r++) {
    const k = residues.kind[r];
    counts[k]++;
    byGroup[groupName[k]] += residues.atomEnd[r] - residues.atomStart[r];
    if (k === ResidueKind.Ion || k === ResidueKind.Ligand) {
      const nm = structure.strings[residues.name[r]];
      hetero[nm] = (hetero[nm] ?? 0) + 1;
    }
  }
  const chainIds = new Set<number>();
  const polymerIds = new Set<number>();
  for (let c = 0; c < chains.count; c++) {
    chainIds.add(chains.authId[c]);
    for (let r = chains.residueStart[c]; r < chains.residueEnd[c]; r++) {
      const k = residues.kind[r];
      if (k === ResidueKind.Protein || k === ResidueKind.Nucleic) {
        polymerIds.add(chains.authId[c]);
        break;
      }
    }
  }
  let hydrogens = 0;
  for (let a = 0; a < atoms.count; a++) {
    const el = structure.strings[atoms.element[a]];
    if (el === 'H' || el === 'D') hydrogens++;
  }
  const sortedHetero: Record<string, number> = {};
  for (const k of Object.keys(hetero).sort()) sortedHetero[k] = hetero[k];
  return {
    chains: chainIds.size,
    polymerChains: polymerIds.size,
    proteinResidues: counts[ResidueKind.Protein],
    nucleicResidues: counts[ResidueKind.Nucleic],
    waters: counts[ResidueKind.Water],
    ions: counts[ResidueKind.Ion],
    ligands: counts[ResidueKind.Ligand],
    atoms: atoms.count,
    hydrogens,
    atomsByGroup: byGroup,
    hetero: sortedHetero,
  };
}

/** A model is CA-only when ≥ 90 % of its protein residues have a CA and no N or C (common practice, no source). */
function isCaOnly(t: ConformerTable, model: Model): boolean {
  let protein = 0;
  let caOnly = 0;
  for (let k = 0; k < t.count; k++) {
    if (model.residues.kind[t.residue[k]] !== ResidueKind.Protein) continue;
    protein++;
    if (t.ca[k] >= 0 && t.n[k] < 0 && t.c[k] < 0) caOnly++;
  }
  return protein > 0 && caOnly >= 0.9 * protein;
}

function emptySummary(structure: Structure, model: Model, caOnly: boolean): ModelSummary {
  const notComputed = PENDING.map((p) => ({ ...p }));
  if (caOnly) {
    notComputed.unshift({
      statistic: 'backbone-torsions',
      reason:
        'The model has CA atoms only: phi, psi, omega, side-chain chi, covalent geometry, peptide, chirality and Ramachandran statistics need the full backbone.',
    });
  }
  return {
    composition: composition(structure, model),
    bonds: { count: 0, rmsd: null, rmsZ: null, outliers: 0 },
    angles: { count: 0, rmsd: null, rmsZ: null, outliers: 0 },
    cisPeptides: 0,
    cisProPeptides: 0,
    twistedPeptides: 0,
    dResidues: 0,
    cbOutliers: 0,
    bFactors: [],
    occupancy: { partialAtoms: 0, zeroAtoms: 0 },
    secondaryStructure: {},
    notComputed,
  };
}

function residueRows(ctx: Omit<ModelContext, 'report' | 'rowOfConformer'>): {
  rows: ResidueRow[];
  rowOfConformer: Int32Array;
} {
  const { structure, model, conformers: t, torsions: tor, caOnly } = ctx;
  const s = structure.strings;
  const { residues, chains } = model;
  const rows: ResidueRow[] = [];
  const rowOfConformer = new Int32Array(t.count).fill(-1);
  for (let k = 0; k < t.count; k++) {
    const r = t.residue[k];
    const kind = residues.kind[r];
    if (kind !== ResidueKind.Protein && kind !== ResidueKind.Nucleic) continue;
    const flags: ResidueFlag[] = [];
    if (t.breakBefore[k] === 1) flags.push('chain-break-before');
    if (residues.modified[r] === 1) flags.push('modified');
    if (kind === ResidueKind.Protein) {
      if (caOnly) flags.push('ca-only');
      else if (t.n[k] < 0 || t.ca[k] < 0 || t.c[k] < 0 || t.o[k] < 0) flags.push('missing-atoms');
      else {
        for (let j = 0; j < tor.chiCount[k]; j++) {
          if (Number.isNaN(tor.chi[k * MAX_CHI + j])) {
            flags.push('missing-atoms');
            break;
          }
        }
      }
    }
    const chi: (number | null)[] = [];
    for (let j = 0; j < tor.chiCount[k]; j++) chi.push(angle(tor.chi[k * MAX_CHI + j]));
    const ls = residues.labelSeq[r];
    rowOfConformer[k] = rows.length;
    rows.push({
      chain: s[chains.authId[residues.chain[r]]],
      seq: residues.authSeq[r],
      icode: s[residues.icode[r]],
      name: s[residues.name[r]],
      parent: s[residues.parent[r]],
      altloc: s[t.altloc[k]],
      labelChain: s[residues.labelAsym[r]],
      labelSeq: ls === -2147483648 ? null : ls,
      phi: angle(tor.phi[k]),
      psi: angle(tor.psi[k]),
      omega: angle(tor.omega[k]),
      chi,
      ss: '-',
      flags,
    });
  }
  return { rows, rowOfConformer };
}

/** Analyse one model of a structure (exported for workers that already hold a Structure). */
export function analyseModel(
  structure: Structure,
  model: Model,
  timings?: Record<string, number>,
  onStep?: (step: string) => void,
  scope: ReportScope = 'full',
): ModelContext {
  const t0 = timings !== undefined ? performance.now() : 0;
  const conformers = buildConformers(structure, model);
  const torsions = computeTorsions(structure, model, conformers);
  const caOnly = isCaOnly(conformers, model);
  const { rows, rowOfConformer } = residueRows({ structure, model, conformers, torsions, caOnly });
  const report: ModelReport = {
    model: model.num,
    summary: emptySummary(structure, model, caOnly),
    residues: rows,
  };
  const ctx: ModelContext = {
    structure,
    model,
    conformers,
    torsions,
    rowOfConformer,
    report,
    caOnly,
  };
  const analyses = scope === 'geometry' ? GEOMETRY_MODEL_ANALYSES : MODEL_ANALYSES;
  if (scope === 'geometry') {
    const nc = report.summary.notComputed;
    for (const statistic of GEOMETRY_ONLY_SKIPPED) {
      const e = nc.find((n) => n.statistic === statistic);
      if (e === undefined) nc.push({ statistic, reason: GEOMETRY_ONLY_REASON });
      else e.reason = GEOMETRY_ONLY_REASON;
    }
  }
  if (timings === undefined) {
    for (const analysis of analyses) {
      onStep?.(analysis.name);
      analysis(ctx);
    }
    return ctx;
  }
  timings['conformers+torsions+rows'] =
    (timings['conformers+torsions+rows'] ?? 0) + performance.now() - t0;
  for (const analysis of analyses) {
    onStep?.(analysis.name);
    const t = performance.now();
    analysis(ctx);
    const key = analysis.name || 'anonymous';
    timings[key] = (timings[key] ?? 0) + performance.now() - t;
  }
  return ctx;
}

/** Build the report from a structure already read (the input fields come from the caller). */
export function buildReportFromStructure(
  structure: Structure,
  bytes: Uint8Array,
  options: Pick<ReportOptions, 'model' | 'timings' | 'sha256' | 'onStep' | 'scope'> = {},
): Report {
  let models = structure.models;
  if (options.model !== undefined) {
    models = models.filter((m) => m.num === options.model);
    if (models.length === 0) {
      const nums = structure.models.map((m) => m.num);
      throw new StructureReadError(
        `The file has no model ${options.model} (it has model${nums.length > 1 ? 's' : ''} ${nums.slice(0, 10).join(', ')}${nums.length > 10 ? ', …' : ''}); choose one of those.`,
        { item: 'model' },
      );
    }
  }
  const scope = options.scope ?? 'full';
  const contexts = models.map((m, i) =>
    analyseModel(
      structure,
      m,
      options.timings,
      (step) => options.onStep?.(step, i, models.length),
      scope,
    ),
  );
  const report: Report = {
    schema: REPORT_SCHEMA,
    engine: { version: ENGINE_VERSION },
    reference: null,
    geometryLibrary: null,
    input: {
      sha256: timed(options.timings, 'sha256', () => (options.sha256 ?? sha256Hex)(bytes)),
      format: structure.format,
      gzip: structure.gzip,
      sizeBytes: bytes.length,
    },
    models: contexts.map((c) => c.report),
    ensemble: null,
    cautions: [],
  };
  const rctx: ReportContext = { structure, bytes, report, models: contexts };
  for (const analysis of scope === 'geometry' ? GEOMETRY_REPORT_ANALYSES : REPORT_ANALYSES) {
    const t = options.timings !== undefined ? performance.now() : 0;
    analysis(rctx);
    if (options.timings !== undefined) {
      const key = analysis.name || 'anonymous';
      options.timings[key] = (options.timings[key] ?? 0) + performance.now() - t;
    }
  }
  return report;
}

/** Input bytes (any supported format, optionally gzip) → `foldfolio.report/1`. */
export async function buildReport(bytes: Uint8Array, options: ReportOptions = {}): Promise<Report> {
  const t0 = options.timings !== undefined ? performance.now() : 0;
  const structure = await readStructure(bytes, options.filename ?? '', options);
  if (options.timings !== undefined) options.timings['read'] = performance.now() - t0;
  const report = buildReportFromStructure(structure, bytes, options);
  const t1 = options.timings !== undefined ? performance.now() : 0;
  await completeReport(report, bytes, options.filename ?? '', options);
  if (options.timings !== undefined) options.timings['experiment'] = performance.now() - t1;
  return report;
}

/** The report-wide steps after the per-model analyses: experimental records, then cautions. */
export async function completeReport(
  report: Report,
  bytes: Uint8Array,
  filename = '',
  options: ReadOptions = {},
): Promise<void> {
  await addExperiment(report, bytes, filename, options);
  report.cautions.push(...reportCautions(report));
}

/**
 * Adds the method and the experimental statistics read from the file's own records (PDBx items
 * or legacy REMARKs: read, not computed). A header we cannot read leaves them out — the
 * structure itself was read, so the report stands — and the cautions say so.
 */
export async function addExperiment(
  report: Report,
  bytes: Uint8Array,
  filename = '',
  options: ReadOptions = {},
): Promise<void> {
  try {
    const stats = await readExperimentFromBytes(bytes, filename, options);
    report.method = stats.method;
    report.experiment = experimentRecord(stats);
  } catch (err) {
    report.cautions.push(
      `The file's experimental records could not be read (${(err as Error).message}); enter the data-collection values in the methods-table form.`,
    );
  }
}
