import * as path from 'path';
import { buildConformers } from '../src/model/conformers';
import { analyseChirality, CB_DEVIATION_LIMIT_A, idealCb } from '../src/validation/chirality';
import { FIXTURES, loadFixture, residueKey, runReference } from './engine-geom/load';

interface GemmiPeptides {
  chiral: [string, number, string, number][];
}

describe('CA chirality and Cβ deviation', () => {
  // Outside reference: the chiral volume from gemmi's coordinates (python3-gemmi) residue by
  // residue, to 1e-3 Å³; every residue of these L-protein entries is positive (about +2.5 Å³).
  it.each(['1ejg.pdb.gz', '1A8O.cif', '4ZHL.cif', '5i55.cif'])(
    '%s: chiral volumes equal gemmi’s and no residue is D',
    async (file) => {
      const st = await loadFixture(file);
      const model = st.models[0];
      const t = buildConformers(st, model);
      const res = analyseChirality(st, model, t);
      const ref = runReference<GemmiPeptides>('peptides_gemmi.py', path.join(FIXTURES, file));
      const s = st.strings;
      const ours = new Map<string, number>();
      for (let r = 0; r < model.residues.count; r++) {
        const v = res.chiralVolumeA3[t.firstOfResidue[r]];
        if (!Number.isNaN(v)) {
          ours.set(
            residueKey(
              s[model.chains.authId[model.residues.chain[r]]],
              model.residues.authSeq[r],
              s[model.residues.icode[r]],
            ),
            v,
          );
        }
      }
      let matched = 0;
      for (const [chain, seq, icode, vol] of ref.chiral) {
        const v = ours.get(residueKey(chain, seq, icode));
        if (v === undefined) continue;
        matched++;
        expect(Math.abs(v - vol)).toBeLessThan(1e-3);
        expect(vol).toBeGreaterThan(1.5);
      }
      expect(matched).toBeGreaterThanOrEqual(ref.chiral.length * 0.97);
      expect(res.dResidues).toBe(0);
      // Lovell et al. 2003: well-refined structures have few Cβ outliers (> 0.25 Å); mean
      // deviation well under that (from memory: typically below 0.1 Å).
      const devs = Array.from(res.cbDeviationA).filter((d) => !Number.isNaN(d));
      const mean = devs.reduce((p, q) => p + q, 0) / devs.length;
      expect(mean).toBeLessThan(0.1);
      expect(res.cbOutliers).toBeLessThanOrEqual(Math.ceil(devs.length * 0.01));
    },
  );

  it('the mirror image of a structure has every non-Gly residue D and large Cβ deviations', async () => {
    const st = await loadFixture('5i55.cif');
    const model = st.models[0];
    const t = buildConformers(st, model);
    const before = analyseChirality(st, model, t);
    // residues (not conformers: 5i55 has alternate locations) with a measurable CA
    let withCb = 0;
    for (let r = 0; r < model.residues.count; r++) {
      if (!Number.isNaN(before.chiralVolumeA3[t.firstOfResidue[r]])) withCb++;
    }
    expect(withCb).toBeGreaterThan(10);
    for (let a = 0; a < model.atoms.count; a++) model.atoms.x[a] = -model.atoms.x[a];
    const after = analyseChirality(st, model, t);
    expect(after.dResidues).toBe(withCb);
    expect(after.cbOutliers).toBe(withCb);
  });

  it('builds the ideal Cβ at the ideal distance and angles', () => {
    // An idealised N, CA, C (Engh & Huber 2001 lengths, N–CA–C 111°).
    const ca: [number, number, number] = [0, 0, 0];
    const n: [number, number, number] = [1.459, 0, 0];
    const a = (111 * Math.PI) / 180;
    const c: [number, number, number] = [1.525 * Math.cos(a), 1.525 * Math.sin(a), 0];
    const cb = idealCb(n, ca, c, 'LEU')!;
    const len = Math.hypot(cb[0], cb[1], cb[2]);
    expect(len).toBeCloseTo(1.535, 6);
    const ang = (p: number[]): number =>
      (Math.acos(
        (p[0] * cb[0] + p[1] * cb[1] + p[2] * cb[2]) / (Math.hypot(p[0], p[1], p[2]) * len),
      ) *
        180) /
      Math.PI;
    expect(ang(n)).toBeCloseTo(110.6, 6);
    expect(ang(c)).toBeCloseTo(110.6, 6);
    // L hand: positive chiral volume (N−CA)·[(C−CA)×(CB−CA)]
    const vol =
      n[0] * (c[1] * cb[2] - c[2] * cb[1]) -
      n[1] * (c[0] * cb[2] - c[2] * cb[0]) +
      n[2] * (c[0] * cb[1] - c[1] * cb[0]);
    expect(vol).toBeGreaterThan(0);
    expect(CB_DEVIATION_LIMIT_A).toBe(0.25);
  });
});
