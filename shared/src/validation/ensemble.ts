/**
 * NMR ensembles (and any multi-model file): per-model values and their spread across models,
 * and the CA RMSD of each model to the first after least-squares superposition (Kabsch 1976,
 * geometry/superpose.ts) on the CA atoms both models share, matched by chain, author number
 * and insertion code (first conformer of each residue).
 *
 * Spread: mean, sample standard deviation (n − 1 in the denominator; 0 for a single model),
 * minimum and maximum of each summary value that every model has.
 */
import { superpose } from '../geometry/superpose';
import type { ConformerTable } from '../model/conformers';
import type { Model, Structure } from '../model/types';
import { ResidueKind } from '../model/types';
import type { ModelSummary } from '../report/types';

export interface Spread {
  mean: number;
  sd: number;
  min: number;
  max: number;
}

function caMap(structure: Structure, model: Model, t: ConformerTable): Map<string, number> {
  const s = structure.strings;
  const out = new Map<string, number>();
  for (let r = 0; r < model.residues.count; r++) {
    if (model.residues.kind[r] !== ResidueKind.Protein) continue;
    const ca = t.ca[t.firstOfResidue[r]];
    if (ca < 0) continue;
    const key = `${s[model.chains.authId[model.residues.chain[r]]]}:${model.residues.authSeq[r]}${s[model.residues.icode[r]]}`;
    if (!out.has(key)) out.set(key, ca);
  }
  return out;
}

/** CA RMSD of every model to the first (0 for the first), Å; null when fewer than 3 CA match. */
export function caRmsdToFirst(
  structure: Structure,
  models: { model: Model; conformers: ConformerTable }[],
): (number | null)[] {
  if (models.length === 0) return [];
  const first = caMap(structure, models[0].model, models[0].conformers);
  const a0 = models[0].model.atoms;
  return models.map(({ model, conformers }, m) => {
    if (m === 0) return 0;
    const here = caMap(structure, model, conformers);
    const mobile: number[] = [];
    const target: number[] = [];
    for (const [key, i] of first) {
      const j = here.get(key);
      if (j === undefined) continue;
      target.push(a0.x[i], a0.y[i], a0.z[i]);
      mobile.push(model.atoms.x[j], model.atoms.y[j], model.atoms.z[j]);
    }
    if (mobile.length < 9) return null;
    return superpose(mobile, target).rmsdA;
  });
}

/** Numeric summary values compared across models, by name. */
export function summaryValues(summary: ModelSummary): Record<string, number> {
  const v: Record<string, number> = {};
  const put = (k: string, x: number | null | undefined): void => {
    if (x !== null && x !== undefined && Number.isFinite(x)) v[k] = x;
  };
  put('bondRmsdA', summary.bonds.rmsd);
  put('bondRmsZ', summary.bonds.rmsZ);
  put('angleRmsdDeg', summary.angles.rmsd);
  put('angleRmsZ', summary.angles.rmsZ);
  put('bondOutliers', summary.bonds.outliers);
  put('angleOutliers', summary.angles.outliers);
  put('cisPeptides', summary.cisPeptides);
  put('twistedPeptides', summary.twistedPeptides);
  put('dResidues', summary.dResidues);
  put('cbOutliers', summary.cbOutliers);
  const ss = summary.secondaryStructure;
  const total = Object.values(ss).reduce((p, q) => p + q, 0);
  if (total > 0) {
    put('helixPercent', (100 * ((ss.H ?? 0) + (ss.G ?? 0) + (ss.I ?? 0))) / total);
    put('strandPercent', (100 * ((ss.E ?? 0) + (ss.B ?? 0))) / total);
  }
  const rama = summary.rama?.overall;
  if (rama && rama.total > 0) {
    put('ramaFavoredPercent', (100 * rama.favored) / rama.total);
    put('ramaOutlierPercent', (100 * rama.outlier) / rama.total);
  }
  if (summary.overlaps) put('severeOverlapsPerThousandAtoms', summary.overlaps.perThousandAtoms);
  return v;
}

export function spreadOf(values: number[]): Spread {
  const n = values.length;
  const mean = values.reduce((p, q) => p + q, 0) / n;
  const ss = values.reduce((p, q) => p + (q - mean) * (q - mean), 0);
  return {
    mean,
    sd: n > 1 ? Math.sqrt(ss / (n - 1)) : 0,
    min: Math.min(...values),
    max: Math.max(...values),
  };
}

/** Spread of every summary value present in all models. */
export function summarySpread(summaries: ModelSummary[]): Record<string, Spread> {
  const per = summaries.map(summaryValues);
  const out: Record<string, Spread> = {};
  if (per.length === 0) return out;
  for (const key of Object.keys(per[0]).sort()) {
    if (per.every((p) => key in p)) out[key] = spreadOf(per.map((p) => p[key]));
  }
  return out;
}
