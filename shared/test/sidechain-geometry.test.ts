/**
 * Side-chain ideal-geometry library (Engh & Huber's method: Engh & Huber 1991, Acta Cryst
 * A47:392) and the side-chain terms of the covalent analysis:
 *  - the builder is deterministic (a fixed 40-file subset built twice is byte-identical and equals
 *    the committed subset build) and the shipped library is the build of the whole reference set;
 *  - method check: the same builder's backbone means reproduce the Engh & Huber 2001 backbone
 *    table (ITC F (2006) section 18.3.2.3, values in `ideal/engh-huber.ts`);
 *  - the library's side-chain angles agree with the Engh & Huber 2001 side-chain angles we could
 *    read (ITC F (2006) Table 18.3.2.2);
 *  - the per-term observed values equal gemmi's on 1EJG, and the library means sit within the
 *    spread of 1EJG's atomic-resolution values;
 *  - a side-chain bond stretched by 0.2 Å becomes a > 4σ outlier naming that term.
 * The reference-set folder is large and not in the repo: when it is absent the builder tests say
 * so and are skipped (the only allowed skip, TESTING.md).
 */
import * as fs from 'fs';
import * as path from 'path';
import { DEFAULT_REFERENCE_FOLDER, listStructureFiles } from '../src/cli/build-reference';
import {
  DEFAULT_GEOMETRY_OUT,
  buildGeometryFromFolder,
  geometryInputHash,
} from '../src/cli/build-geometry';
import { buildConformers } from '../src/model/conformers';
import { analyseCovalent, forEachSideChainTerm } from '../src/validation/covalent';
import {
  BACKBONE_ANGLES,
  BACKBONE_BONDS,
  caCbBond,
  type ResidueClass,
} from '../src/validation/ideal/engh-huber';
import {
  defaultSideChainLibrary,
  loadSideChainLibrary,
  SIGMA_FLOOR,
} from '../src/validation/ideal/sidechain-library';
import { SIDE_CHAIN_TOPOLOGY } from '../src/validation/ideal/sidechain-topology';
import type { SideChainGeometryLibrary } from '../src/reference/sidechain-geometry';
import { buildReport } from '../src/report/build';
import { FIXTURES, loadFixture, runReference } from './engine-geom/load';

const DATA = path.join(__dirname, '..', 'src', 'reference', 'data');
const SUBSET_LIST = path.join(DATA, 'geometry-subset-40.txt');
const SUBSET_JSON = path.join(DATA, 'sidechain-geometry-subset-40.json');
const SUBSET_ID = 'foldfolio-sidechain-geometry-subset';

const shippedJson = fs.readFileSync(DEFAULT_GEOMETRY_OUT, 'utf8');
const shipped = JSON.parse(shippedJson) as SideChainGeometryLibrary;

const haveSet = fs.existsSync(DEFAULT_REFERENCE_FOLDER);
if (!haveSet)
  console.warn(
    `Skipping the side-chain geometry builder tests: ${DEFAULT_REFERENCE_FOLDER} is absent.`,
  );
const maybe = haveSet ? describe : describe.skip;

maybe('side-chain geometry builder (reference set)', () => {
  it('builds the fixed 40-file subset byte-identically twice, equal to the committed build', async () => {
    const names = fs
      .readFileSync(SUBSET_LIST, 'utf8')
      .split('\n')
      .map((l) => l.trim())
      .filter((l) => l && !l.startsWith('#'));
    expect(names).toHaveLength(40);
    const a = await buildGeometryFromFolder(DEFAULT_REFERENCE_FOLDER, { names, id: SUBSET_ID });
    const b = await buildGeometryFromFolder(DEFAULT_REFERENCE_FOLDER, { names, id: SUBSET_ID });
    expect(b.json).toBe(a.json);
    expect(a.json).toBe(fs.readFileSync(SUBSET_JSON, 'utf8'));
    expect(a.library.inputs.files).toBe(40);
    // a different input list gives a different input hash
    expect(a.library.sha256).not.toBe(shipped.sha256);
  });

  it('the shipped library is the build of the whole reference set (input hash and bytes)', async () => {
    const names = listStructureFiles(DEFAULT_REFERENCE_FOLDER);
    expect(shipped.inputs.files).toBe(names.length);
    expect(shipped.sha256).toBe(geometryInputHash(DEFAULT_REFERENCE_FOLDER, names));
    const rebuilt = await buildGeometryFromFolder(DEFAULT_REFERENCE_FOLDER);
    expect(rebuilt.json).toBe(shippedJson);
  });
});

