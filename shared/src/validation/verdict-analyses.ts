/**
 * Report-builder steps for the verdicts against the shipped reference (Ramachandran, rotamer,
 * hard-sphere steric status) and the all-atom overlaps. report/build.ts runs them through
 * MODEL_ANALYSES (per model) and REPORT_ANALYSES (`referenceStep` names the reference version).
 */
import type { ModelContext, ReportContext } from '../report/build';
import type { ModelSummary, RamaClass, ResidueFlag, StericStatus } from '../report/types';
import { ResidueKind } from '../model/types';
import { MAX_CHI } from './torsions';
import { defaultReference } from '../reference';
import { RAMA_CLASSES, ramaClassOf, ramaVerdict } from './ramachandran';
import { rotamerVerdict } from './rotamer';
import { evaluateSteric, stericKindFor, stericStatusAt, type StericMap } from './steric';
import { angleDeg } from '../geometry/vec';
import { analyzeOverlaps, overlapForReport } from './overlaps';

function flag(ctx: ModelContext, k: number, f: ResidueFlag): void {
  const row = ctx.rowOfConformer[k];
  if (row < 0) return;
  const flags = ctx.report.residues[row].flags;
  if (!flags.includes(f)) flags.push(f);
}

function done(summary: ModelSummary, statistic: string): void {
  summary.notComputed = summary.notComputed.filter((n) => n.statistic !== statistic);
}

function notComputed(summary: ModelSummary, statistic: string, reason: string): void {
  const e = summary.notComputed.find((n) => n.statistic === statistic);
  if (e) e.reason = reason;
  else summary.notComputed.push({ statistic, reason });
}

const CA_ONLY =
  'The model has CA atoms only: Ramachandran, rotamer, steric and all-atom overlap analyses need the full backbone and side chains.';

/**
 * The widest τ(N–CA–C) at which a residue is judged: the classic hard-sphere maps were computed
 * for τ from 105° to 115° (Ramakrishnan & Ramachandran 1965, from memory).
 */
export const STERIC_TAU_MAX_DEG = 115;

/**
 * Hard-sphere status of one residue. The shipped maps are for τ = 110°, where the right-handed
 * α region ends at phi ≈ −58° (C(i−1)···C(i) reaches the 3.0 Å outer limit; the classic
 * borderline near (−57°, −47°), SCIENCE.md), so about a fifth of ordinary helical residues fell
 * outside it although their own τ is wider (mean 112–113.5° among them in 1A8O, 1EJG, 4ZHL,
 * 6WQA; ideal 111.2°, Engh & Huber 1991) and widening τ enlarges the α region (SCIENCE.md).
 * A residue the map calls disallowed is therefore judged again by the hard-sphere dipeptide at
 * its own τ, clamped to [110°, 115°]: only a residue outside the outer limit at its own
 * geometry is 'disallowed' (and flagged). Cost: one dipeptide per such residue.
 */
export function stericStatusOwnTau(
  map: StericMap,
  parent: string,
  phi: number,
  psi: number,
  tauDeg: number,
): StericStatus {
  const atMap = stericStatusAt(map, phi, psi);
  if (atMap !== 'disallowed' || !Number.isFinite(tauDeg) || tauDeg <= map.tauDeg) return atMap;
  const tau = Math.min(STERIC_TAU_MAX_DEG, tauDeg);
  return evaluateSteric(stericKindFor(parent), phi, psi, tau).status;
}

