/**
 * Side-chain rotamer verdicts against our own empirical chi densities (the approach of
 * Lovell et al. 2000, Proteins 40:389, and 2003: density in chi space per residue type).
 *
 * Choice: the density uses chi1 and, where defined, chi2 (a 2-D torus); chi3–chi5 are not used
 * (4-D grids would not fit a small artefact). The last used chi of PHE, TYR and ASP is
 * 180°-symmetric (equivalent ring/carboxylate atoms), so the reference counts each such residue
 * at chi2 and chi2 + 180° with half weight each.
 *
 * Pure TypeScript, no Node or DOM APIs.
 */
import type { RotamerVerdict } from '../report/types';
import type { Reference } from '../reference/reference';

/** Number of chi angles used per residue type (IUPAC-IUB 1970 definitions, capped at 2). */
export const ROTAMER_CHI_USED: Readonly<Record<string, number>> = {
  SER: 1,
  CYS: 1,
  THR: 1,
  VAL: 1,
  ILE: 2,
  LEU: 2,
  ASP: 2,
  ASN: 2,
  HIS: 2,
  PHE: 2,
  TYR: 2,
  TRP: 2,
  MET: 2,
  GLU: 2,
  GLN: 2,
  LYS: 2,
  ARG: 2,
};

/** Residue types whose last used chi is 180°-symmetric. */
export const ROTAMER_SYMMETRIC: ReadonlySet<string> = new Set(['PHE', 'TYR', 'ASP']);

/** Default outlier cut: below 0.3 % of the reference (from memory of published practice). */
export const ROTAMER_OUTLIER_PERCENT = 0.3;
/** Favored at or above 2 % (our choice, mirroring the Ramachandran 98 % contour). */
export const ROTAMER_FAVORED_PERCENT = 2;

/** Names each chi by its staggered well: p (≈ +60°), t (≈ 180°), m (≈ −60°). */
export function chiWellName(chis: readonly number[]): string {
  return chis.map((c) => (c >= 0 && c < 120 ? 'p' : c >= -120 && c < 0 ? 'm' : 't')).join('');
}

export function rotamerVerdict(
  ref: Reference,
  parent: string,
  chi: readonly (number | null)[],
  outlierPercent = ROTAMER_OUTLIER_PERCENT,
): RotamerVerdict | null {
  const used = ROTAMER_CHI_USED[parent];
  if (!used) return null;
  const look = ref.rotamer.get(parent);
  if (!look) return null;
  const chis: number[] = [];
  for (let i = 0; i < used; i++) {
    const c = chi[i];
    if (c === null || c === undefined) return null;
    chis.push(c);
  }
  const ln = used === 1 ? look.lnAt(chis[0]) : look.lnAt(chis[0], chis[1]);
  const pct = look.percentile(ln);
  const verdict =
    pct < outlierPercent ? 'outlier' : pct < ROTAMER_FAVORED_PERCENT ? 'allowed' : 'favored';
  return { name: chiWellName(chis), percentile: Math.round(pct * 1000) / 1000, verdict };
}
