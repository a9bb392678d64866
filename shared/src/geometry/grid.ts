/**
 * Cell-grid neighbour search: atoms are bucketed into cubic cells by a counting sort, so
 * building costs O(n) and a query within radius r visits only the cells that can hold a point
 * closer than r. Pair enumeration therefore grows linearly with the number of atoms for the
 * bounded densities of molecular models (common practice, no source).
 *
 * Usage:
 *   const grid = buildCellGrid(atoms.x, atoms.y, atoms.z, { cellSizeA: 4 });
 *   forEachWithin(grid, px, py, pz, 3.2, (atom, d2) => { ... });
 *   forEachPairWithin(grid, 4.0, (i, j, d2) => { ... }); // each unordered pair once, i < j
 *
 * The grid stores atom indices into the coordinate arrays it was built from; pass `subset` to
 * bucket only some atoms (for example one model's protein atoms).
 */

export interface CellGrid {
  readonly x: Float64Array;
  readonly y: Float64Array;
  readonly z: Float64Array;
  readonly cellSizeA: number;
  readonly minX: number;
  readonly minY: number;
  readonly minZ: number;
  readonly nx: number;
  readonly ny: number;
  readonly nz: number;
  /** cellStart[c] .. cellStart[c+1] index into cellAtoms */
  readonly cellStart: Int32Array;
  /** atom indices sorted by cell, ascending within a cell */
  readonly cellAtoms: Int32Array;
  /** number of atoms bucketed */
  readonly count: number;
}

export interface CellGridOptions {
  /** edge of a cell in Å; a query radius up to this size visits 27 cells. Default 4 Å. */
  cellSizeA?: number;
  /** atom indices to bucket; all atoms when absent */
  subset?: ArrayLike<number>;
}

/** scratch cell box of forEachWithin (its visitors never re-enter it) */
const BOX = new Float64Array(6);

/** Cells beyond this many make the grid coarser, so sparse inputs never allocate huge arrays. */
const MAX_CELLS = 1 << 24;

export function buildCellGrid(
  x: Float64Array,
  y: Float64Array,
  z: Float64Array,
  options: CellGridOptions = {},
): CellGrid {
  const subset = options.subset;
  const n = subset ? subset.length : x.length;
  let cellSizeA = options.cellSizeA ?? 4;
  if (!(cellSizeA > 0) || !Number.isFinite(cellSizeA)) {
    throw new Error('The neighbour-grid cell size must be a positive number of ångströms.');
  }
  let minX = Infinity;
  let minY = Infinity;
  let minZ = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  let maxZ = -Infinity;
  for (let k = 0; k < n; k++) {
    const a = subset ? subset[k] : k;
    const ax = x[a];
    const ay = y[a];
    const az = z[a];
    if (ax < minX) minX = ax;
    if (ay < minY) minY = ay;
    if (az < minZ) minZ = az;
    if (ax > maxX) maxX = ax;
    if (ay > maxY) maxY = ay;
    if (az > maxZ) maxZ = az;
  }
  if (n === 0) {
    minX = minY = minZ = 0;
    maxX = maxY = maxZ = 0;
  }
  let nx = 1;
  let ny = 1;
  let nz = 1;
  for (;;) {
    nx = Math.floor((maxX - minX) / cellSizeA) + 1;
    ny = Math.floor((maxY - minY) / cellSizeA) + 1;
    nz = Math.floor((maxZ - minZ) / cellSizeA) + 1;
    if (nx * ny * nz <= MAX_CELLS) break;
    cellSizeA *= 2;
  }
  const cells = nx * ny * nz;
  const cellOf = new Int32Array(n);
  const cellStart = new Int32Array(cells + 1);
  for (let k = 0; k < n; k++) {
    const a = subset ? subset[k] : k;
    const cx = Math.floor((x[a] - minX) / cellSizeA);
    const cy = Math.floor((y[a] - minY) / cellSizeA);
    const cz = Math.floor((z[a] - minZ) / cellSizeA);
    const c = (cz * ny + cy) * nx + cx;
    cellOf[k] = c;
    cellStart[c]++;
  }
  // Counting sort without a second cell-sized array: after the running sum cellStart[c] is the
  // end of cell c; filling from the last atom down moves it to the start of c and keeps the
  // atoms of a cell in ascending order.
  for (let c = 1; c < cells; c++) cellStart[c] += cellStart[c - 1];
  cellStart[cells] = n;
  const cellAtoms = new Int32Array(n);
  for (let k = n - 1; k >= 0; k--) {
    cellAtoms[--cellStart[cellOf[k]]] = subset ? subset[k] : k;
  }
  return { x, y, z, cellSizeA, minX, minY, minZ, nx, ny, nz, cellStart, cellAtoms, count: n };
}

/**
 * The cells that can hold a point within `radiusA` of (px, py, pz): writes x0, x1, y0, y1, z0, z1
 * (inclusive, clamped to the grid) into `out` (six numbers); returns false when the box misses
 * the grid.
 * The cells x0..x1 of one row (y, z) hold consecutive atoms: cellStart[row + x0] to
 * cellStart[row + x1 + 1], row = (z·ny + y)·nx, so a walk can take one run of atoms per row.
 */
