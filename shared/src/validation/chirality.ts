/**
 * CA chirality and Cβ deviation.
 *
 * Chirality: the chiral volume V = (N−CA)·[(C−CA)×(CB−CA)] is about +2.5 Å³ for L amino acids
 * (checked on real entries with gemmi coordinates, see test/chirality.test.ts); V < 0 marks a
 * D residue (Gly has no chiral CA and is skipped).
 *
 * Cβ deviation (Lovell et al. 2003, Proteins 50:437: > 0.25 Å is an outlier): distance from the
 * modelled CB to an ideal CB built from the modelled N, CA and C. Our construction: the point at
 * the ideal CA–CB distance from CA that makes exactly the ideal N–CA–CB and CB–CA–C angles
 * (Engh & Huber 2001, see ideal/engh-huber.ts) on the L side of the N–CA–C plane. Written in the
 * basis u = unit(N−CA), v = unit(C−CA), w = unit(u×v): CB−CA = d·(a·u + b·v + c·w) with a, b
 * from the two angle conditions and c = +√(1 − |a·u + b·v|²) (the L hand, which gives V > 0).
 */
import type { ConformerTable } from '../model/conformers';
import type { Model, Structure } from '../model/types';
import { ResidueKind } from '../model/types';
import { STANDARD_AMINO_ACIDS } from '../io/residue-tables';
import { caCbBond, cbAngles } from './ideal/engh-huber';
import type { AtomColumns } from '../model/types';

/** Lovell et al. 2003: Cβ more than 0.25 Å from its ideal position is an outlier. */
export const CB_DEVIATION_LIMIT_A = 0.25;

export interface ChiralityResult {
  /** chiral volume per conformer, NaN where undefined */
  chiralVolumeA3: Float64Array;
  /** Cβ deviation per conformer, NaN where undefined */
  cbDeviationA: Float64Array;
  /** residues with a D conformer / with a Cβ outlier conformer */
  dResidues: number;
  cbOutliers: number;
}

/** The ideal CB position for an L residue from N, CA, C coordinates, or null when degenerate. */
export function idealCb(
  n: [number, number, number],
  ca: [number, number, number],
  c: [number, number, number],
  parent: string,
): [number, number, number] | null {
  const d = caCbBond(parent).ideal;
  const ang = cbAngles(parent);
  const u = unit([n[0] - ca[0], n[1] - ca[1], n[2] - ca[2]]);
  const v = unit([c[0] - ca[0], c[1] - ca[1], c[2] - ca[2]]);
  if (!u || !v) return null;
  const w = unit(cross(u, v));
  if (!w) return null;
  const cu = Math.cos((ang.nCaCb.ideal * Math.PI) / 180);
  const cv = Math.cos((ang.cbCaC.ideal * Math.PI) / 180);
  const g = u[0] * v[0] + u[1] * v[1] + u[2] * v[2];
  // a + b·g = cu ; a·g + b = cv
  const det = 1 - g * g;
  const a = (cu - cv * g) / det;
  const b = (cv - cu * g) / det;
  const inPlane2 = a * a + b * b + 2 * a * b * g;
  const cc = Math.sqrt(Math.max(0, 1 - inPlane2));
  return [
    ca[0] + d * (a * u[0] + b * v[0] + cc * w[0]),
    ca[1] + d * (a * u[1] + b * v[1] + cc * w[1]),
    ca[2] + d * (a * u[2] + b * v[2] + cc * w[2]),
  ];
}

export function analyseChirality(
  structure: Structure,
  model: Model,
  t: ConformerTable,
): ChiralityResult {
  const atoms = model.atoms;
  const vol = new Float64Array(t.count).fill(NaN);
  const dev = new Float64Array(t.count).fill(NaN);
  let dResidues = 0;
  let cbOutliers = 0;
  const p = (i: number): [number, number, number] => [atoms.x[i], atoms.y[i], atoms.z[i]];
  for (let r = 0; r < model.residues.count; r++) {
    if (model.residues.kind[r] !== ResidueKind.Protein) continue;
    const parent = structure.strings[model.residues.parent[r]];
    // Standard amino acids only (modified ones through their parent): the CA/CB names of other
    // components need not mean an alpha carbon and its beta substituent.
    if (parent === 'GLY' || !STANDARD_AMINO_ACIDS.has(parent)) continue;
    let anyD = false;
    let anyOut = false;
    for (let k = t.firstOfResidue[r]; k < t.firstOfResidue[r] + t.countOfResidue[r]; k++) {
      const n = t.n[k];
      const ca = t.ca[k];
      const c = t.c[k];
      const cb = t.cb[k];
      if (n < 0 || ca < 0 || c < 0 || cb < 0) continue;
      vol[k] = chiralVolumeA3(atoms, ca, n, c, cb);
      if (vol[k] < 0) anyD = true;
      const ideal = idealCb(p(n), p(ca), p(c), parent);
      if (ideal) {
        const dx = atoms.x[cb] - ideal[0];
        const dy = atoms.y[cb] - ideal[1];
        const dz = atoms.z[cb] - ideal[2];
        dev[k] = Math.sqrt(dx * dx + dy * dy + dz * dz);
        if (dev[k] > CB_DEVIATION_LIMIT_A) anyOut = true;
      }
    }
    if (anyD) dResidues++;
    if (anyOut) cbOutliers++;
  }
  return { chiralVolumeA3: vol, cbDeviationA: dev, dResidues, cbOutliers };
}

function cross(p: number[], q: number[]): number[] {
  return [p[1] * q[2] - p[2] * q[1], p[2] * q[0] - p[0] * q[2], p[0] * q[1] - p[1] * q[0]];
}
function unit(p: number[]): number[] | null {
  const l = Math.sqrt(p[0] * p[0] + p[1] * p[1] + p[2] * p[2]);
  return l > 1e-9 ? [p[0] / l, p[1] / l, p[2] / l] : null;
}

/** Chiral volume (i−c)·[(j−c)×(k−c)] in Å³ around centre c. */
export function chiralVolumeA3(a: AtomColumns, c: number, i: number, j: number, k: number): number {
  const ux = a.x[i] - a.x[c];
  const uy = a.y[i] - a.y[c];
  const uz = a.z[i] - a.z[c];
  const vx = a.x[j] - a.x[c];
  const vy = a.y[j] - a.y[c];
  const vz = a.z[j] - a.z[c];
  const wx = a.x[k] - a.x[c];
  const wy = a.y[k] - a.y[c];
  const wz = a.z[k] - a.z[c];
  return ux * (vy * wz - vz * wy) + uy * (vz * wx - vx * wz) + uz * (vx * wy - vy * wx);
}
