import * as fs from 'fs';
import * as path from 'path';
import { buildReport } from '../src/report/build';
import { FIXTURES, runReference } from './engine-geom/load';

const read = (f: string): Uint8Array => fs.readFileSync(path.join(FIXTURES, f));

describe('geometry analyses in the report', () => {
  it('2XHE: summary filled, twisted peptide flagged where gemmi measures ω ≈ 146°, ss codes per row', async () => {
    const report = await buildReport(read('2XHE.cif'), { filename: '2XHE.cif' });
    const m = report.models[0];
    const pending = m.summary.notComputed.map((n) => n.statistic);
    for (const s of ['covalent-geometry', 'peptides', 'chirality', 'secondary-structure'])
      expect(pending).not.toContain(s);
    expect(m.summary.bonds.count).toBeGreaterThan(3000);
    expect(m.summary.bonds.rmsZ).not.toBeNull();
    const row = m.residues.find((r) => r.chain === 'A' && r.seq === 590)!;
    // gemmi.calculate_omega: 146° (test/peptides.test.ts checks the value itself).
    expect(row.flags).toContain('twisted-peptide');
    expect(m.summary.twistedPeptides).toBeGreaterThanOrEqual(1);
    // Secondary-structure counts equal mkdssp's over the same residues (Debian dssp 4.2).
    const ref = runReference<[string, string][]>('dssp_mkdssp.py', path.join(FIXTURES, '2XHE.cif'));
    const helix = ref.filter(([, c]) => c === 'H').length;
    expect(Math.abs((m.summary.secondaryStructure.H ?? 0) - helix)).toBeLessThanOrEqual(
      Math.ceil(helix * 0.01),
    );
    expect(m.summary.bFactors.find((b) => b.group === 'all')!.atoms).toBe(6315);
    expect(m.summary.sequenceGaps!.length).toBeGreaterThan(3);
    // The outlier list and the row flags agree.
    for (const o of m.geometryOutliers ?? []) {
      const r = m.residues.find(
        (x) =>
          x.chain === o.chain && x.seq === o.seq && x.icode === o.icode && x.altloc === o.altloc,
      )!;
      expect(r.flags).toContain(o.atoms.length === 2 ? 'bond-outlier' : 'angle-outlier');
      expect(Math.abs(o.z)).toBeGreaterThan(4);
    }
  });

  it('1AS5 (NMR, 14 models): ensemble spread and CA RMSD to model 1 as gemmi computes it', async () => {
    const report = await buildReport(read('1AS5.cif'), { filename: '1AS5.cif' });
    const e = report.ensemble!;
    expect(e.models).toBe(14);
    expect(e.caRmsdToFirstA).toHaveLength(14);
    const ref = runReference<{ rmsd: number }>(
      'superpose_gemmi.py',
      path.join(FIXTURES, '1AS5.cif'),
      '7',
      '0',
    );
    expect(Math.abs(e.caRmsdToFirstA[7] - ref.rmsd)).toBeLessThan(0.001);
    const bonds = report.models.map((m) => m.summary.bonds.rmsd!);
    expect(e.spread.bondRmsdA.min).toBeCloseTo(Math.min(...bonds), 4);
    expect(e.spread.bondRmsdA.max).toBeCloseTo(Math.max(...bonds), 4);
  });

  it('a CA-only model says why geometry and secondary structure are missing', async () => {
    const report = await buildReport(read('1lzh.pdb.gz'), { filename: '1lzh.pdb.gz' });
    const nc = report.models[0].summary.notComputed;
    for (const s of ['covalent-geometry', 'peptides', 'chirality', 'secondary-structure']) {
      const entry = nc.find((n) => n.statistic === s);
      expect(entry?.reason).toMatch(/CA atoms only/);
    }
  });
});
