/**
 * Ramachandran verdicts against our own empirical reference (Lovell et al. 2003, Proteins
 * 50:437: favored = the density contour enclosing 98 % of the reference residues, allowed =
 * 99.95 %), and the residue classes of SCIENCE.md.
 *
 * Pure TypeScript, no Node or DOM APIs.
 */
import type { RamaClass, RamaVerdict, Verdict } from '../report/types';
import type { Reference } from '../reference/reference';

/** |omega| below this is a cis peptide (common practice, no source; SCIENCE.md). */
export const CIS_OMEGA_DEG = 30;

/**
 * Class of residue i from its parent name, the omega of the peptide before it (between i−1
 * and i) and the parent name of residue i+1. Precedence: Gly, Pro (cis/trans by the preceding
 * omega), pre-Pro, Ile/Val, general — pre-Pro before Ile/Val as in the later refinements of
 * Lovell et al.'s classes (from memory).
 */
export function ramaClassOf(
  parent: string,
  omegaBeforeDeg: number | null,
  nextParent: string | null,
): RamaClass {
  if (parent === 'GLY') return 'gly';
  if (parent === 'PRO')
    return omegaBeforeDeg !== null && Math.abs(omegaBeforeDeg) < CIS_OMEGA_DEG
      ? 'cis-pro'
      : 'trans-pro';
  if (nextParent === 'PRO') return 'pre-pro';
  if (parent === 'ILE' || parent === 'VAL') return 'ile-val';
  return 'general';
}

export const RAMA_CLASSES: readonly RamaClass[] = [
  'general',
  'gly',
  'trans-pro',
  'cis-pro',
  'pre-pro',
  'ile-val',
];

/** Verdict for one residue; null when phi or psi is undefined. */
export function ramaVerdict(
  ref: Reference,
  cls: RamaClass,
  phiDeg: number | null,
  psiDeg: number | null,
): RamaVerdict | null {
  if (phiDeg === null || psiDeg === null) return null;
  const look = ref.rama[cls];
  const ln = look.lnAt(phiDeg, psiDeg);
  const lv = look.table.levels;
  const verdict: Verdict = ln >= lv.favored ? 'favored' : ln >= lv.allowed ? 'allowed' : 'outlier';
  return { class: cls, verdict, percentile: Math.round(look.percentile(ln) * 1000) / 1000 };
}

/** Region codes of `ramaRegionGrid`. */
export const RAMA_OUTLIER = 0;
export const RAMA_ALLOWED = 1;
export const RAMA_FAVORED = 2;

/**
 * The favored/allowed regions of a class on the reference grid, for figures: codes[iPhi·size +
 * iPsi] (RAMA_* values) for the cell centred at phi = −180 + (iPhi + ½)·step, likewise psi.
 */
export function ramaRegionGrid(
  ref: Reference,
  cls: RamaClass,
): { stepDeg: number; size: number; codes: Uint8Array } {
  const look = ref.rama[cls];
  const { size, stepDeg } = look.grid;
  const lv = look.table.levels;
  const codes = new Uint8Array(size * size);
  for (let i = 0; i < codes.length; i++) {
    const ln = look.lnDensity[i];
    codes[i] = ln >= lv.favored ? RAMA_FAVORED : ln >= lv.allowed ? RAMA_ALLOWED : RAMA_OUTLIER;
  }
  return { stepDeg, size, codes };
}
