/**
 * Hard-sphere steric maps against the classic results of Ramachandran, Ramakrishnan &
 * Sasisekharan 1963 (J Mol Biol 7:95) and Ramachandran & Sasisekharan 1968 (Adv Protein Chem
 * 23:283), as summarised in SCIENCE.md (values there are from memory of those papers).
 */
import {
  computeStericMap,
  evaluateSteric,
  stericFractions,
  stericStatusAt,
  STERIC_DISALLOWED,
  type StericMap,
} from '../src/validation/steric';

const ala = computeStericMap('ala', 110, 2);
const gly = computeStericMap('gly', 110, 2);
const pro = computeStericMap('pro', 110, 2);

/** count of cells at least outer-limit allowed within a window around (phi, psi) */
function allowedNear(map: StericMap, phi: number, psi: number, halfDeg: number): number {
  let n = 0;
  for (let a = phi - halfDeg; a <= phi + halfDeg; a += map.stepDeg)
    for (let b = psi - halfDeg; b <= psi + halfDeg; b += map.stepDeg)
      if (stericStatusAt(map, a, b) !== 'disallowed') n++;
  return n;
}

describe('hard-sphere steric maps (Ramachandran & Sasisekharan 1968)', () => {
  it('Ala, τ 110°: antiparallel and parallel β are fully allowed', () => {
    expect(evaluateSteric('ala', -139, 135).status).toBe('full');
    expect(evaluateSteric('ala', -119, 113).status).toBe('full');
  });

  it('Ala, τ 110°: α region near (−63°, −43°) is outer-limit allowed, limited by C(i−1)···C(i)', () => {
    const e = evaluateSteric('ala', -63, -43);
    expect(e.status).toBe('outer-limit');
    expect([e.limiting.a, e.limiting.b].sort()).toEqual(['C', 'C-1']);
  });

  // SCIENCE.md also says (from memory) that the left-handed region shrinks as τ widens; our
  // maps show it growing with τ like every other region, so that remark is not asserted
  // (recorded in DEVELOPERS.md).
  it('Ala, τ 110°: left-handed region is at best outer-limit allowed', () => {
    for (let phi = 40; phi <= 80; phi += 2)
      for (let psi = 20; psi <= 60; psi += 2)
        expect(evaluateSteric('ala', phi, psi).status).not.toBe('full');
    expect(evaluateSteric('ala', 60, 40).status).not.toBe('full');
  });

  it('widening τ toward 115° enlarges the α region', () => {
    const wide = computeStericMap('ala', 115, 2);
    expect(allowedNear(wide, -60, -45, 20)).toBeGreaterThan(allowedNear(ala, -60, -45, 20));
  });

  it('(0°, 0°) and (180°, 0°) are disallowed', () => {
    expect(evaluateSteric('ala', 0, 0).status).toBe('disallowed');
    expect(evaluateSteric('ala', 180, 0).status).toBe('disallowed');
    expect(stericStatusAt(ala, 0, 0)).toBe('disallowed');
  });

  it('fully allowed area is a small fraction of the map (order 5–10 %; the 1968 review quotes ~7.5 % full, ~22.5 % outer limit)', () => {
    const f = stericFractions(ala);
    // "order of" 5–10 %: accept 4–12 % for full and 15–30 % for outer-limit-or-better.
    expect(f.full).toBeGreaterThan(0.04);
    expect(f.full).toBeLessThan(0.12);
    expect(f.outerOrBetter).toBeGreaterThan(0.15);
    expect(f.outerOrBetter).toBeLessThan(0.3);
  });

  it('Gly map is centrosymmetric to grid precision and far larger than Ala', () => {
    const n = gly.size;
    let mismatches = 0;
    // Cell (i, j) has centre (−180 + (i+½)s); its mirror (−phi, −psi) is cell (n−1−i, n−1−j).
    for (let i = 0; i < n; i++)
      for (let j = 0; j < n; j++)
        if (gly.codes[i * n + j] !== gly.codes[(n - 1 - i) * n + (n - 1 - j)]) mismatches++;
    expect(mismatches).toBe(0);
    expect(stericFractions(gly).outerOrBetter).toBeGreaterThan(
      2 * stericFractions(ala).outerOrBetter,
    );
  });

  it('Pro phi is confined near −65° ± 15° by the ring', () => {
    let minPhi = Infinity;
    let maxPhi = -Infinity;
    for (let i = 0; i < pro.size; i++)
      for (let j = 0; j < pro.size; j++)
        if (pro.codes[i * pro.size + j] !== STERIC_DISALLOWED) {
          const phi = -180 + (i + 0.5) * pro.stepDeg;
          minPhi = Math.min(minPhi, phi);
          maxPhi = Math.max(maxPhi, phi);
        }
    expect(minPhi).toBeGreaterThanOrEqual(-80);
    expect(maxPhi).toBeLessThanOrEqual(-50);
    expect(minPhi).toBeLessThan(-65);
    expect(maxPhi).toBeGreaterThan(-65);
  });
});