describe('side-chain geometry library', () => {
  it('method check: backbone means reproduce the Engh & Huber 2001 backbone table', () => {
    // Engh & Huber 2001, ITC F (2006) section 18.3.2.3 (values in src/validation/ideal/engh-huber.ts).
    // Bars: 0.01 Å (as SCIENCE.md's mean-bond check) and 1.0° (our choice).
    let checked = 0;
    for (const cls of ['general', 'gly', 'pro'] as ResidueClass[]) {
      const ours = shipped.backbone[cls];
      for (const term of ['N-CA', 'CA-C', 'C-O'] as const) {
        expect(ours[term][0]).toBeGreaterThan(1000);
        expect(Math.abs(ours[term][1] - BACKBONE_BONDS[term][cls].ideal)).toBeLessThanOrEqual(0.01);
        checked++;
      }
      for (const term of ['N-CA-C', 'CA-C-O'] as const) {
        expect(Math.abs(ours[term][1] - BACKBONE_ANGLES[term][cls].ideal)).toBeLessThanOrEqual(1.0);
        checked++;
      }
    }
    // CA–CB by the table's substitution classes (CH3 Ala, CH Ile/Thr/Val, CH2 others, Pro)
    for (const [cls, res] of [
      ['CH3', 'ALA'],
      ['CH', 'VAL'],
      ['CH2', 'SER'],
      ['pro', 'PRO'],
    ]) {
      expect(Math.abs(shipped.backbone[cls]['CA-CB'][1] - caCbBond(res).ideal)).toBeLessThanOrEqual(
        0.01,
      );
      checked++;
    }
    expect(checked).toBe(19);
  });

  it('side-chain angles agree with Engh & Huber 2001 (ITC F (2006) Table 18.3.2.2)', () => {
    // EH99 columns of ITC F (2006) Table 18.3.2.2 as read: [residue, our term key, value, σ].
    const published: [string, string, number, number][] = [
      ['ARG', 'CA-CB-CG', 113.4, 2.2],
      ['ARG', 'CB-CG-CD', 111.6, 2.6],
      ['ARG', 'CG-CD-NE', 111.8, 2.1],
      ['ARG', 'CD-NE-CZ', 123.6, 1.4],
      ['ARG', 'NE-CZ-NH', 120.3, 0.5],
      ['ARG', 'NH-CZ-NH', 119.4, 1.1],
      ['ASN', 'CA-CB-CG', 113.4, 2.2],
      ['ASN', 'CB-CG-ND2', 116.7, 2.4],
      ['ASN', 'CB-CG-OD1', 121.6, 2.0],
      ['ASN', 'OD1-CG-ND2', 121.9, 2.3],
      ['ASP', 'CA-CB-CG', 113.4, 2.2],
      ['ASP', 'CB-CG-OD', 118.3, 0.9],
      ['ASP', 'OD-CG-OD', 123.3, 1.9],
      ['CYS', 'CA-CB-SG', 114.2, 1.1],
    ];
    for (const [res, key, value, sigma] of published) {
      const ours = shipped.angles[res][key];
      expect(ours).toBeDefined();
      expect(ours[0]).toBeGreaterThan(1000);
      const bar = Math.max(1.5, sigma);
      expect(Math.abs(ours[1] - value)).toBeLessThanOrEqual(bar);
    }
  });

  it('covers every side-chain term of the topology, with plausible sizes', () => {
    for (const [res, topo] of SIDE_CHAIN_TOPOLOGY) {
      for (const key of topo.bondTypes) {
        const [n, mean, sd] = shipped.bonds[res][key];
        expect(n).toBeGreaterThan(1000);
        // covalent bonds between C, N, O, S: 1.2–1.85 Å; SDs of a few hundredths (common practice, no source)
        expect(mean).toBeGreaterThan(1.2);
        expect(mean).toBeLessThan(1.85);
        expect(sd).toBeGreaterThan(0);
        expect(sd).toBeLessThan(0.03);
      }
      for (const key of topo.angleTypes) {
        const [n, mean, sd] = shipped.angles[res][key];
        expect(n).toBeGreaterThan(1000);
        expect(mean).toBeGreaterThan(95);
        expect(mean).toBeLessThan(135);
        expect(sd).toBeLessThan(3);
      }
    }
    // Planar five- and six-membered rings close: interior angles sum to 540° / 720° (geometry).
    const sum = (res: string, keys: string[], times: number[]): number =>
      keys.reduce((s, k, i) => s + shipped.angles[res][k][1] * times[i], 0);
    const phe = ['CD-CG-CD', 'CG-CD-CE', 'CD-CE-CZ', 'CE-CZ-CE'];
    expect(Math.abs(sum('PHE', phe, [1, 2, 2, 1]) - 720)).toBeLessThan(0.5);
    expect(Math.abs(sum('TYR', phe, [1, 2, 2, 1]) - 720)).toBeLessThan(0.5);
    const his = ['ND1-CG-CD2', 'CG-ND1-CE1', 'ND1-CE1-NE2', 'CD2-NE2-CE1', 'CG-CD2-NE2'];
    expect(Math.abs(sum('HIS', his, [1, 1, 1, 1, 1]) - 540)).toBeLessThan(0.5);
  });
});

