/**
 * Least-squares superposition of two matched point sets by the method of Kabsch 1976
 * (Acta Cryst A32:922; handedness correction Acta Cryst A34:827, 1978): with
 * R = Σ w·y·xᵀ (target y, mobile x, both centred), the eigenvectors a_k of RᵀR give
 * b_k = R·a_k/|R·a_k|, and the best proper rotation is U = Σ b_k·a_kᵀ with a₃ = a₁×a₂ and
 * b₃ = b₁×b₂ (so det U = +1 even when the best orthogonal fit would be a reflection).
 */

export interface Superposition {
  /** 3×3 rotation, row-major: target ≈ rotation·mobile + translation */
  rotation: number[];
  translation: [number, number, number];
  /** root-mean-square distance after superposition, Å (weighted when weights are given) */
  rmsdA: number;
  count: number;
}

/** Flat xyz triples (x0,y0,z0,x1,…) for the two matched sets. */
export function superpose(
  mobile: ArrayLike<number>,
  target: ArrayLike<number>,
  weights?: ArrayLike<number>,
): Superposition {
  if (mobile.length !== target.length || mobile.length % 3 !== 0) {
    throw new Error(
      'Superposition needs two lists of matched atoms of the same length; match the atoms first.',
    );
  }
  const n = mobile.length / 3;
  if (n < 1) {
    throw new Error(
      'Superposition needs at least one matched atom pair; check that the models share residues.',
    );
  }
  let wsum = 0;
  const cm = [0, 0, 0];
  const ct = [0, 0, 0];
  for (let i = 0; i < n; i++) {
    const w = weights ? weights[i] : 1;
    wsum += w;
    for (let a = 0; a < 3; a++) {
      cm[a] += w * mobile[3 * i + a];
      ct[a] += w * target[3 * i + a];
    }
  }
  if (!(wsum > 0)) throw new Error('Superposition weights must add up to a positive number.');
  for (let a = 0; a < 3; a++) {
    cm[a] /= wsum;
    ct[a] /= wsum;
  }
  // R[a][b] = Σ w (y_a)(x_b), row-major
  const R = [0, 0, 0, 0, 0, 0, 0, 0, 0];
  for (let i = 0; i < n; i++) {
    const w = weights ? weights[i] : 1;
    const x0 = mobile[3 * i] - cm[0];
    const x1 = mobile[3 * i + 1] - cm[1];
    const x2 = mobile[3 * i + 2] - cm[2];
    for (let a = 0; a < 3; a++) {
      const y = w * (target[3 * i + a] - ct[a]);
      R[3 * a] += y * x0;
      R[3 * a + 1] += y * x1;
      R[3 * a + 2] += y * x2;
    }
  }
  // S = RᵀR (symmetric)
  const S = [0, 0, 0, 0, 0, 0, 0, 0, 0];
  for (let p = 0; p < 3; p++) {
    for (let q = 0; q < 3; q++) {
      S[3 * p + q] = R[p] * R[q] + R[3 + p] * R[3 + q] + R[6 + p] * R[6 + q];
    }
  }
  const { values, vectors } = symmetricEigen3(S);
  const order = [0, 1, 2].sort((p, q) => values[q] - values[p]);
  const col = (k: number): number[] => [vectors[k], vectors[3 + k], vectors[6 + k]];
  const a1 = col(order[0]);
  let a2 = col(order[1]);
  a2 = normalise(sub(a2, scale(a1, dot(a1, a2))), perpendicular(a1));
  const a3 = cross(a1, a2);
  const b1 = normalise(mul(R, a1), [1, 0, 0]);
  let b2 = mul(R, a2);
  b2 = normalise(sub(b2, scale(b1, dot(b1, b2))), perpendicular(b1));
  const b3 = cross(b1, b2);
  const U = [0, 0, 0, 0, 0, 0, 0, 0, 0];
  for (let r = 0; r < 3; r++) {
    for (let c = 0; c < 3; c++) {
      U[3 * r + c] = b1[r] * a1[c] + b2[r] * a2[c] + b3[r] * a3[c];
    }
  }
  const t: [number, number, number] = [
    ct[0] - (U[0] * cm[0] + U[1] * cm[1] + U[2] * cm[2]),
    ct[1] - (U[3] * cm[0] + U[4] * cm[1] + U[5] * cm[2]),
    ct[2] - (U[6] * cm[0] + U[7] * cm[1] + U[8] * cm[2]),
  ];
  // RMSD from the applied transformation (the closed-form expression loses precision).
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const w = weights ? weights[i] : 1;
    const x = mobile[3 * i];
    const y = mobile[3 * i + 1];
    const z = mobile[3 * i + 2];
    const dx = U[0] * x + U[1] * y + U[2] * z + t[0] - target[3 * i];
    const dy = U[3] * x + U[4] * y + U[5] * z + t[1] - target[3 * i + 1];
    const dz = U[6] * x + U[7] * y + U[8] * z + t[2] - target[3 * i + 2];
    sum += w * (dx * dx + dy * dy + dz * dz);
  }
  return { rotation: U, translation: t, rmsdA: Math.sqrt(sum / wsum), count: n };
}

