/**
 * Plain-language cautions: values that should make an author look again, worded as what to do
 * next. One set of rules for every consumer (report, CLI, Quality tab, review-package README).
 * Each threshold names its source. Validation supports, not replaces, the judgement of the people
 * who built the model and the journal's and archive's own requirements.
 */
import type { ModelSummary, Report } from './types';

/** Shown wherever cautions are shown (UI, CLI, package README). */
export const VALIDATION_NOTE =
  "Validation statistics support, not replace, the judgement of the people who built the model and the journal's and archive's own requirements.";

const num = (report: Report, key: string): number | null => {
  const v = report.experiment?.[key]?.value;
  const n = typeof v === 'number' ? v : typeof v === 'string' ? Number(v) : Number.NaN;
  return Number.isFinite(n) ? n : null;
};

const pct = (part: number, total: number): string =>
  total > 0 ? `${((100 * part) / total).toFixed(1)} %` : '0 %';

interface Totals {
  ramaOut: number;
  ramaFav: number;
  ramaTotal: number;
  rotOut: number;
  rotTotal: number;
  cisNonPro: number;
  twisted: number;
  dRes: number;
  cb: number;
  bondOut: number;
  angleOut: number;
  severe: number;
  atoms: number;
}

function totals(summaries: ModelSummary[]): Totals {
  const t: Totals = {
    ramaOut: 0,
    ramaFav: 0,
    ramaTotal: 0,
    rotOut: 0,
    rotTotal: 0,
    cisNonPro: 0,
    twisted: 0,
    dRes: 0,
    cb: 0,
    bondOut: 0,
    angleOut: 0,
    severe: 0,
    atoms: 0,
  };
  for (const s of summaries) {
    if (s.rama) {
      t.ramaOut += s.rama.overall.outlier;
      t.ramaFav += s.rama.overall.favored;
      t.ramaTotal += s.rama.overall.total;
    }
    if (s.rotamers) {
      t.rotOut += s.rotamers.outlier;
      t.rotTotal += s.rotamers.total;
    }
    t.cisNonPro += s.cisPeptides - s.cisProPeptides;
    t.twisted += s.twistedPeptides;
    t.dRes += s.dResidues;
    t.cb += s.cbOutliers;
    t.bondOut += s.bonds.outliers;
    t.angleOut += s.angles.outliers;
    if (s.overlaps) {
      t.severe += s.overlaps.severe;
      t.atoms += s.composition.atoms;
    }
  }
  return t;
}

/** The cautions for a finished report (its own engine cautions first, then these rules). */
export function reportCautions(report: Report): string[] {
  const out: string[] = [];
  const n = report.models.length;
  const where = n > 1 ? ` across the ${n} models` : '';
  const t = totals(report.models.map((m) => m.summary));

  // Ramachandran: well-refined, high-resolution structures reach about 98 % favored and
  // well under 1 % outliers (Lovell et al. 2003, Proteins 50:437); 0.2 % is our line.
  if (t.ramaTotal > 0 && t.ramaOut / t.ramaTotal > 0.002)
    out.push(
      `${t.ramaOut} of ${t.ramaTotal} residues (${pct(t.ramaOut, t.ramaTotal)})${where} are Ramachandran outliers, more than in a typical well-refined model; look at each one against the density.`,
    );
  else if (t.ramaTotal > 0 && t.ramaFav / t.ramaTotal < 0.98)
    out.push(
      `Only ${pct(t.ramaFav, t.ramaTotal)} of residues${where} lie in the favored Ramachandran regions (about 98 % is usual for good models); check the flagged stretches.`,
    );
  // Rotamers: about 1 % outliers is a common target for well-refined models (from memory).
  if (t.rotTotal > 0 && t.rotOut / t.rotTotal > 0.01)
    out.push(
      `${t.rotOut} of ${t.rotTotal} side chains (${pct(t.rotOut, t.rotTotal)})${where} are rotamer outliers; check that the density supports them.`,
    );
  // cis peptides not before Pro occur at about 0.03 % of such bonds (Jabs, Weiss & Hilgenfeld
  // 1999, J Mol Biol 286:291): each one needs clear density.
  if (t.cisNonPro > 0)
    out.push(
      `${t.cisNonPro} cis peptide(s) before a residue other than proline${where}: these are rare, so make sure each is supported by clear density.`,
    );
  if (t.twisted > 0)
    out.push(
      `${t.twisted} peptide(s)${where} are twisted far from planar (|ω| between 30° and 150°); re-examine them.`,
    );
  if (t.dRes > 0)
    out.push(
      `${t.dRes} residue(s)${where} have D (inverted) handedness at Cα; unless the residue really is a D amino acid, rebuild it.`,
    );
  // Cβ deviations > 0.25 Å are absent from well-refined models (Lovell et al. 2003).
  if (t.cb > 0)
    out.push(
      `${t.cb} residue(s)${where} have a Cβ more than 0.25 Å from its ideal position, often a sign of a backbone or side chain built the wrong way round.`,
    );
  // > 4σ from the restraint library's ideal values (common practice, no source).
  if (t.bondOut + t.angleOut > 0)
    out.push(
      `${t.bondOut} bond length(s) and ${t.angleOut} bond angle(s)${where} deviate by more than 4σ from ideal values; check those residues.`,
    );
  // Single-digit severe overlaps per 1000 atoms are typical of carefully refined models (from memory).
  if (t.atoms > 0 && (1000 * t.severe) / t.atoms > 10)
    out.push(
      `${t.severe} severe atom overlaps (≥ 0.4 Å), ${((1000 * t.severe) / t.atoms).toFixed(1)} per 1000 atoms${where}: look at the worst contacts.`,
    );

  // Refinement statistics from the file (common practice, no source — SCIENCE.md rules of thumb).
  const rWork = num(report, 'rWork');
  const rFree = num(report, 'rFree');
  const dHigh = num(report, 'refineResolutionHighA') ?? num(report, 'resolutionHighA');
  if (rWork !== null && rFree !== null && rFree - rWork > 0.05)
    out.push(
      `R-free exceeds R-work by ${(rFree - rWork).toFixed(3)} (more than about 0.05): the model may be over-fitted; reviewers will ask about it.`,
    );
  if (rFree !== null && dHigh !== null && dHigh < 2.5 && rFree > 0.3)
    out.push(
      `R-free is ${rFree.toFixed(3)} at ${dHigh.toFixed(2)} Å resolution, high for data better than 2.5 Å; check the model and the refinement.`,
    );
  // statistics the model does not allow, one line per reason (a CA-only model has one reason)
  const byReason = new Map<string, Set<string>>();
  for (const m of report.models)
    for (const nc of m.summary.notComputed) {
      const names = byReason.get(nc.reason) ?? new Set<string>();
      names.add(nc.statistic.replace(/-/g, ' '));
      byReason.set(nc.reason, names);
    }
  for (const [reason, names] of byReason)
    out.push(`Not computed: ${[...names].join(', ')}. ${reason}`);
  return out;
}