interface GemmiTerm {
  chain: string;
  seq: number;
  icode: string;
  value: number;
}

describe('side-chain terms of the covalent analysis', () => {
  it('1EJG: observed values equal gemmi’s, and library means lie within 1EJG’s spread', async () => {
    const file = '1ejg.pdb.gz';
    const st = await loadFixture(file);
    const model = st.models[0];
    const t = buildConformers(st, model);
    // ours: every measured side-chain term, by residue and atom names (conformers sharing atoms
    // measure the same value: keep distinct values)
    const ours = new Map<string, number[]>();
    const S = st.strings;
    forEachSideChainTerm(st, model, t, (k, _kind, names, observed) => {
      const r = t.residue[k];
      const key = `${S[model.residues.name[r]]}:${names.join('-')}|${S[model.chains.authId[model.residues.chain[r]]]}:${model.residues.authSeq[r]}${S[model.residues.icode[r]]}`;
      const list = ours.get(key) ?? [];
      if (!list.some((v) => Math.abs(v - observed) < 1e-9)) list.push(observed);
      ours.set(key, list);
    });
    // Outside reference: gemmi (python3-gemmi) distances and angles on the same file.
    const terms = [
      'PHE:CG-CD1',
      'PHE:CG-CD2',
      'SER:CB-OG',
      'LEU:CG-CD1',
      'CYS:CB-SG',
      'THR:CB-OG1',
      'THR:CB-CG2',
      'PRO:CD-N',
      'PRO:CG-CD',
      'ILE:CB-CG1',
      'ILE:CG1-CD1',
      'TYR:CG-CD1',
      'TYR:CG-CD2',
      'THR:CA-CB-OG1',
      'CYS:CA-CB-SG',
      'PRO:CG-CD-N',
    ];
    const ref = runReference<Record<string, GemmiTerm[]>>(
      'sidechain_gemmi.py',
      path.join(FIXTURES, file),
      ...terms,
    );
    let compared = 0;
    for (const term of terms) {
      const byResidue = new Map<string, number[]>();
      for (const g of ref[term]) {
        const key = `${term}|${g.chain}:${g.seq}${g.icode}`;
        byResidue.set(key, [...(byResidue.get(key) ?? []), g.value]);
      }
      expect(byResidue.size).toBeGreaterThan(0);
      // every residue gemmi measured, we measured, to 0.001 Å / 0.001°
      for (const [key, gv] of byResidue) {
        const ov = ours.get(key);
        expect(ov).toBeDefined();
        const a = [...gv].sort((x, y) => x - y);
        const b = [...ov!].sort((x, y) => x - y);
        expect(b).toHaveLength(a.length);
        a.forEach((v, i) => expect(Math.abs(b[i] - v)).toBeLessThan(0.001));
        compared += a.length;
      }
      // and nothing extra on our side for this term
      const oursKeys = [...ours.keys()].filter((k) => k.startsWith(`${term}|`));
      expect(oursKeys.sort()).toEqual([...byResidue.keys()].sort());
    }
    expect(compared).toBeGreaterThan(50);

    // The library means against 1EJG (crambin, 0.54 Å), per type with at least 4 values there
    // (Phe, Ser, Leu occur once or twice in crambin): |library mean − 1EJG mean| ≤ 2 SD of
    // the 1EJG values (our bar).
    const lib = defaultSideChainLibrary();
    for (const term of [
      'CYS:CB-SG',
      'THR:CB-OG1',
      'THR:CB-CG2',
      'PRO:CD-N',
      'PRO:CG-CD',
      'ILE:CB-CG1',
      'ILE:CG1-CD1',
      'THR:CA-CB-OG1',
      'CYS:CA-CB-SG',
      'PRO:CG-CD-N',
    ]) {
      const vals = ref[term].map((g) => g.value);
      expect(vals.length).toBeGreaterThanOrEqual(4);
      const mean = vals.reduce((s, v) => s + v, 0) / vals.length;
      const sd = Math.sqrt(vals.reduce((s, v) => s + (v - mean) ** 2, 0) / (vals.length - 1));
      const [res, names] = term.split(':');
      const ideals = lib.residues.get(res)!;
      const topo = ideals.topology;
      const isBond = names.split('-').length === 2;
      const idx = (isBond ? topo.bondNames : topo.angleNames).findIndex(
        (n) => n.join('-') === names,
      );
      expect(idx).toBeGreaterThanOrEqual(0);
      const libMean = (isBond ? ideals.bondIdeal : ideals.angleIdeal)[idx];
      expect(Math.abs(libMean - mean)).toBeLessThanOrEqual(2 * sd);
    }
  });

  it('a side-chain bond stretched by 0.2 Å becomes a > 4σ bond outlier naming that term', async () => {
    const st = await loadFixture('1A8O.cif');
    const model = st.models[0];
    const t = buildConformers(st, model);
    const before = analyseCovalent(st, model, t);
    const S = st.strings;
    // the first Leu conformer; move CD1 0.2 Å further from CG along CG→CD1
    const k = [...Array(t.count).keys()].find(
      (i) => S[model.residues.name[t.residue[i]]] === 'LEU',
    )!;
    expect(k).toBeDefined();
    const r = t.residue[k];
    const at = (name: string): number => {
      for (let i = model.residues.atomStart[r]; i < model.residues.atomEnd[r]; i++)
        if (S[model.atoms.name[i]] === name) return i;
      return -1;
    };
    const cg = at('CG');
    const cd1 = at('CD1');
    expect(before.outliers.some((o) => o.conformer === k && o.atoms.join('-') === 'CG-CD1')).toBe(
      false,
    );
    const { x, y, z } = model.atoms;
    const dx = x[cd1] - x[cg];
    const dy = y[cd1] - y[cg];
    const dz = z[cd1] - z[cg];
    const len = Math.sqrt(dx * dx + dy * dy + dz * dz);
    x[cd1] += (0.2 * dx) / len;
    y[cd1] += (0.2 * dy) / len;
    z[cd1] += (0.2 * dz) / len;
    const after = analyseCovalent(st, model, t);
    const hit = after.outliers.find(
      (o) => o.conformer === k && o.kind === 'bond' && o.atoms.join('-') === 'CG-CD1',
    );
    expect(hit).toBeDefined();
    expect(hit!.observed - len).toBeCloseTo(0.2, 6);
    // the library's Leu CG–CD (pooled CD1/CD2), σ at least the floor
    const leu = shipped.bonds.LEU['CG-CD'];
    expect(hit!.ideal).toBe(leu[1]);
    expect(hit!.sigma).toBe(Math.max(leu[2], SIGMA_FLOOR.bond));
    expect(Math.abs(hit!.z)).toBeGreaterThan(4);
    expect(after.bonds.outliers).toBe(before.bonds.outliers + 1);
    expect(after.bonds.count).toBe(before.bonds.count);
  });

  it('the report names the library it used', async () => {
    const file = '4oz7.pdb';
    const report = await buildReport(fs.readFileSync(path.join(FIXTURES, file)), {
      filename: file,
    });
    expect(report.geometryLibrary).toEqual({ id: shipped.id, sha256: shipped.sha256 });
    expect(report.geometryLibrary!.id).toBe('foldfolio-sidechain-geometry-1');
    // the summary counts backbone and side-chain terms together: the count with an empty
    // library (backbone only) plus the side-chain terms
    const m = report.models[0];
    const st = await loadFixture(file);
    const t = buildConformers(st, st.models[0]);
    const side = { bond: 0, angle: 0 };
    forEachSideChainTerm(st, st.models[0], t, (_k, kind) => side[kind]++);
    const empty = loadSideChainLibrary({ ...shipped, bonds: {}, angles: {} });
    const backbone = analyseCovalent(st, st.models[0], t, empty);
    expect(side.bond).toBeGreaterThan(10);
    expect(side.angle).toBeGreaterThan(side.bond);
    expect(m.summary.bonds.count).toBe(backbone.bonds.count + side.bond);
    expect(m.summary.angles.count).toBe(backbone.angles.count + side.angle);
  });
});
