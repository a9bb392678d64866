/** Small vector helpers over coordinate columns (no object per atom). */
import type { AtomColumns } from '../model/types';

export function distanceA(atoms: AtomColumns, i: number, j: number): number {
  const dx = atoms.x[i] - atoms.x[j];
  const dy = atoms.y[i] - atoms.y[j];
  const dz = atoms.z[i] - atoms.z[j];
  return Math.sqrt(dx * dx + dy * dy + dz * dz);
}

/** Bond angle i–j–k in degrees. */
export function angleDeg(atoms: AtomColumns, i: number, j: number, k: number): number {
  const { x, y, z } = atoms;
  const ax = x[i] - x[j],
    ay = y[i] - y[j],
    az = z[i] - z[j];
  const bx = x[k] - x[j],
    by = y[k] - y[j],
    bz = z[k] - z[j];
  const dot = ax * bx + ay * by + az * bz;
  const cx = ay * bz - az * by,
    cy = az * bx - ax * bz,
    cz = ax * by - ay * bx;
  return (Math.atan2(Math.sqrt(cx * cx + cy * cy + cz * cz), dot) * 180) / Math.PI;
}
