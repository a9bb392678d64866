import * as path from 'path';
import { buildConformers } from '../src/model/conformers';
import { analysePeptides, classifyOmega } from '../src/validation/peptides';
import { FIXTURES, loadFixture, residueKey, runReference } from './engine-geom/load';

interface GemmiPeptides {
  omega: [string, number, string, number, string][];
}

describe('peptide conformation (cis |ω| < 30°, twisted 30°–150°: common practice, no source)', () => {
  it('classifies omega at the published limits', () => {
    expect(classifyOmega(179.9)).toBe('trans');
    expect(classifyOmega(-150.5)).toBe('trans');
    expect(classifyOmega(149.9)).toBe('twisted');
    expect(classifyOmega(-30)).toBe('twisted');
    expect(classifyOmega(29.9)).toBe('cis');
    expect(classifyOmega(-3)).toBe('cis');
  });

  // Outside reference: gemmi.calculate_omega (python3-gemmi) for every peptide of the first
  // model; our omega must equal it to 0.01° and the non-trans peptides must be the same.
  it.each(['2XHE.cif', '1GBT.cif', '4ZHL.cif', '1A8O.cif'])(
    '%s: omega and non-trans peptides equal gemmi’s',
    async (file) => {
      const st = await loadFixture(file);
      const model = st.models[0];
      const t = buildConformers(st, model);
      const pep = analysePeptides(st, model, t);
      const ref = runReference<GemmiPeptides>('peptides_gemmi.py', path.join(FIXTURES, file));
      const s = st.strings;
      const ours = new Map<string, number>();
      const oursNonTrans = new Set<string>();
      for (let r = 0; r < model.residues.count; r++) {
        const k = t.firstOfResidue[r];
        if (Number.isNaN(pep.omegaDeg[k])) continue;
        const key = residueKey(
          s[model.chains.authId[model.residues.chain[r]]],
          model.residues.authSeq[r],
          s[model.residues.icode[r]],
        );
        ours.set(key, pep.omegaDeg[k]);
        if (pep.state[k] !== 0) oursNonTrans.add(key);
      }
      let matched = 0;
      const refNonTrans = new Set<string>();
      for (const [chain, seq, icode, omega] of ref.omega) {
        const key = residueKey(chain, seq, icode);
        if (Math.abs(omega) < 150) refNonTrans.add(key);
        const w = ours.get(key);
        if (w === undefined) continue;
        matched++;
        const d = Math.abs(((w - omega + 540) % 360) - 180);
        expect(d).toBeLessThan(0.01);
      }
      expect(matched).toBeGreaterThanOrEqual(ref.omega.length * 0.97);
      expect([...oursNonTrans].filter((k) => ours.has(k)).sort()).toEqual(
        [...refNonTrans].filter((k) => ours.has(k)).sort(),
      );
      if (file === '2XHE.cif') {
        // gemmi finds one twisted peptide here (A 590, ω ≈ 146°).
        expect(refNonTrans.has('A:590')).toBe(true);
        expect(pep.twisted).toBeGreaterThanOrEqual(1);
      }
    },
  );

  it('counts a peptide turned to cis, and cis-Pro separately', async () => {
    const st = await loadFixture('5i55.cif');
    const model = st.models[0];
    const t = buildConformers(st, model);
    const before = analysePeptides(st, model, t);
    expect(before.cis).toBe(0);
    // Rotate everything after residue k's C–N bond by 180° about that bond: ω flips to ≈ 0°.
    const k = 8;
    const q = t.next[k];
    const c = t.c[k];
    const n = t.n[q];
    const { x, y, z } = model.atoms;
    const ax = x[n] - x[c];
    const ay = y[n] - y[c];
    const az = z[n] - z[c];
    const l = Math.sqrt(ax * ax + ay * ay + az * az);
    const u = [ax / l, ay / l, az / l];
    const firstAtom = model.residues.atomStart[t.residue[q]];
    const chainEnd =
      model.residues.atomEnd[model.chains.residueEnd[model.residues.chain[t.residue[q]]] - 1];
    for (let a = firstAtom; a < chainEnd; a++) {
      // 180° rotation about axis u through C: p' = 2(u·v)u − v
      const vx = x[a] - x[c];
      const vy = y[a] - y[c];
      const vz = z[a] - z[c];
      const d = u[0] * vx + u[1] * vy + u[2] * vz;
      x[a] = x[c] + 2 * d * u[0] - vx;
      y[a] = y[c] + 2 * d * u[1] - vy;
      z[a] = z[c] + 2 * d * u[2] - vz;
    }
    const after = analysePeptides(st, model, t);
    expect(Math.abs(after.omegaDeg[k])).toBeLessThan(30);
    expect(
      Math.abs(Math.abs(after.omegaDeg[k]) - Math.abs(180 - Math.abs(before.omegaDeg[k]))),
    ).toBeLessThan(1e-6);
    expect(after.cis).toBe(1);
    const nextIsPro = st.strings[model.residues.parent[t.residue[q]]] === 'PRO';
    expect(after.cisPro).toBe(nextIsPro ? 1 : 0);
  });
});
