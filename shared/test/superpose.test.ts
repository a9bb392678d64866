import { execFileSync } from 'child_process';
import * as path from 'path';
import { applySuperposition, superpose } from '../src/geometry/superpose';

const DATA = path.join(__dirname, 'fixtures');
const PY = '/usr/bin/python3';

function gemmiPair(
  file: string,
  a: number,
  b: number,
): { mobile: number[]; target: number[]; rmsd: number } {
  const out = execFileSync(
    PY,
    [path.join(__dirname, 'reference', 'superpose_gemmi.py'), file, String(a), String(b)],
    {
      encoding: 'utf8',
      maxBuffer: 64 << 20,
    },
  );
  return JSON.parse(out) as { mobile: number[]; target: number[]; rmsd: number };
}

describe('Kabsch superposition (Kabsch 1976)', () => {
  // Outside reference: gemmi.superpose_positions (python3-gemmi) on the CA atoms of two NMR
  // models of the same entry; the RMSD must agree to 0.001 Å (issue 3).
  it.each([
    ['1AS5.cif', 0, 5],
    ['2BEG.cif', 0, 9],
    ['1AS5.cif', 3, 13],
  ])('matches gemmi on CA atoms of %s models %i and %i', (file, a, b) => {
    const ref = gemmiPair(path.join(DATA, file), a, b);
    expect(ref.mobile.length).toBeGreaterThan(30);
    const s = superpose(ref.mobile, ref.target);
    expect(Math.abs(s.rmsdA - ref.rmsd)).toBeLessThan(0.001);
    expect(ref.rmsd).toBeGreaterThan(0.1);
  });

  it('recovers a known rotation exactly and never returns a reflection', () => {
    // A rigid motion applied to an irregular point set must be undone to round-off.
    const pts = [
      0, 0, 0, 1.5, 0.2, -0.3, 2.1, 1.7, 0.4, -0.8, 2.2, 1.9, 3.3, -1.1, 2.5, 0.4, 0.9, -2.6,
    ];
    const c = Math.cos(1.1);
    const s = Math.sin(1.1);
    // rotation about z by 1.1 rad, then about x by 1.1 rad
    const rz = [c, -s, 0, s, c, 0, 0, 0, 1];
    const rx = [1, 0, 0, 0, c, -s, 0, s, c];
    const m = [0, 0, 0, 0, 0, 0, 0, 0, 0];
    for (let i = 0; i < 3; i++)
      for (let j = 0; j < 3; j++)
        for (let k = 0; k < 3; k++) m[3 * i + j] += rx[3 * i + k] * rz[3 * k + j];
    const target: number[] = [];
    for (let i = 0; i < pts.length; i += 3) {
      for (let r = 0; r < 3; r++)
        target.push(
          m[3 * r] * pts[i] + m[3 * r + 1] * pts[i + 1] + m[3 * r + 2] * pts[i + 2] + [4, -2, 7][r],
        );
    }
    const sup = superpose(pts, target);
    expect(sup.rmsdA).toBeLessThan(1e-9);
    for (let k = 0; k < 9; k++) expect(sup.rotation[k]).toBeCloseTo(m[k], 9);
    const moved = applySuperposition(sup, pts);
    for (let k = 0; k < target.length; k++) expect(moved[k]).toBeCloseTo(target[k], 9);

    // The mirror image cannot be reached by a rotation: RMSD > 0 and det(U) = +1.
    const mirror = target.map((v, k) => (k % 3 === 0 ? -v : v));
    const sm = superpose(pts, mirror);
    const U = sm.rotation;
    const det =
      U[0] * (U[4] * U[8] - U[5] * U[7]) -
      U[1] * (U[3] * U[8] - U[5] * U[6]) +
      U[2] * (U[3] * U[7] - U[4] * U[6]);
    expect(det).toBeCloseTo(1, 9);
    expect(sm.rmsdA).toBeGreaterThan(0.1);
  });

  it('rejects unmatched input with a sentence', () => {
    expect(() => superpose([0, 0, 0], [0, 0, 0, 1, 1, 1])).toThrow(/match the atoms first/);
    expect(() => superpose([], [])).toThrow(/at least one/);
  });
});