/** Ramachandran verdicts, steric status and rotamer verdicts per residue conformer. */
export function verdictStep(ctx: ModelContext): void {
  const { structure, model, conformers: t, torsions: tor, report } = ctx;
  const summary = report.summary;
  if (ctx.caOnly) {
    notComputed(summary, 'ramachandran', CA_ONLY);
    notComputed(summary, 'rotamers', CA_ONLY);
    return;
  }
  const ref = defaultReference();
  const S = structure.strings;
  const parentOf = (k: number): string => S[model.residues.parent[t.residue[k]]];
  const zero = () => ({ favored: 0, allowed: 0, outlier: 0, total: 0 });
  const overall = zero();
  const byClass: Record<string, ReturnType<typeof zero>> = {};
  for (const c of RAMA_CLASSES) byClass[c] = zero();
  const rot = zero();
  for (let k = 0; k < t.count; k++) {
    const row = ctx.rowOfConformer[k];
    if (row < 0 || model.residues.kind[t.residue[k]] !== ResidueKind.Protein) continue;
    const r = report.residues[row];
    const parent = parentOf(k);
    const phi = tor.phi[k];
    const psi = tor.psi[k];
    if (Number.isFinite(phi) && Number.isFinite(psi)) {
      const p = t.prev[k];
      const q = t.next[k];
      const cls: RamaClass = ramaClassOf(
        parent,
        p >= 0 && Number.isFinite(tor.omega[p]) ? tor.omega[p] : null,
        q >= 0 ? parentOf(q) : null,
      );
      const v = ramaVerdict(ref, cls, phi, psi);
      if (v) {
        r.rama = v;
        overall[v.verdict]++;
        overall.total++;
        byClass[cls][v.verdict]++;
        byClass[cls].total++;
        if (v.verdict === 'outlier') flag(ctx, k, 'rama-outlier');
        else if (v.verdict === 'allowed') flag(ctx, k, 'rama-allowed');
      }
      const a = t.n[k];
      const b = t.ca[k];
      const c = t.c[k];
      const tau = a >= 0 && b >= 0 && c >= 0 ? angleDeg(model.atoms, a, b, c) : NaN;
      const steric = stericStatusOwnTau(ref.steric[stericKindFor(parent)], parent, phi, psi, tau);
      r.steric = steric;
      if (steric === 'disallowed') flag(ctx, k, 'steric-disallowed');
    } else {
      r.rama = null;
      r.steric = null;
    }
    const chi: (number | null)[] = [];
    for (let j = 0; j < tor.chiCount[k]; j++) {
      const c = tor.chi[k * MAX_CHI + j];
      chi.push(Number.isFinite(c) ? c : null);
    }
    const rv = rotamerVerdict(ref, parent, chi);
    r.rotamer = rv;
    if (rv) {
      rot[rv.verdict]++;
      rot.total++;
      if (rv.verdict === 'outlier') flag(ctx, k, 'rotamer-outlier');
    }
  }
  const usedClasses: Record<string, ReturnType<typeof zero>> = {};
  for (const c of RAMA_CLASSES) if (byClass[c].total > 0) usedClasses[c] = byClass[c];
  summary.rama = { overall, byClass: usedClasses };
  summary.rotamers = rot;
  done(summary, 'ramachandran');
  done(summary, 'rotamers');
}

/** All-atom overlaps (riding H added where absent; electron-cloud X–H lengths). */
export function overlapStep(ctx: ModelContext): void {
  const { structure, model, conformers: t, report } = ctx;
  if (ctx.caOnly) {
    notComputed(report.summary, 'overlaps', CA_ONLY);
    return;
  }
  const res = analyzeOverlaps(structure, model, { table: t });
  report.summary.overlaps = {
    severe: res.severe.length,
    perThousandAtoms: res.perThousandAtoms,
    hydrogens: res.hydrogens,
    xhConvention: res.xhConvention,
  };
  report.overlaps = res.severe.map((p) => overlapForReport(structure, model, res.all, p));
  // flag the residue conformers involved
  const conformerOf = (atom: number): number[] => {
    const r = res.all.residue[atom];
    const alt = res.all.altloc[atom];
    const out: number[] = [];
    for (let k = t.firstOfResidue[r]; k < t.firstOfResidue[r] + t.countOfResidue[r]; k++)
      if (alt === 0 || t.altloc[k] === alt) out.push(k);
    return out;
  };
  for (const p of res.severe)
    for (const a of [p.a, p.b]) for (const k of conformerOf(a)) flag(ctx, k, 'severe-overlap');
  done(report.summary, 'overlaps');
}

export const VERDICT_MODEL_ANALYSES: ((ctx: ModelContext) => void)[] = [verdictStep, overlapStep];

/** Name the reference version in the report. */
export function referenceStep(ctx: ReportContext): void {
  const ref = defaultReference();
  ctx.report.reference = { id: ref.id, sha256: ref.sha256 };
}
