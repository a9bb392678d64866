/**
 * Kernel density estimation on the periodic torus (1 or 2 angular dimensions), with von Mises
 * kernels and Silverman's adaptive bandwidths (Silverman 1986, Density Estimation for
 * Statistics and Data Analysis, §5.3: pilot estimate, local factors λ_i = (f̃(x_i)/g)^−α with
 * α = ½ and g the geometric mean of the pilot density at the data).
 *
 * Data are first binned on the evaluation grid (binned KDE, Wand 1994, J Comput Graph Stat
 * 3:433); the grid step (≤ 2° for phi/psi) is well below the kernel widths, so binning moves
 * each point by at most half a cell. Every kernel is normalised on the discrete grid so each
 * datum contributes exactly its weight, and all arithmetic runs in a fixed order: the same
 * input gives bit-identical output.
 *
 * Pure TypeScript, no Node or DOM APIs.
 */

export interface TorusGrid {
  /** 1 or 2 angular dimensions */
  dims: 1 | 2;
  /** grid step in degrees; must divide 360 */
  stepDeg: number;
  /** cells per dimension (360 / stepDeg) */
  size: number;
}

export interface KdeParameters {
  /** pilot bandwidth (kernel σ in degrees); null: Silverman's rule σ̂·n^(−1/(d+4)) (Silverman 1986 eq. 4.14) */
  pilotSigmaDeg: number | null;
  /** sensitivity α of the adaptive factors (Silverman 1986 recommends ½) */
  alpha: number;
  /** clamp of the local factors λ, to keep windows finite */
  lambdaMin: number;
  lambdaMax: number;
  /** lower and upper bound for the pilot σ in degrees */
  sigmaMinDeg: number;
  sigmaMaxDeg: number;
  /** cap on σ̂ in Silverman's rule: the whole-circle SD of multimodal angle data measures the
   * spread between wells, not within them, and the rule then oversmooths (Silverman 1986 §3.4.2);
   * 40° is our choice, about the width of one staggered chi or phi/psi well */
  spreadCapDeg: number;
}

export const DEFAULT_KDE: KdeParameters = {
  pilotSigmaDeg: null,
  alpha: 0.5,
  lambdaMin: 0.25,
  lambdaMax: 2,
  sigmaMinDeg: 3,
  sigmaMaxDeg: 30,
  spreadCapDeg: 40,
};

export function makeGrid(dims: 1 | 2, stepDeg: number): TorusGrid {
  const size = Math.round(360 / stepDeg);
  if (Math.abs(size * stepDeg - 360) > 1e-9)
    throw new Error(
      `Grid step ${stepDeg}° does not divide 360°; choose a divisor such as 1, 2 or 5.`,
    );
  return { dims, stepDeg, size };
}

/** Cell index of an angle (degrees) on a grid whose cell i has centre −180 + (i + ½)·step. */
export function cellOf(angleDeg: number, grid: TorusGrid): number {
  let i = Math.floor((angleDeg + 180) / grid.stepDeg) % grid.size;
  if (i < 0) i += grid.size;
  return i;
}

/** Circular standard deviation in degrees, sqrt(−2 ln R̄) (Mardia & Jupp 2000, §2.3.4). */
export function circularSdDeg(anglesDeg: ArrayLike<number>, weights?: ArrayLike<number>): number {
  let s = 0;
  let c = 0;
  let w = 0;
  for (let i = 0; i < anglesDeg.length; i++) {
    const wi = weights ? weights[i] : 1;
    const a = (anglesDeg[i] * Math.PI) / 180;
    s += wi * Math.sin(a);
    c += wi * Math.cos(a);
    w += wi;
  }
  const r = Math.min(1 - 1e-12, Math.hypot(s, c) / w);
  return (Math.sqrt(-2 * Math.log(r)) * 180) / Math.PI;
}

