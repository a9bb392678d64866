import { atomsWithin, buildCellGrid, forEachPairWithin } from '../src/geometry/grid';

// Deterministic pseudo-random points (a linear congruential generator, Numerical Recipes
// constants) so the check is reproducible; the reference is the brute-force O(n²) search.
function points(n: number, span: number, seed: number): [Float64Array, Float64Array, Float64Array] {
  let s = seed >>> 0;
  const next = (): number => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return (s / 4294967296) * span;
  };
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  const z = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    x[i] = next();
    y[i] = next() * 0.5 - 7;
    z[i] = next() * 2;
  }
  return [x, y, z];
}

describe('cell grid neighbour search', () => {
  const [x, y, z] = points(1500, 40, 7);

  it.each([
    [2.5, 4],
    [4, 4],
    [5.5, 2],
  ])('finds exactly the brute-force pairs within %f Å (cell %f Å)', (radius, cell) => {
    const grid = buildCellGrid(x, y, z, { cellSizeA: cell });
    const found = new Set<string>();
    let dup = 0;
    forEachPairWithin(grid, radius, (i, j) => {
      expect(i).toBeLessThan(j);
      const key = `${i},${j}`;
      if (found.has(key)) dup++;
      found.add(key);
    });
    const expected = new Set<string>();
    for (let i = 0; i < x.length; i++) {
      for (let j = i + 1; j < x.length; j++) {
        const d2 = (x[i] - x[j]) ** 2 + (y[i] - y[j]) ** 2 + (z[i] - z[j]) ** 2;
        if (d2 <= radius * radius) expected.add(`${i},${j}`);
      }
    }
    expect(dup).toBe(0);
    expect(expected.size).toBeGreaterThan(100);
    expect([...found].sort()).toEqual([...expected].sort());
  });

  it('answers point queries and honours a subset', () => {
    const subset = Array.from({ length: 700 }, (_, k) => k * 2);
    const grid = buildCellGrid(x, y, z, { cellSizeA: 3, subset });
    for (const p of [0, 10, 99, 501]) {
      const got = atomsWithin(grid, x[p], y[p], z[p], 3.7);
      const want = subset.filter(
        (a) => (x[a] - x[p]) ** 2 + (y[a] - y[p]) ** 2 + (z[a] - z[p]) ** 2 <= 3.7 * 3.7,
      );
      expect(got).toEqual(want);
    }
  });

  it('copes with no atoms and rejects a bad cell size with a sentence', () => {
    const e = new Float64Array(0);
    const grid = buildCellGrid(e, e, e);
    let n = 0;
    forEachPairWithin(grid, 3, () => n++);
    expect(n).toBe(0);
    expect(() => buildCellGrid(e, e, e, { cellSizeA: 0 })).toThrow(/positive number/);
  });
});
