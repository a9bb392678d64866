/**
 * All-atom overlaps (Word et al. 1999, J Mol Biol 285:1711; Bondi 1964 radii):
 *  - moving one atom 1.5 Å straight toward a non-bonded neighbour creates a new severe overlap
 *    (≥ 0.4 Å) between exactly that pair, of the size r_a + r_b − d' computed here from Bondi's
 *    radii and the new distance; the unmodified model has no such overlap;
 *  - normal geometry is not flagged: covalent neighbours (1–2, 1–3, 1–4) never appear;
 *  - on entries with deposited H (no riding H added, so the atom sets are the same), the cell-grid
 *    search finds exactly the severe overlaps, with the same sizes, as an independent all-pairs
 *    implementation of the same rules (test/reference/overlaps_bruteforce.py, python3-gemmi).
 */
import { execFileSync } from 'child_process';
import * as fs from 'fs';
import * as path from 'path';
import { readStructure } from '../src/io/read';
import type { Model, Structure } from '../src/model/types';
import { ResidueKind } from '../src/model/types';
import { analyzeOverlaps, BONDI_RADII_A } from '../src/validation/overlaps';
import { El } from '../src/validation/hydrogens';

const FIX = path.join(__dirname, 'fixtures');
let s: Structure;
beforeAll(async () => {
  s = await readStructure(fs.readFileSync(path.join(FIX, '1A8O.cif')), '1A8O.cif');
});

/** Bondi 1964 radii by element symbol (from memory, SCIENCE.md), independent of the engine table. */
const BONDI: Record<string, number> = { H: 1.2, C: 1.7, N: 1.55, O: 1.52, S: 1.8, SE: 1.9 };

function moved(m: Model, atom: number, toward: number, byA: number): Model {
  const x = m.atoms.x.slice();
  const y = m.atoms.y.slice();
  const z = m.atoms.z.slice();
  const d = Math.hypot(x[toward] - x[atom], y[toward] - y[atom], z[toward] - z[atom]);
  x[atom] += ((x[toward] - x[atom]) / d) * byA;
  y[atom] += ((y[toward] - y[atom]) / d) * byA;
  z[atom] += ((z[toward] - z[atom]) / d) * byA;
  return { ...m, atoms: { ...m.atoms, x, y, z } };
}

describe('severe overlaps', () => {
  it('the engine radii are Bondi 1964', () => {
    expect(BONDI_RADII_A[El.C]).toBe(BONDI.C);
    expect(BONDI_RADII_A[El.O]).toBe(BONDI.O);
    expect(BONDI_RADII_A[El.H]).toBe(BONDI.H);
  });

  it('an atom moved 1.5 Å into a neighbour gives one new severe overlap of the right size', () => {
    const m = s.models[0];
    const S = s.strings;
    const A = m.atoms;
    // a water oxygen and a backbone carbonyl carbon (no hydrogens of its own) 3.6–4.1 Å apart
    let water = -1;
    let carbon = -1;
    for (let i = 0; i < A.count && water < 0; i++) {
      if (m.residues.kind[A.residue[i]] !== ResidueKind.Water || S[A.element[i]] !== 'O') continue;
      for (let j = 0; j < A.count; j++) {
        if (m.residues.kind[A.residue[j]] !== ResidueKind.Protein || S[A.name[j]] !== 'C') continue;
        const d = Math.hypot(A.x[i] - A.x[j], A.y[i] - A.y[j], A.z[i] - A.z[j]);
        if (d > 3.6 && d < 4.1) {
          water = i;
          carbon = j;
          break;
        }
      }
    }
    expect(water).toBeGreaterThanOrEqual(0);
    const before = analyzeOverlaps(s, m);
    const m2 = moved(m, water, carbon, 1.5);
    const after = analyzeOverlaps(s, m2);
    const key = (p: { a: number; b: number }) => `${Math.min(p.a, p.b)}-${Math.max(p.a, p.b)}`;
    const old = new Set(before.severe.map(key));
    const fresh = after.severe.filter((p) => !old.has(key(p)));
    const target = `${Math.min(water, carbon)}-${Math.max(water, carbon)}`;
    expect(old.has(target)).toBe(false);
    const hit = fresh.find((p) => key(p) === target);
    expect(hit).toBeDefined();
    const d2 = Math.hypot(
      m2.atoms.x[water] - A.x[carbon],
      m2.atoms.y[water] - A.y[carbon],
      m2.atoms.z[water] - A.z[carbon],
    );
    expect(hit!.overlapA).toBeCloseTo(BONDI.O + BONDI.C - d2, 2);
    // every new severe overlap involves the moved atom
    for (const p of fresh) expect(p.a === water || p.b === water).toBe(true);
  });

  it('severe overlaps are never between covalently bonded atoms, and are few on a 1.7 Å structure', () => {
    const r = analyzeOverlaps(s, s.models[0]);
    for (const p of r.severe) {
      const d = Math.hypot(
        r.all.x[p.a] - r.all.x[p.b],
        r.all.y[p.a] - r.all.y[p.b],
        r.all.z[p.a] - r.all.z[p.b],
      );
      // a covalent bond is < 2.0 Å between these elements (common practice, no source)
      expect(d).toBeGreaterThan(1.0);
    }
    expect(r.perThousandAtoms).toBeLessThan(20);
    expect(r.hydrogens).toBe('added');
  });

  it.each(['1ejg.pdb.gz', '1AS5.cif'])(
    '%s: same severe overlaps as a brute-force all-pairs scan',
    async (f) => {
      const st = await readStructure(fs.readFileSync(path.join(FIX, f)), f);
      const r = analyzeOverlaps(st, st.models[0]);
      expect(r.hydrogens).toBe('deposited');
      const S = st.strings;
      const m = st.models[0];
      const id = (i: number) => {
        const res = r.all.residue[i];
        return [
          S[m.chains.authId[m.residues.chain[res]]],
          m.residues.authSeq[res],
          S[m.residues.icode[res]],
          S[m.residues.name[res]],
          S[r.all.altloc[i]],
          r.all.names[r.all.name[i]],
        ].join('|');
      };
      const ours = new Map<string, number>();
      for (const p of r.severe) ours.set([id(p.a), id(p.b)].sort().join(' '), p.overlapA);
      const ref = JSON.parse(
        execFileSync(
          '/usr/bin/python3',
          [path.join(__dirname, 'reference/overlaps_bruteforce.py'), path.join(FIX, f)],
          { encoding: 'utf8', maxBuffer: 64 << 20 },
        ),
      ) as (string | number)[][];
      const theirs = new Map<string, number>();
      for (const row of ref)
        theirs.set(
          [row.slice(0, 6).join('|'), row.slice(6, 12).join('|')].sort().join(' '),
          row[12] as number,
        );
      expect(theirs.size).toBeGreaterThan(0);
      expect([...ours.keys()].sort()).toEqual([...theirs.keys()].sort());
      for (const [k, v] of ours) expect(Math.abs(v - theirs.get(k)!)).toBeLessThanOrEqual(0.0011);
    },
  );
});
