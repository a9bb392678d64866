/** Dihedral angle of four atoms (IUPAC-IUB 1970 sign convention), degrees in (−180, 180]. */
import type { AtomColumns } from '../model/types';

/** Torsion a–b–c–d in degrees, in (−180, 180]; NaN when any index is < 0. */
export function torsionDeg(atoms: AtomColumns, a: number, b: number, c: number, d: number): number {
  if (a < 0 || b < 0 || c < 0 || d < 0) return NaN;
  const { x, y, z } = atoms;
  const b1x = x[b] - x[a],
    b1y = y[b] - y[a],
    b1z = z[b] - z[a];
  const b2x = x[c] - x[b],
    b2y = y[c] - y[b],
    b2z = z[c] - z[b];
  const b3x = x[d] - x[c],
    b3y = y[d] - y[c],
    b3z = z[d] - z[c];
  // n1 = b1 × b2, n2 = b2 × b3
  const n1x = b1y * b2z - b1z * b2y,
    n1y = b1z * b2x - b1x * b2z,
    n1z = b1x * b2y - b1y * b2x;
  const n2x = b2y * b3z - b2z * b3y,
    n2y = b2z * b3x - b2x * b3z,
    n2z = b2x * b3y - b2y * b3x;
  const b2len = Math.sqrt(b2x * b2x + b2y * b2y + b2z * b2z);
  // m1 = n1 × (b2/|b2|)
  const m1x = (n1y * b2z - n1z * b2y) / b2len,
    m1y = (n1z * b2x - n1x * b2z) / b2len,
    m1z = (n1x * b2y - n1y * b2x) / b2len;
  const xx = n1x * n2x + n1y * n2y + n1z * n2z;
  const yy = m1x * n2x + m1y * n2y + m1z * n2z;
  let deg = (-Math.atan2(yy, xx) * 180) / Math.PI;
  if (deg <= -180) deg += 360;
  return deg;
}
