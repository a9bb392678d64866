import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import { buildDemoStructures } from '../src/demo/build';
import { buildReport } from '../src/report/build';
import { runReference } from './engine-geom/load';

interface GemmiDemo {
  chains: string[];
  residues: number;
  atoms: number;
  nonTrans: [string, number, number][];
  negativeChiral: [string, number][];
  longestNCA: [number, string, number];
  clashes: number;
}

describe('demo structures (invented models with planted faults)', () => {
  const demos = buildDemoStructures();
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'foldfolio-demo-'));
  afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

  it('are byte-identical from one build to the next', () => {
    expect(buildDemoStructures().map((d) => d.cif)).toEqual(demos.map((d) => d.cif));
    expect(demos.map((d) => d.fileName)).toEqual(['ffdm1.cif', 'ffdm2.cif']);
  });

  it.each([0, 1])('demo %i: gemmi reads the file and sees the planted faults', (i) => {
    const d = demos[i];
    const file = path.join(dir, d.fileName);
    fs.writeFileSync(file, d.cif);
    // Outside reference: python3-gemmi reads our writer's mmCIF.
    const g = runReference<GemmiDemo>('demo_gemmi.py', file);
    expect(g.atoms).toBe(d.atoms);
    expect(g.residues).toBe(d.residues);
    // No unplanted faults: no atom pairs closer than 2.2 Å between non-adjacent residues.
    expect(g.clashes).toBe(0);
    const cis = d.faults.filter((f) => f.kind === 'cis-peptide').map((f) => [f.chain, f.seq]);
    expect(g.nonTrans.map(([c, s]) => [c, s])).toEqual(cis);
    for (const [, , w] of g.nonTrans) expect(Math.abs(w)).toBeLessThan(1);
    expect(g.negativeChiral).toEqual(
      d.faults.filter((f) => f.kind === 'd-residue').map((f) => [f.chain, f.seq]),
    );
    const stretched = d.faults.find((f) => f.kind === 'stretched-bond');
    if (stretched) {
      expect(g.longestNCA.slice(1)).toEqual([stretched.chain, stretched.seq]);
      // Engh & Huber 2001 N–CA 1.459 Å + 0.15 Å (coordinates are written to 0.001 Å).
      expect(g.longestNCA[0]).toBeCloseTo(1.609, 2);
    }
  });

  it.each([0, 1])(
    'demo %i: our analyses find exactly the planted faults and nothing else',
    async (i) => {
      const d = demos[i];
      const report = await buildReport(new TextEncoder().encode(d.cif), { filename: d.fileName });
      const m = report.models[0];
      const flagged = (flag: string): string[] =>
        m.residues.filter((r) => r.flags.includes(flag as never)).map((r) => `${r.chain}${r.seq}`);
      const planted = (kind: string): string[] =>
        d.faults.filter((f) => f.kind === kind).map((f) => `${f.chain}${f.seq}`);
      expect(flagged('cis-peptide')).toEqual(planted('cis-peptide'));
      expect(m.summary.cisPeptides).toBe(planted('cis-peptide').length);
      expect(m.summary.cisProPeptides).toBe(0);
      expect(flagged('twisted-peptide')).toEqual([]);
      expect(flagged('d-residue')).toEqual(planted('d-residue'));
      // A D residue's Cβ sits at the mirror position of the ideal L one, so it is also a Cβ outlier.
      expect(flagged('cb-deviation')).toEqual(planted('d-residue'));
      expect(flagged('bond-outlier')).toEqual(planted('stretched-bond'));
      expect(flagged('angle-outlier')).toEqual([]);
      expect(m.summary.bonds.outliers).toBe(planted('stretched-bond').length);
      // Ideal geometry elsewhere: bond |z| stays tiny apart from the planted bond. Angles: the
      // side chains are built from approximate typical values (from memory, demo/sidechains.ts),
      // not from the side-chain library the covalent check uses since engine 0.2.0, so their
      // largest angle |z| is about 0.25 (backbone alone stayed below 0.2); 0.5 still means ideal.
      for (const r of m.residues) {
        if (!planted('stretched-bond').includes(`${r.chain}${r.seq}`))
          expect(r.bondZMax ?? 0).toBeLessThan(0.2);
        expect(r.angleZMax ?? 0).toBeLessThan(0.5);
        expect(r.flags).not.toContain('missing-atoms');
      }
    },
  );

  it('write only items the PDBx/mmCIF dictionary defines (Debian libcifpp-data)', () => {
    const dic = fs.readFileSync('/usr/share/libcifpp/mmcif_pdbx.dic', 'utf8');
    for (const d of demos) {
      const items = new Set(
        d.cif
          .split('\n')
          .filter((l) => l.startsWith('_'))
          .map((l) => l.split(/\s+/)[0]),
      );
      expect(items.size).toBeGreaterThan(30);
      for (const item of items) expect(dic.includes(`save_${item}\n`)).toBe(true);
    }
  });

  it('the bundle is helical by the DSSP method, as mkdssp says too', async () => {
    const d = demos[0];
    const file = path.join(dir, 'bundle-dssp.cif');
    fs.writeFileSync(file, d.cif);
    const ref = runReference<[string, string][]>('dssp_mkdssp.py', file);
    const report = await buildReport(new TextEncoder().encode(d.cif), { filename: d.fileName });
    const ours = report.models[0].residues.map((r) => r.ss);
    expect(ours.filter((c) => c === 'H').length).toBeGreaterThan(d.residues * 0.7);
    expect(ref.map(([, c]) => c)).toEqual(ours);
  });
});
