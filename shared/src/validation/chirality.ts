/**
 * CA chirality and Cβ deviation.
 *
 * Chirality: the chiral volume V = (N−CA)·[(C−CA)×(CB−CA)] is about +2.5 Å³ for L amino acids
 * (checked on real entries with gemmi coordinates, see test/chirality.test.ts); V < 0 marks a
 * D residue (Gly has no chiral CA and is skipped).
 *
 * Cβ deviation (Lovell et al. 2003, Proteins 50:437: > 0.25 Å is an outlier): distance from the
 * modelled CB to an ideal CB built from the modelled N, CA and C (see idealCb: the average of a
 * placement from the N side and one from the C side, with Engh & Huber 2001 values of the
 * residue's class, Pro included).
 */
import type { ConformerTable } from '../model/conformers';
import type { Model, Structure } from '../model/types';
import { ResidueKind } from '../model/types';
import { STANDARD_AMINO_ACIDS } from '../io/residue-tables';
import { BACKBONE_ANGLES, caCbBond, cbAngles, residueClass } from './ideal/engh-huber';
import { placeAtom } from '../geometry/place';
import type { Vec3 } from '../geometry/place';
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

/**
 * Dihedral (degrees, unsigned) about the CA–X axis between the planes (X, CA, Y) and (X, CA, CB)
 * for ideal angles X–CA–Y = a, X–CA–CB = b and Y–CA–CB = g (spherical law of cosines).
 */
function idealDihedralDeg(a: number, b: number, g: number): number {
  const r = Math.PI / 180;
  const c =
    (Math.cos(g * r) - Math.cos(a * r) * Math.cos(b * r)) / (Math.sin(a * r) * Math.sin(b * r));
  return Math.acos(Math.max(-1, Math.min(1, c))) / r;
}

/**
 * The ideal CB position for an L residue from N, CA, C coordinates, or null when degenerate:
 * the average of two internal-coordinate placements (the construction Lovell et al. 2003
 * describe), one from the N side (ideal N–CA–CB and dihedral C–N–CA–CB) and one from the C side
 * (ideal C–CA–CB and dihedral N–C–CA–CB), at the ideal CA–CB length. The ideal dihedrals follow
 * from the ideal N–CA–C, N–CA–CB and CB–CA–C angles of the residue class (Engh & Huber 2001),
 * e.g. ∓123.1° for the general class; L has C–N–CA–CB negative.
 */
export function idealCb(n: Vec3, ca: Vec3, c: Vec3, parent: string): Vec3 | null {
  const d = caCbBond(parent).ideal;
  const ang = cbAngles(parent);
  const nCaC = BACKBONE_ANGLES['N-CA-C'][residueClass(parent)].ideal;
  const b = ang.nCaCb.ideal;
  const g = ang.cbCaC.ideal;
  const degenerate = (p: Vec3, q: Vec3): boolean =>
    Math.hypot(p[0] - q[0], p[1] - q[1], p[2] - q[2]) < 1e-6;
  if (degenerate(n, ca) || degenerate(c, ca) || degenerate(n, c)) return null;
  const fromN = placeAtom(c, n, ca, d, b, -idealDihedralDeg(nCaC, b, g));
  const fromC = placeAtom(n, c, ca, d, g, idealDihedralDeg(nCaC, g, b));
  if (fromN.some(Number.isNaN) || fromC.some(Number.isNaN)) return null;
  return [(fromN[0] + fromC[0]) / 2, (fromN[1] + fromC[1]) / 2, (fromN[2] + fromC[2]) / 2];
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
