/**
 * Report builder and `foldfolio report` command: contract fields, input hash (checked against
 * Node's own crypto SHA-256), determinism, auth identifiers and torsions against gemmi,
 * CA-only handling, model selection, and the CLI's exit codes.
 */
import { createHash } from 'crypto';
import * as fs from 'fs';
import * as path from 'path';
import {
  buildReport,
  buildReportFromStructure,
  ENGINE_VERSION,
  readStructure,
  REPORT_SCHEMA,
  StructureReadError,
} from '../src';
import { runReportCommand } from '../src/cli/report';
import { nodeGunzip } from '../src/cli/node-gunzip';
import { nodeSha256 } from '../src/cli/node-sha256';
import { FIXTURES, referenceFor, STRUCTURE_FIXTURES } from './reference/reference';
import type { RefEntry } from './reference/reference';

const bytesOf = (f: string): Uint8Array => fs.readFileSync(path.join(FIXTURES, f));

let ref: Record<string, RefEntry>;
beforeAll(() => {
  ref = referenceFor(STRUCTURE_FIXTURES);
});

async function run(args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const code = await runReportCommand(args, { out: (t) => (out += t), err: (t) => (err += t) });
  return { code, out, err };
}

describe('buildReport', () => {
  it('fills the contract header; the input hash equals Node crypto SHA-256 of the bytes', async () => {
    const bytes = bytesOf('1pfe.cif.gz');
    const r = await buildReport(bytes, { filename: '1pfe.cif.gz' });
    expect(r.schema).toBe(REPORT_SCHEMA);
    expect(r.engine.version).toBe(ENGINE_VERSION);
    expect(r.input).toEqual({
      sha256: createHash('sha256').update(bytes).digest('hex'),
      format: 'mmcif',
      gzip: true,
      sizeBytes: bytes.length,
    });
  });

  it('the Node edge (zlib gunzip, crypto hash) gives the identical report', async () => {
    const bytes = bytesOf('1pfe.cif.gz');
    const edge = await buildReport(bytes, { gunzip: nodeGunzip, sha256: nodeSha256 });
    expect(JSON.stringify(edge)).toBe(JSON.stringify(await buildReport(bytes)));
  });

  it('is byte-identical for the same input', async () => {
    const a = JSON.stringify(await buildReport(bytesOf('3JQH.cif')));
    const b = JSON.stringify(await buildReport(bytesOf('3JQH.cif')));
    expect(a).toBe(b);
  });

  it.each(['1A8O.cif', '2XHE.pdb', '3JQH.cif', '7CFN.cif'])(
    '%s: residue rows carry auth chain/seq/icode and the torsions gemmi computes',
    async (f) => {
      const r = await buildReport(bytesOf(f));
      const g = new Map(
        ref[f].modelInfo![0].rows.map((x) => [
          `${x.chain}|${x.seq}|${x.icode}|${x.name}|${x.altloc}`,
          x,
        ]),
      );
      let checked = 0;
      for (const row of r.models[0].residues) {
        const x = g.get(`${row.chain}|${row.seq}|${row.icode}|${row.name}|${row.altloc}`);
        expect(x).toBeDefined();
        for (const key of ['phi', 'psi', 'omega'] as const) {
          const ours = row[key];
          const theirs = x![key];
          if (theirs === null) expect(ours).toBeNull();
          else {
            expect(ours).not.toBeNull();
            const d = Math.abs(ours! - theirs) % 360;
            expect(Math.min(d, 360 - d)).toBeLessThan(0.01);
            checked++;
          }
        }
      }
      expect(checked).toBeGreaterThan(50);
    },
  );

  it('an NMR ensemble gives one model report per model; --model picks one', async () => {
    const all = await buildReport(bytesOf('1AS5.cif'));
    expect(all.models.map((m) => m.model)).toEqual(
      Array.from({ length: ref['1AS5.cif'].models! }, (_, i) => i + 1),
    );
    const one = await buildReport(bytesOf('1AS5.cif'), { model: 3 });
    expect(one.models.length).toBe(1);
    expect(one.models[0]).toEqual(all.models[2]);
    await expect(buildReport(bytesOf('1AS5.cif'), { model: 99 })).rejects.toThrow(
      StructureReadError,
    );
  });

  it('a CA-only model (1lzh) says which statistics cannot be computed', async () => {
    const r = await buildReport(bytesOf('1lzh.pdb.gz'));
    const m = r.models[0];
    expect(m.summary.notComputed.map((n) => n.statistic)).toContain('backbone-torsions');
    expect(m.residues.length).toBe(m.summary.composition.proteinResidues);
    expect(m.residues.every((x) => x.flags.includes('ca-only') && x.phi === null)).toBe(true);
  });

  it('composition counts waters like gemmi (Residue.is_water) and polymer residues once per conformer row', async () => {
    for (const f of ['1GBT.cif', '4oz7.pdb', '1LCD.cif']) {
      const r = await buildReport(bytesOf(f));
      expect(r.models[0].summary.composition.waters).toBe(ref[f].modelInfo![0].kinds.water);
      expect(r.models[0].summary.composition.atoms).toBe(
        Object.values(ref[f].modelInfo![0].chains).reduce((s, c) => s + c.atoms, 0),
      );
    }
  });

  it('reports microheterogeneity as separate rows at one position, each linked to its neighbours (3JQH 15)', async () => {
    const r = await buildReport(bytesOf('3JQH.cif'));
    const at15 = r.models[0].residues.filter((x) => x.seq === 15);
    expect(at15.map((x) => `${x.name}${x.altloc}`)).toEqual(['ARGA', 'GLNB', 'GLUC']);
    for (const x of at15) {
      expect(x.phi).not.toBeNull();
      expect(x.flags).not.toContain('chain-break-before');
    }
  });
});