/** Discrete von Mises kernel of σ (degrees) on the grid, normalised to sum 1; returns offsets −h..h. */
function vonMisesKernel(sigmaDeg: number, grid: TorusGrid): Float64Array {
  const sigmaRad = (sigmaDeg * Math.PI) / 180;
  const kappa = 1 / (sigmaRad * sigmaRad);
  // Truncate at 4σ or half the circle, whichever is smaller.
  const half = Math.min(Math.floor(grid.size / 2) - 1, Math.ceil((4 * sigmaDeg) / grid.stepDeg));
  const k = new Float64Array(2 * half + 1);
  let sum = 0;
  for (let o = -half; o <= half; o++) {
    const v = Math.exp(kappa * (Math.cos((o * grid.stepDeg * Math.PI) / 180) - 1));
    k[o + half] = v;
    sum += v;
  }
  for (let o = 0; o < k.length; o++) k[o] /= sum;
  return k;
}

/** Add weight·kernel(σ) centred on cell (ci, cj) into dens. */
function splat(
  dens: Float64Array,
  grid: TorusGrid,
  ci: number,
  cj: number,
  weight: number,
  k: Float64Array,
): void {
  const half = (k.length - 1) / 2;
  const n = grid.size;
  if (grid.dims === 1) {
    for (let o = -half; o <= half; o++) dens[(ci + o + n) % n] += weight * k[o + half];
    return;
  }
  for (let a = -half; a <= half; a++) {
    const row = ((ci + a + n) % n) * n;
    const wa = weight * k[a + half];
    for (let b = -half; b <= half; b++) dens[row + ((cj + b + n) % n)] += wa * k[b + half];
  }
}

/** Bin angle tuples onto the grid: counts per cell (weights summed). */
export function binOnGrid(
  points: Float64Array,
  grid: TorusGrid,
  weights?: Float64Array,
): Float64Array {
  const cells = grid.dims === 1 ? grid.size : grid.size * grid.size;
  const counts = new Float64Array(cells);
  const n = points.length / grid.dims;
  for (let p = 0; p < n; p++) {
    const i = cellOf(points[p * grid.dims], grid);
    const idx = grid.dims === 1 ? i : i * grid.size + cellOf(points[p * grid.dims + 1], grid);
    counts[idx] += weights ? weights[p] : 1;
  }
  return counts;
}

export interface KdeResult {
  grid: TorusGrid;
  /** density per cell, normalised so the cells sum to 1 */
  density: Float64Array;
  pilotSigmaDeg: number;
}

/**
 * Adaptive von Mises KDE of angle tuples (points laid out [a0, b0, a1, b1, …] for 2D) on a grid.
 */
export function adaptiveKde(
  points: Float64Array,
  grid: TorusGrid,
  params: KdeParameters = DEFAULT_KDE,
  weights?: Float64Array,
): KdeResult {
  const d = grid.dims;
  const n = points.length / d;
  if (n === 0)
    throw new Error(
      'No data points for the density estimate; the reference set has no residue of this kind.',
    );
  const counts = binOnGrid(points, grid, weights);
  let total = 0;
  for (const c of counts) total += c;
  // Pilot bandwidth: Silverman 1986 eq. 4.14, σ̂·n^(−1/(d+4)), σ̂ the mean marginal circular SD.
  let sigma = params.pilotSigmaDeg;
  if (sigma === null) {
    let sd = 0;
    for (let dim = 0; dim < d; dim++) {
      const col = new Float64Array(n);
      for (let p = 0; p < n; p++) col[p] = points[p * d + dim];
      sd += circularSdDeg(col, weights);
    }
    sd = Math.min(params.spreadCapDeg, sd / d);
    sigma = sd * Math.pow(total, -1 / (d + 4));
  }
  sigma = Math.min(params.sigmaMaxDeg, Math.max(params.sigmaMinDeg, sigma));
  const cells = counts.length;
  const occupied: number[] = [];
  for (let c = 0; c < cells; c++) if (counts[c] > 0) occupied.push(c);
  const cellIJ = (c: number): [number, number] =>
    d === 1 ? [c, 0] : [Math.floor(c / grid.size), c % grid.size];

  // Pilot estimate with the fixed bandwidth.
  const pilot = new Float64Array(cells);
  const k0 = vonMisesKernel(sigma, grid);
  for (const c of occupied) {
    const [i, j] = cellIJ(c);
    splat(pilot, grid, i, j, counts[c], k0);
  }
  // Geometric mean of the pilot at the data.
  let logSum = 0;
  for (const c of occupied) logSum += counts[c] * Math.log(pilot[c] / total);
  const g = Math.exp(logSum / total);

  const density = new Float64Array(cells);
  const kernelCache = new Map<number, Float64Array>();
  for (const c of occupied) {
    let lambda = Math.pow(pilot[c] / total / g, -params.alpha);
    lambda = Math.min(params.lambdaMax, Math.max(params.lambdaMin, lambda));
    // Quantise λ to 1/64 so kernels can be shared; the quantisation is far below the precision
    // of the bandwidth rule itself.
    const key = Math.round(lambda * 64);
    let k = kernelCache.get(key);
    if (!k) {
      k = vonMisesKernel((sigma * key) / 64, grid);
      kernelCache.set(key, k);
    }
    const [i, j] = cellIJ(c);
    splat(density, grid, i, j, counts[c], k);
  }
  for (let c = 0; c < cells; c++) density[c] /= total;
  return { grid, density, pilotSigmaDeg: sigma };
}

