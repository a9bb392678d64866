import * as path from 'path';
import { buildConformers } from '../src/model/conformers';
import { caRmsdToFirst, spreadOf } from '../src/validation/ensemble';
import { FIXTURES, loadFixture, runReference } from './engine-geom/load';

describe('NMR ensembles', () => {
  // Outside reference: gemmi.superpose_positions on the CA atoms of model 1 and model k
  // (python3-gemmi), matched the same way; equal to 0.001 Å (issue 3).
  it.each([
    ['1AS5.cif', [1, 6, 13]],
    ['2BEG.cif', [1, 9]],
    ['2OFG.cif', [1, 2]],
  ])('%s: CA RMSD to model 1 equals gemmi’s', async (file, which) => {
    const st = await loadFixture(file);
    const models = st.models.map((model) => ({ model, conformers: buildConformers(st, model) }));
    const rmsd = caRmsdToFirst(st, models);
    expect(rmsd).toHaveLength(st.models.length);
    expect(rmsd[0]).toBe(0);
    for (const k of which as number[]) {
      const ref = runReference<{ rmsd: number }>(
        'superpose_gemmi.py',
        path.join(FIXTURES, file),
        String(k),
        '0',
      );
      expect(rmsd[k]).not.toBeNull();
      expect(Math.abs(rmsd[k]! - ref.rmsd)).toBeLessThan(0.001);
    }
  });

  it('spread: mean, sample sd, min and max', () => {
    // Textbook example: 2, 4, 4, 4, 5, 5, 7, 9 has mean 5 and sample sd √(32/7).
    const s = spreadOf([2, 4, 4, 4, 5, 5, 7, 9]);
    expect(s.mean).toBe(5);
    expect(s.sd).toBeCloseTo(Math.sqrt(32 / 7), 12);
    expect([s.min, s.max]).toEqual([2, 9]);
    expect(spreadOf([3]).sd).toBe(0);
  });
});