describe('foldfolio report (CLI)', () => {
  const file = path.join(FIXTURES, '1A8O.pdb');

  it('prints a readable summary', async () => {
    const { code, out, err } = await run([file]);
    expect(code).toBe(0);
    expect(err).toBe('');
    expect(out).toContain('70 protein residues');
    expect(out).toContain('88 waters');
    expect(out).toContain('MSE→MET ×4');
  });

  it('--json prints the report, equal to buildReport', async () => {
    const { code, out } = await run([file, '--json']);
    expect(code).toBe(0);
    expect(JSON.parse(out)).toEqual(await buildReport(bytesOf('1A8O.pdb')));
  });

  it.each([
    [['pdb1gdr.ent'], /Line 108/],
    [['5moo_header.pdb'], /no atom records/],
    [['does-not-exist.cif'], /cannot read/],
    [[], /no file given/],
    [['1A8O.pdb', '--model'], /--model needs a model number/],
    [['1A8O.pdb', '--model', '7'], /no model 7/],
    [['1A8O.pdb', '--colour'], /unknown option --colour/],
  ])('bad input %j: exit 2 with one line', async (args, msg) => {
    const full = args.map((a) => (a.startsWith('-') || a === '7' ? a : path.join(FIXTURES, a)));
    const { code, out, err } = await run(full);
    expect(code).toBe(2);
    expect(out).toBe('');
    expect(err).toMatch(msg);
    expect(err.trimEnd().split('\n')).toHaveLength(1);
  });
});

