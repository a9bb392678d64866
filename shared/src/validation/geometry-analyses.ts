/**
 * The report-builder steps of the covalent-geometry / peptide / chirality / secondary-structure
 * / composition / ensemble analyses (report/build.ts runs them through MODEL_ANALYSES and
 * REPORT_ANALYSES). Each step fills its summary fields, the residue rows and flags, and removes
 * its entry from `summary.notComputed`.
 */
import type { ModelContext, ReportContext } from '../report/build';
import type { ModelSummary, ResidueFlag } from '../report/types';
import { assignSecondaryStructure } from '../secondary/dssp';
import { bFactorSummary, occupancySummary, sequenceGaps } from './composition';
import { analyseChirality } from './chirality';
import { analyseCovalent, covalentOutlierRows } from './covalent';
import { defaultSideChainLibrary } from './ideal/sidechain-library';
import { caRmsdToFirst, summarySpread } from './ensemble';
import { analysePeptides } from './peptides';

const CA_ONLY_REASON =
  'The model has CA atoms only: covalent geometry, peptide, chirality and secondary-structure statistics need the full backbone.';

function done(summary: ModelSummary, statistic: string): void {
  summary.notComputed = summary.notComputed.filter((n) => n.statistic !== statistic);
}

function explainCaOnly(summary: ModelSummary, statistic: string): void {
  const entry = summary.notComputed.find((n) => n.statistic === statistic);
  if (entry) entry.reason = CA_ONLY_REASON;
  else summary.notComputed.push({ statistic, reason: CA_ONLY_REASON });
}

function flag(ctx: ModelContext, k: number, f: ResidueFlag): void {
  const row = ctx.rowOfConformer[k];
  if (row < 0) return;
  const flags = ctx.report.residues[row].flags;
  if (!flags.includes(f)) flags.push(f);
}

const r4 = (x: number | null): number | null => (x === null ? null : Math.round(x * 1e4) / 1e4);
const r3 = (x: number): number => Math.round(x * 1e3) / 1e3;

export function covalentStep(ctx: ModelContext): void {
  const { structure, model, conformers: t, report } = ctx;
  if (ctx.caOnly) return explainCaOnly(report.summary, 'covalent-geometry');
  const res = analyseCovalent(structure, model, t);
  report.summary.bonds = { ...res.bonds, rmsd: r4(res.bonds.rmsd), rmsZ: r4(res.bonds.rmsZ) };
  report.summary.angles = { ...res.angles, rmsd: r4(res.angles.rmsd), rmsZ: r4(res.angles.rmsZ) };
  report.geometryOutliers = covalentOutlierRows(structure, model, t, res.outliers);
  for (let k = 0; k < t.count; k++) {
    const row = ctx.rowOfConformer[k];
    if (row < 0) continue;
    const b = res.bondZMax[k];
    const a = res.angleZMax[k];
    report.residues[row].bondZMax = Number.isNaN(b) ? null : r3(b);
    report.residues[row].angleZMax = Number.isNaN(a) ? null : r3(a);
  }
  for (const o of res.outliers)
    flag(ctx, o.conformer, o.kind === 'bond' ? 'bond-outlier' : 'angle-outlier');
  done(report.summary, 'covalent-geometry');
}

export function peptideStep(ctx: ModelContext): void {
  const { structure, model, conformers: t, report } = ctx;
  if (ctx.caOnly) return explainCaOnly(report.summary, 'peptides');
  const res = analysePeptides(structure, model, t);
  report.summary.cisPeptides = res.cis;
  report.summary.cisProPeptides = res.cisPro;
  report.summary.twistedPeptides = res.twisted;
  for (let k = 0; k < t.count; k++) {
    if (res.state[k] === 1) flag(ctx, k, 'cis-peptide');
    else if (res.state[k] === 2) flag(ctx, k, 'twisted-peptide');
  }
  done(report.summary, 'peptides');
}