export function cellBox(
  grid: CellGrid,
  px: number,
  py: number,
  pz: number,
  radiusA: number,
  out: Float64Array,
): boolean {
  const { cellSizeA, nx, ny, nz } = grid;
  out[0] = Math.max(0, Math.floor((px - radiusA - grid.minX) / cellSizeA));
  out[1] = Math.min(nx - 1, Math.floor((px + radiusA - grid.minX) / cellSizeA));
  out[2] = Math.max(0, Math.floor((py - radiusA - grid.minY) / cellSizeA));
  out[3] = Math.min(ny - 1, Math.floor((py + radiusA - grid.minY) / cellSizeA));
  out[4] = Math.max(0, Math.floor((pz - radiusA - grid.minZ) / cellSizeA));
  out[5] = Math.min(nz - 1, Math.floor((pz + radiusA - grid.minZ) / cellSizeA));
  // false also for NaN coordinates (NaN bounds compare false)
  return out[0] <= out[1] && out[2] <= out[3] && out[4] <= out[5];
}

/**
 * Calls `visit(atom, distanceSquared)` for every bucketed atom within `radiusA` of the point
 * (inclusive), in cell order.
 */
export function forEachWithin(
  grid: CellGrid,
  px: number,
  py: number,
  pz: number,
  radiusA: number,
  visit: (atom: number, distanceSquaredA2: number) => void,
): void {
  const { x, y, z, nx, ny, cellStart, cellAtoms } = grid;
  const r2 = radiusA * radiusA;
  const box = BOX;
  if (!cellBox(grid, px, py, pz, radiusA, box)) return;
  const x0 = box[0];
  const x1 = box[1];
  const y1 = box[3];
  const z1 = box[5];
  for (let cz = box[4]; cz <= z1; cz++) {
    for (let cy = box[2]; cy <= y1; cy++) {
      const row = (cz * ny + cy) * nx;
      for (let k = cellStart[row + x0], e = cellStart[row + x1 + 1]; k < e; k++) {
        const a = cellAtoms[k];
        const dx = x[a] - px;
        const dy = y[a] - py;
        const dz = z[a] - pz;
        const d2 = dx * dx + dy * dy + dz * dz;
        if (d2 <= r2) visit(a, d2);
      }
    }
  }
}

/** Indices of bucketed atoms within `radiusA` of the point, ascending. */
export function atomsWithin(
  grid: CellGrid,
  px: number,
  py: number,
  pz: number,
  radiusA: number,
): number[] {
  const out: number[] = [];
  forEachWithin(grid, px, py, pz, radiusA, (a) => out.push(a));
  return out.sort((p, q) => p - q);
}

/**
 * Calls `visit(i, j, distanceSquared)` once for every unordered pair of bucketed atoms closer
 * than or equal to `radiusA`, with i < j (atom indices). Only half of the neighbouring cells are
 * visited from each cell, so no pair is seen twice.
 */
export function forEachPairWithin(
  grid: CellGrid,
  radiusA: number,
  visit: (i: number, j: number, distanceSquaredA2: number) => void,
): void {
  const { x, y, z, nx, ny, nz, cellStart, cellAtoms } = grid;
  const r2 = radiusA * radiusA;
  const reach = Math.ceil(radiusA / grid.cellSizeA);
  for (let cz = 0; cz < nz; cz++) {
    for (let cy = 0; cy < ny; cy++) {
      for (let cx = 0; cx < nx; cx++) {
        const c = (cz * ny + cy) * nx + cx;
        const s = cellStart[c];
        const e = cellStart[c + 1];
        if (s === e) continue;
        for (let dz = 0; dz <= reach; dz++) {
          const oz = cz + dz;
          if (oz >= nz) break;
          for (let dy = dz === 0 ? 0 : -reach; dy <= reach; dy++) {
            const oy = cy + dy;
            if (oy < 0 || oy >= ny) continue;
            for (let dx = dz === 0 && dy === 0 ? 0 : -reach; dx <= reach; dx++) {
              const ox = cx + dx;
              if (ox < 0 || ox >= nx) continue;
              const o = (oz * ny + oy) * nx + ox;
              const same = o === c;
              for (let k = s; k < e; k++) {
                const a = cellAtoms[k];
                const ax = x[a];
                const ay = y[a];
                const az = z[a];
                for (let m = same ? k + 1 : cellStart[o], me = cellStart[o + 1]; m < me; m++) {
                  const b = cellAtoms[m];
                  const ddx = x[b] - ax;
                  const ddy = y[b] - ay;
                  const ddz = z[b] - az;
                  const d2 = ddx * ddx + ddy * ddy + ddz * ddz;
                  if (d2 <= r2) {
                    if (a < b) visit(a, b, d2);
                    else visit(b, a, d2);
                  }
                }
              }
            }
          }
        }
      }
    }
  }
}