describe('geometry-only reports (--geometry-only)', () => {
  it('leave out verdicts and overlaps, say so, and keep every geometry number of the full report', async () => {
    const bytes = bytesOf('1A8O.cif');
    const full = await buildReport(bytes, { filename: '1A8O.cif' });
    const geo = await buildReport(bytes, { filename: '1A8O.cif', scope: 'geometry' });
    const [f, g] = [full.models[0], geo.models[0]];
    // left out, and listed with the reason
    expect(g.summary.rama).toBeUndefined();
    expect(g.summary.rotamers).toBeUndefined();
    expect(g.summary.overlaps).toBeUndefined();
    expect(g.overlaps).toBeUndefined();
    expect(geo.reference).toBeNull();
    expect(f.summary.rama?.overall.total).toBeGreaterThan(0);
    for (const statistic of ['ramachandran', 'rotamers', 'overlaps'])
      expect(g.summary.notComputed.find((n) => n.statistic === statistic)?.reason).toMatch(
        /geometry-only report/,
      );
    // the geometry itself is the full report's, number for number
    for (const key of [
      'composition',
      'bonds',
      'angles',
      'cisPeptides',
      'twistedPeptides',
      'dResidues',
      'cbOutliers',
      'bFactors',
      'secondaryStructure',
    ] as const)
      expect(g.summary[key]).toEqual(f.summary[key]);
    expect(g.residues.map((r) => [r.phi, r.psi, r.omega, r.chi, r.ss])).toEqual(
      f.residues.map((r) => [r.phi, r.psi, r.omega, r.chi, r.ss]),
    );
    expect(g.residues.some((r) => r.rama !== undefined || r.rotamer !== undefined)).toBe(false);
    expect(geo.geometryLibrary).toEqual(full.geometryLibrary);
  });

  it('the command prints the summary with the statistics it left out', async () => {
    const { code, out } = await run([path.join(FIXTURES, '1A8O.cif'), '--geometry-only']);
    expect(code).toBe(0);
    expect(out).toMatch(/bonds: \d+, RMS-Z/);
    expect(out).not.toMatch(/Ramachandran:/);
    expect(out).toMatch(/not computed \(overlaps\): Not requested: this is a geometry-only report/);
  });
});

describe('experimental statistics in the report', () => {
  // The method and the values come from the file's own records (_exptl.method, _reflns, _refine);
  // the experiment reader itself is checked against gemmi in experiment.test.ts.
  test.each([
    ['1A8O.cif', 'x-ray'],
    ['2OFG.cif', 'nmr'],
    ['1A8O.pdb', 'x-ray'],
  ])(
    '%s: report.method is %s and report.experiment carries the high-resolution limit when stated',
    async (file, method) => {
      const bytes = new Uint8Array(fs.readFileSync(path.join(FIXTURES, file)));
      const report = await buildReport(bytes, { filename: file });
      expect(report.method).toBe(method);
      expect(report.experiment).toBeDefined();
      const keys = Object.keys(report.experiment ?? {});
      if (method === 'x-ray') {
        expect(keys).toContain('resolutionHighA');
        // 1A8O is a 1.70 Å entry (../shared/data/README.md)
        expect(Number(report.experiment?.resolutionHighA.value)).toBeCloseTo(1.7, 2);
      }
    },
  );
});

describe('progress hook', () => {
  test('onStep names every per-model step in order, the overlap step once per model, and leaves the report unchanged', async () => {
    const bytes = new Uint8Array(fs.readFileSync(path.join(FIXTURES, '2OFG.cif')));
    const structure = await readStructure(bytes, '2OFG.cif');
    const seen: Array<[string, number, number]> = [];
    const withHook = buildReportFromStructure(structure, bytes, {
      onStep: (step, i, n) => seen.push([step, i, n]),
    });
    const without = buildReportFromStructure(structure, bytes);
    expect(JSON.stringify(withHook)).toBe(JSON.stringify(without));
    const n = structure.models.length;
    expect(seen.filter(([s]) => s === 'overlapStep').map(([, i]) => i)).toEqual(
      Array.from({ length: n }, (_, i) => i),
    );
    expect(seen.every(([, , count]) => count === n)).toBe(true);
    // model indices never go back
    for (let k = 1; k < seen.length; k++) expect(seen[k][1]).toBeGreaterThanOrEqual(seen[k - 1][1]);
  });
});
