/**
 * Tiled benchmark models checked against gemmi (python3-gemmi under /usr/bin/python3): the
 * written mmCIF must parse, hold the requested atom count, and each copy must be the source's
 * protein atoms moved by a pure translation (same atom names, same inter-atom distances).
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { readStructure } from '../src';
import { tiledCif } from '../src/model/tile';

const SOURCE = '/work/shared/data/structures/1A8O.cif';

const GEMMI = `
import sys, json, gemmi
src = gemmi.read_structure(sys.argv[1]); src.setup_entities()
tiled = gemmi.read_structure(sys.argv[2])
prot = [a for ch in src[0] for r in ch if gemmi.find_tabulated_residue(r.name) and gemmi.find_tabulated_residue(r.name).is_amino_acid() for a in r]
chains = [ch.name for ch in tiled[0]]
atoms = [a for ch in tiled[0] for r in ch for a in r]
print(json.dumps({"protein": len(prot), "count": len(atoms), "chains": chains,
  "d0": prot[0].pos.dist(prot[-1].pos), "names0": [a.name for a in prot],
  "first": [a.name for a in atoms[:len(prot)]],
  "second": [a.name for a in atoms[len(prot):2*len(prot)]],
  "d1": atoms[len(prot)].pos.dist(atoms[2*len(prot)-1].pos),
  "shift": atoms[len(prot)].pos.dist(atoms[0].pos)}))
`;

describe('tiledCif', () => {
  it('writes translated copies of the protein atoms that gemmi reads back', async () => {
    const src = await readStructure(readFileSync(SOURCE), SOURCE);
    const dir = mkdtempSync(join(tmpdir(), 'ff-tile-'));
    try {
      const target = 2000;
      const { text, atoms } = tiledCif(src, target);
      const file = join(dir, 'tiled.cif');
      writeFileSync(file, text);
      const g = JSON.parse(
        execFileSync('/usr/bin/python3', ['-c', GEMMI, SOURCE, file], { encoding: 'utf8' }),
      ) as {
        protein: number;
        count: number;
        chains: string[];
        d0: number;
        d1: number;
        shift: number;
        names0: string[];
        first: string[];
        second: string[];
      };
      expect(atoms).toBe(target);
      expect(g.count).toBe(target);
      expect(g.protein).toBeLessThan(target);
      expect(new Set(g.chains).size).toBe(Math.ceil(target / g.protein));
      expect(g.first).toEqual(g.names0);
      expect(g.second).toEqual(g.names0);
      // rigid copy: an intra-copy distance is kept (to the 0.001 Å written precision)
      expect(Math.abs(g.d1 - g.d0)).toBeLessThan(0.01);
      // copies sit on a 150 Å grid, so the next copy is at least that far away
      expect(g.shift).toBeGreaterThanOrEqual(150 - 0.01);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
