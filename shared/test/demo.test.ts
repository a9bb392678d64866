import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import { buildDemoStructures } from '../src/demo/build';
import { readStructure } from '../src/io/read';
import { buildConformers } from '../src/model/conformers';
import shippedGeometry from '../src/reference/data/sidechain-geometry.json';
import type { SideChainGeometryLibrary } from '../src/reference/sidechain-geometry';
import { buildReport } from '../src/report/build';
import { analyseCovalent } from '../src/validation/covalent';
import {
  defaultSideChainLibrary,
  loadSideChainLibrary,
} from '../src/validation/ideal/sidechain-library';
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
      // Ideal backbone elsewhere: backbone and Cβ terms alone (an empty side-chain library)
      // stay tiny apart from the planted bond. The side chains are built from approximate
      // typical values (from memory, demo/sidechains.ts), not from the side-chain library the
      // covalent check uses since engine 0.2.0: they stay well inside 4σ (largest |z| ≈ 0.5
      // for bonds, ≈ 2.0 for angles, Leu CD1–CG–CD2 108.2° vs 110.6°), bar 2.5.
      const st = await readStructure(new TextEncoder().encode(d.cif), d.fileName);
      const t = buildConformers(st, st.models[0]);
      const shipped = defaultSideChainLibrary();
      const backboneOnly = analyseCovalent(
        st,
        st.models[0],
        t,
        loadSideChainLibrary({
          ...(shippedGeometry as unknown as SideChainGeometryLibrary),
          bonds: {},
          angles: {},
        }),
      );
      expect(shipped.id).toBe(report.geometryLibrary!.id);
      for (let k = 0; k < t.count; k++) {
        const r = t.residue[k];
        const label = `${st.strings[st.models[0].chains.authId[st.models[0].residues.chain[r]]]}${st.models[0].residues.authSeq[r]}`;
        if (!planted('stretched-bond').includes(label))
          expect(backboneOnly.bondZMax[k] || 0).toBeLessThan(0.2);
        expect(backboneOnly.angleZMax[k] || 0).toBeLessThan(0.2);
      }
      for (const r of m.residues) {
        if (!planted('stretched-bond').includes(`${r.chain}${r.seq}`))
          expect(r.bondZMax ?? 0).toBeLessThan(2.5);
        expect(r.angleZMax ?? 0).toBeLessThan(2.5);
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
