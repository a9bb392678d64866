/**
 * Experimental statistics read from real entries, checked against gemmi (Debian python3-gemmi,
 * run with /usr/bin/python3 on the same files) and against the PDBx/mmCIF dictionary shipped by
 * Debian libcifpp-data.
 */
import { execFileSync } from 'node:child_process';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import {
  experimentItemNames,
  readExperimentFromBytes,
  readExperimentFromText,
  type ExperimentalStats,
} from '../src/experiment';

const FIXTURES = join(__dirname, 'fixtures');
const DICTIONARY = '/usr/share/libcifpp/mmcif_pdbx.dic';

// every text fixture, gzip or not (BinaryCIF is compared with its mmCIF twin below)
const files = readdirSync(FIXTURES)
  .filter((f) => /\.(cif|pdb)(\.gz)?$/.test(f))
  .sort();
const ours = new Map<string, ExperimentalStats>();
let gemmi: Record<string, Record<string, number | string>> = {};

beforeAll(async () => {
  for (const f of files)
    ours.set(f, await readExperimentFromBytes(new Uint8Array(readFileSync(join(FIXTURES, f))), f));
  const xray = files.filter((f) => ours.get(f)!.method === 'x-ray');
  const out = execFileSync(
    '/usr/bin/python3',
    [join(__dirname, 'reference/experiment_gemmi.py'), ...xray.map((f) => join(FIXTURES, f))],
    {
      encoding: 'utf8',
      maxBuffer: 1 << 24,
    },
  );
  gemmi = JSON.parse(out);
});

function close(a: number, b: number): boolean {
  return Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(b));
}

describe('experimental statistics vs gemmi', () => {
  test('there are X-ray fixtures in both formats to compare', () => {
    const names = Object.keys(gemmi);
    expect(names.some((n) => n.endsWith('.cif'))).toBe(true);
    expect(names.some((n) => n.endsWith('.pdb'))).toBe(true);
  });

  test('every value gemmi reads equals ours (resolution, R-work, R-free, cell, space group, reflections, completeness)', () => {
    const mismatches: string[] = [];
    let compared = 0;
    for (const [file, ref] of Object.entries(gemmi)) {
      const mine = ours.get(file)!.values;
      for (const [key, expected] of Object.entries(ref)) {
        const got = mine[key]?.value;
        compared++;
        const ok =
          typeof expected === 'number'
            ? typeof got === 'number' && close(got, expected)
            : got === expected;
        if (!ok) mismatches.push(`${file} ${key}: ours ${String(got)} gemmi ${String(expected)}`);
      }
    }
    expect(mismatches).toEqual([]);
    expect(compared).toBeGreaterThan(40);
  });

  test('a legacy PDB header gives the same numbers as the same entry in mmCIF read by gemmi (1A8O)', () => {
    const pdb = ours.get('1A8O.pdb')!.values;
    const ref = gemmi['1A8O.cif'];
    for (const key of [
      'resolutionHighA',
      'resolutionLowA',
      'completenessPct',
      'reflectionsUnique',
      'rWork',
      'rFree',
      'refineResolutionHighA',
      'reflectionsRefinement',
    ]) {
      expect([key, pdb[key]?.value]).toEqual([key, ref[key]]);
      expect(pdb[key].source).toMatch(/^REMARK (3|200) /);
    }
  });

  test('the highest shell comes from the highest-resolution _reflns_shell row (1A8O: 1.73–1.70 Å, 98.6 %)', () => {
    // values as printed in the entry's REMARK 200 "IN THE HIGHEST RESOLUTION SHELL" (the PDB file)
    const v = ours.get('1A8O.cif')!.values;
    expect(v.shellResolutionHighA.value).toBe(1.7);
    expect(v.shellResolutionLowA.value).toBe(1.73);
    expect(v.shellCompletenessPct.value).toBe(98.6);
    const p = ours.get('1A8O.pdb')!.values;
    expect(p.shellCompletenessPct.value).toBe(98.6);
    expect(p.shellIOverSigma.value).toBe(5);
  });

  test('NMR ensemble fields are read and X-ray fields are not reported for NMR', () => {
    const nmr = files.filter((f) => ours.get(f)!.method === 'nmr');
    expect(nmr.length).toBeGreaterThan(0);
    const text = readFileSync(join(FIXTURES, '2OFG.cif'), 'utf8');
    expect(/_pdbx_nmr_ensemble.conformers_submitted_total_number\s+30/.test(text)).toBe(true);
    const v = ours.get('2OFG.cif')!.values;
    expect(v.nmrConformersSubmitted).toEqual({
      value: 30,
      source: '_pdbx_nmr_ensemble.conformers_submitted_total_number',
    });
    expect(v.rFree).toBeUndefined();
  });

  test('a file without a method record but with REMARK 3 refinement reads as X-ray (5cvz_final)', () => {
    const s = ours.get('5cvz_final.pdb')!;
    expect(s.method).toBe('x-ray');
    expect(s.values.rFree.value).toBe(0.22896);
  });
});

describe('other containers', () => {
  test('BinaryCIF (gzip) gives the same values as the same entry in mmCIF text (1GBT, 3JQH)', async () => {
    for (const [bcif, cif] of [
      ['1gbt.bcif.gz', '1GBT.cif'],
      ['3jqh.bcif.gz', '3JQH.cif'],
    ]) {
      const a = await readExperimentFromBytes(
        new Uint8Array(readFileSync(join(FIXTURES, bcif))),
        bcif,
      );
      const b = await readExperimentFromText(readFileSync(join(FIXTURES, cif), 'utf8'));
      expect(a.method).toBe('x-ray');
      expect(Object.keys(a.values).length).toBeGreaterThan(10);
      // the program name is written differently in the two archive files (PHENIX vs PHENIX (phenix.refine))
      for (const [k, v] of Object.entries(b.values).filter(([k]) => k !== 'refinementProgram')) {
        // BinaryCIF stores numbers as floats: compare numerically
        if (typeof v.value === 'number')
          expect([bcif, k, a.values[k]?.value]).toEqual([bcif, k, expect.closeTo(v.value, 6)]);
        else expect([bcif, k, a.values[k]?.value]).toEqual([bcif, k, v.value]);
      }
    }
  });
});

describe('PDBx dictionary', () => {
  test('every PDBx item the reader looks at exists in mmcif_pdbx.dic', () => {
    const dic = readFileSync(DICTIONARY, 'utf8');
    const defined = new Set<string>();
    for (const m of dic.matchAll(/^save__(\S+)/gm)) defined.add(m[1].toLowerCase());
    expect(defined.size).toBeGreaterThan(1000);
    const missing = experimentItemNames().filter((n) => !defined.has(n.toLowerCase()));
    expect(missing).toEqual([]);
  });
});

describe('bad input', () => {
  test('a file that is not a structure gives an actionable error', async () => {
    await expect(readExperimentFromText('')).rejects.toThrow(/upload the model as/);
    await expect(readExperimentFromText('%PDF-1.7 binary \u0000\u0001')).rejects.toThrow(
      /neither PDBx\/mmCIF/,
    );
  });
});