/**
 * Density at an arbitrary angle tuple, interpolated (linearly per dimension) between cell
 * centres on the periodic grid.
 */
export function densityAt(density: ArrayLike<number>, grid: TorusGrid, a: number, b = 0): number {
  const n = grid.size;
  const fa = (a + 180) / grid.stepDeg - 0.5;
  const ia0 = Math.floor(fa);
  const ta = fa - ia0;
  const i0 = ((ia0 % n) + n) % n;
  const i1 = (i0 + 1) % n;
  if (grid.dims === 1) return density[i0] * (1 - ta) + density[i1] * ta;
  const fb = (b + 180) / grid.stepDeg - 0.5;
  const ib0 = Math.floor(fb);
  const tb = fb - ib0;
  const j0 = ((ib0 % n) + n) % n;
  const j1 = (j0 + 1) % n;
  return (
    density[i0 * n + j0] * (1 - ta) * (1 - tb) +
    density[i0 * n + j1] * (1 - ta) * tb +
    density[i1 * n + j0] * ta * (1 - tb) +
    density[i1 * n + j1] * ta * tb
  );
}

/**
 * Percentile grid for the reference densities: fine steps in the tail where the verdicts live.
 * Fractions (0–1): 0, 0.0001 … 0.01 by 0.0001, then 0.011 … 1 by 0.001.
 */
export function percentileFractions(): number[] {
  const f: number[] = [];
  for (let i = 0; i <= 100; i++) f.push(i / 10000);
  for (let i = 11; i <= 1000; i++) f.push(i / 1000);
  return f;
}

/** Empirical quantile (type 1, the inverse of the empirical distribution) of sorted values. */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) return 0;
  const idx = Math.min(n - 1, Math.max(0, Math.ceil(p * n) - 1));
  return sorted[idx];
}

/**
 * Percentile (0–100) of a density value against a quantile table: the share of reference
 * residues lying at lower density. Linear interpolation between table entries.
 */
export function percentileOf(
  value: number,
  fractions: readonly number[],
  quantiles: ArrayLike<number>,
): number {
  const n = quantiles.length;
  if (value <= quantiles[0]) return 0;
  if (value >= quantiles[n - 1]) return 100;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (quantiles[mid] <= value) lo = mid;
    else hi = mid;
  }
  const q0 = quantiles[lo];
  const q1 = quantiles[hi];
  const t = q1 > q0 ? (value - q0) / (q1 - q0) : 0;
  return 100 * (fractions[lo] + t * (fractions[hi] - fractions[lo]));
}
