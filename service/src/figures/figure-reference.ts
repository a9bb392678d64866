/**
 * The shipped reference (empirical densities + hard-sphere maps) as region grids for the
 * torsion figure: favored = density at or above the level enclosing 98 % of the reference
 * residues, allowed = 99.95 % (Lovell et al. 2003, as the reference artefact records them);
 * steric outline = the outer-limit contact map (Ramachandran & Sasisekharan 1968).
 */
import type { RamaClass, Report } from '@foldfolio/shared';
import { defaultReference, type Reference } from '@foldfolio/shared/dist/reference/index.js';
import type { FigureReference, RegionGrid } from './types.js';

const STERIC_KIND: Record<RamaClass, 'ala' | 'gly' | 'pro'> = {
  general: 'ala',
  gly: 'gly',
  'trans-pro': 'pro',
  'cis-pro': 'pro',
  'pre-pro': 'ala',
  'ile-val': 'ala',
};

const cache = new Map<string, FigureReference>();

export function figureReferenceFrom(ref: Reference): FigureReference {
  const hit = cache.get(ref.sha256);
  if (hit) return hit;
  const empirical: Partial<Record<RamaClass, RegionGrid>> = {};
  const steric: Partial<Record<RamaClass, RegionGrid>> = {};
  for (const cls of Object.keys(ref.rama) as RamaClass[]) {
    const d = ref.rama[cls];
    const { favored, allowed } = d.table.levels;
    const codes = new Uint8Array(d.lnDensity.length);
    for (let i = 0; i < codes.length; i++)
      codes[i] = d.lnDensity[i] >= favored ? 2 : d.lnDensity[i] >= allowed ? 1 : 0;
    empirical[cls] = { stepDeg: d.grid.stepDeg, size: d.grid.size, codes };
    const s = ref.steric[STERIC_KIND[cls]];
    // code 1 = outer limit, 2 = fully allowed (validation/steric.ts): outline encloses ≥ 1
    steric[cls] = { stepDeg: s.stepDeg, size: s.size, codes: s.codes };
  }
  const out: FigureReference = { id: ref.id, empirical, steric };
  cache.set(ref.sha256, out);
  return out;
}

/** The reference the report was computed with, when it is the one shipped with this engine. */
export function figureReferenceForReport(report: Report): FigureReference | null {
  if (!report.reference) return null;
  const ref = defaultReference();
  return ref.sha256 === report.reference.sha256 ? figureReferenceFrom(ref) : null;
}