export function chiralityStep(ctx: ModelContext): void {
  const { structure, model, conformers: t, report } = ctx;
  if (ctx.caOnly) return explainCaOnly(report.summary, 'chirality');
  const res = analyseChirality(structure, model, t);
  report.summary.dResidues = res.dResidues;
  report.summary.cbOutliers = res.cbOutliers;
  for (let k = 0; k < t.count; k++) {
    const row = ctx.rowOfConformer[k];
    if (row < 0) continue;
    const d = res.cbDeviationA[k];
    report.residues[row].cbDeviationA = Number.isNaN(d) ? null : r3(d);
    if (res.chiralVolumeA3[k] < 0) flag(ctx, k, 'd-residue');
    if (d > 0.25) flag(ctx, k, 'cb-deviation');
  }
  done(report.summary, 'chirality');
}

export function secondaryStructureStep(ctx: ModelContext): void {
  const { structure, model, conformers: t, report } = ctx;
  if (ctx.caOnly) return explainCaOnly(report.summary, 'secondary-structure');
  const res = assignSecondaryStructure(structure, model, t);
  for (let k = 0; k < t.count; k++) {
    const row = ctx.rowOfConformer[k];
    if (row >= 0) report.residues[row].ss = res.ss[t.residue[k]];
  }
  const counts: Record<string, number> = {};
  for (const key of Object.keys(res.counts).sort()) counts[key] = res.counts[key];
  report.summary.secondaryStructure = counts;
  done(report.summary, 'secondary-structure');
}

export function compositionStep(ctx: ModelContext): void {
  const { structure, model, conformers: t, report } = ctx;
  report.summary.bFactors = bFactorSummary(structure, model);
  report.summary.occupancy = occupancySummary(model);
  const gaps = sequenceGaps(structure, model);
  if (gaps.basis !== 'none') report.summary.sequenceGaps = gaps.gaps;
  const { atomStart, atomEnd } = model.residues;
  const { altloc, bIso, occupancy } = model.atoms;
  for (let k = 0; k < t.count; k++) {
    const row = ctx.rowOfConformer[k];
    if (row < 0) continue;
    const r = t.residue[k];
    const alt = t.altloc[k];
    let n = 0;
    let sum = 0;
    let occMin = Infinity;
    for (let i = atomStart[r]; i < atomEnd[r]; i++) {
      if (alt !== 0 && altloc[i] !== 0 && altloc[i] !== alt) continue;
      n++;
      sum += bIso[i];
      if (occupancy[i] < occMin) occMin = occupancy[i];
    }
    report.residues[row].bMean = n ? Math.round((sum / n) * 100) / 100 : null;
    report.residues[row].occupancyMin = n ? Math.round(occMin * 100) / 100 : null;
  }
}

/** Per-model steps in the order they run. */
export const GEOMETRY_MODEL_ANALYSES: ((ctx: ModelContext) => void)[] = [
  compositionStep,
  covalentStep,
  peptideStep,
  chiralityStep,
  secondaryStructureStep,
];

/** Multi-model files: per-model spread and CA RMSD to the first model. Runs after every model. */
export function ensembleStep(ctx: ReportContext): void {
  if (ctx.models.length < 2) return;
  const rmsd = caRmsdToFirst(
    ctx.structure,
    ctx.models.map((m) => ({ model: m.model, conformers: m.conformers })),
  );
  const spread = summarySpread(ctx.models.map((m) => m.report.summary));
  const rounded: Record<string, { mean: number; sd: number; min: number; max: number }> = {};
  for (const [k, v] of Object.entries(spread)) {
    rounded[k] = { mean: r4(v.mean)!, sd: r4(v.sd)!, min: r4(v.min)!, max: r4(v.max)! };
  }
  const unmatched = rmsd.filter((x) => x === null).length;
  ctx.report.ensemble = {
    models: ctx.models.length,
    caRmsdToFirstA: rmsd
      .map((x) => (x === null ? Number.NaN : r3(x)))
      .filter((x) => !Number.isNaN(x)),
    spread: rounded,
  };
  if (unmatched > 0) {
    ctx.report.cautions.push(
      `${unmatched} model(s) share fewer than three CA atoms with model 1, so their CA RMSD to model 1 is left out; check that every model holds the same chains and residue numbers.`,
    );
  }
}

/** Name the side-chain ideal-geometry library the covalent statistics used. */
export function geometryLibraryStep(ctx: ReportContext): void {
  const lib = defaultSideChainLibrary();
  ctx.report.geometryLibrary = { id: lib.id, sha256: lib.sha256 };
}