/** Applies a superposition to flat xyz triples, returning new coordinates. */
export function applySuperposition(s: Superposition, xyz: ArrayLike<number>): Float64Array {
  const out = new Float64Array(xyz.length);
  const U = s.rotation;
  for (let i = 0; i + 2 < xyz.length; i += 3) {
    const x = xyz[i];
    const y = xyz[i + 1];
    const z = xyz[i + 2];
    out[i] = U[0] * x + U[1] * y + U[2] * z + s.translation[0];
    out[i + 1] = U[3] * x + U[4] * y + U[5] * z + s.translation[1];
    out[i + 2] = U[6] * x + U[7] * y + U[8] * z + s.translation[2];
  }
  return out;
}

/** Cyclic Jacobi rotations for a symmetric 3×3 matrix; eigenvectors are the columns. */
function symmetricEigen3(m: number[]): { values: number[]; vectors: number[] } {
  const a = m.slice();
  const v = [1, 0, 0, 0, 1, 0, 0, 0, 1];
  for (let sweep = 0; sweep < 50; sweep++) {
    const off = a[1] * a[1] + a[2] * a[2] + a[5] * a[5];
    const diag = a[0] * a[0] + a[4] * a[4] + a[8] * a[8];
    if (off <= 1e-30 * Math.max(diag, 1e-300)) break;
    for (const [p, q] of [
      [0, 1],
      [0, 2],
      [1, 2],
    ]) {
      const apq = a[3 * p + q];
      if (apq === 0) continue;
      const app = a[3 * p + p];
      const aqq = a[3 * q + q];
      const theta = (aqq - app) / (2 * apq);
      const tt = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
      const c = 1 / Math.sqrt(tt * tt + 1);
      const s = tt * c;
      for (let k = 0; k < 3; k++) {
        const akp = a[3 * k + p];
        const akq = a[3 * k + q];
        a[3 * k + p] = c * akp - s * akq;
        a[3 * k + q] = s * akp + c * akq;
      }
      for (let k = 0; k < 3; k++) {
        const apk = a[3 * p + k];
        const aqk = a[3 * q + k];
        a[3 * p + k] = c * apk - s * aqk;
        a[3 * q + k] = s * apk + c * aqk;
      }
      for (let k = 0; k < 3; k++) {
        const vkp = v[3 * k + p];
        const vkq = v[3 * k + q];
        v[3 * k + p] = c * vkp - s * vkq;
        v[3 * k + q] = s * vkp + c * vkq;
      }
    }
  }
  return { values: [a[0], a[4], a[8]], vectors: v };
}

function dot(p: number[], q: number[]): number {
  return p[0] * q[0] + p[1] * q[1] + p[2] * q[2];
}
function cross(p: number[], q: number[]): number[] {
  return [p[1] * q[2] - p[2] * q[1], p[2] * q[0] - p[0] * q[2], p[0] * q[1] - p[1] * q[0]];
}
function sub(p: number[], q: number[]): number[] {
  return [p[0] - q[0], p[1] - q[1], p[2] - q[2]];
}
function scale(p: number[], f: number): number[] {
  return [p[0] * f, p[1] * f, p[2] * f];
}
function mul(m: number[], p: number[]): number[] {
  return [
    m[0] * p[0] + m[1] * p[1] + m[2] * p[2],
    m[3] * p[0] + m[4] * p[1] + m[5] * p[2],
    m[6] * p[0] + m[7] * p[1] + m[8] * p[2],
  ];
}
/** Unit vector of p, or `fallback` when p is (numerically) zero — degenerate point sets. */
function normalise(p: number[], fallback: number[]): number[] {
  const l = Math.sqrt(dot(p, p));
  return l > 1e-12 ? scale(p, 1 / l) : fallback;
}
/** Some unit vector perpendicular to the unit vector p. */
function perpendicular(p: number[]): number[] {
  const axis = Math.abs(p[0]) < 0.9 ? [1, 0, 0] : [0, 1, 0];
  return normalise(cross(p, axis), [0, 0, 1]);
}
