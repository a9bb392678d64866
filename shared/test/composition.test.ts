import * as path from 'path';
import { bFactorSummary, occupancySummary, sequenceGaps } from '../src/validation/composition';
import { FIXTURES, loadFixture, runReference } from './engine-geom/load';

interface GemmiComposition {
  b: Record<string, [number, number, number, number]>;
  occ: [number, number];
  gaps: [string, number | null, number][];
}

// Outside reference: gemmi (python3-gemmi) on the same files, first model.
describe('B-factor, occupancy and sequence-gap summaries', () => {
  it.each(['2XHE.cif', '1GBT.cif', '5i55.cif', '4ZHL.cif'])('%s matches gemmi', async (file) => {
    const st = await loadFixture(file);
    const model = st.models[0];
    const ref = runReference<GemmiComposition>('composition_gemmi.py', path.join(FIXTURES, file));
    const b = bFactorSummary(st, model);
    for (const group of ['all', 'water', 'main-chain']) {
      const ours = b.find((g) => g.group === group);
      const theirs = ref.b[group];
      if (!theirs) continue;
      expect(ours).toBeDefined();
      expect(ours!.atoms).toBe(theirs[3]);
      expect(Math.abs(ours!.mean! - theirs[0])).toBeLessThan(0.006);
      expect(Math.abs(ours!.min! - theirs[1])).toBeLessThan(0.006);
      expect(Math.abs(ours!.max! - theirs[2])).toBeLessThan(0.006);
    }
    const occ = occupancySummary(model);
    expect([occ.partialAtoms, occ.zeroAtoms]).toEqual(ref.occ);
    const gaps = sequenceGaps(st, model);
    expect(gaps.basis).toBe('label-seq');
    expect(gaps.gaps.map((g) => [g.chain, g.afterSeq, g.missing])).toEqual(ref.gaps);
  });

  it('2XHE has the unmodelled stretches gemmi reports (a check that could fail)', async () => {
    const st = await loadFixture('2XHE.cif');
    const gaps = sequenceGaps(st, st.models[0]).gaps;
    expect(gaps.length).toBeGreaterThanOrEqual(4);
    expect(gaps.reduce((p, g) => p + g.missing, 0)).toBeGreaterThan(50);
  });

  it('a legacy PDB file falls back to author numbering', async () => {
    const st = await loadFixture('2XHE.pdb');
    const res = sequenceGaps(st, st.models[0]);
    expect(res.basis).toBe('author-numbering');
    // Every gap found from the author numbering is one of the mmCIF version's (label_seq based,
    // checked against gemmi above); only terminal gaps cannot be told without an alignment, and
    // 2XHE has three internal gaps (A 509+51, B 15+23, B 192+17 in gemmi's output).
    const cifSt = await loadFixture('2XHE.cif');
    const cif = sequenceGaps(cifSt, cifSt.models[0]).gaps.map(
      (g) => `${g.chain}${g.afterSeq}+${g.missing}`,
    );
    const found = res.gaps.map((g) => `${g.chain}${g.afterSeq}+${g.missing}`);
    for (const g of found) expect(cif).toContain(g);
    expect(found).toHaveLength(3);
    expect(found.length).toBeGreaterThan(0);
  });
});
