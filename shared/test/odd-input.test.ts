/**
 * Odd but valid input from TESTING.md: many alternate locations, an unknown residue, Unicode in
 * free text. Values are checked against gemmi (python3-gemmi) on the same synthesized files.
 */
import { execFileSync } from 'child_process';
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import { buildConformers, computeTorsions, readStructure } from '../src';
import { ResidueKind } from '../src/model/types';
import { FIXTURES } from './reference/reference';

const GEMMI_ROWS = `
import gemmi, json, math, sys
st = gemmi.read_structure(sys.argv[1])
out = []
for ch in st[0]:
    for r in ch:
        out.append({"name": r.name, "seq": r.seqid.num, "atoms": len(r),
                    "altlocs": sorted({a.altloc for a in r if a.altloc != "\\0"})})
print(json.dumps(out))
`;

function gemmiResidues(
  file: string,
): { name: string; seq: number; atoms: number; altlocs: string[] }[] {
  return JSON.parse(
    execFileSync('/usr/bin/python3', ['-c', GEMMI_ROWS, file], { encoding: 'utf8' }),
  );
}

const tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'foldfolio-odd-'));
afterAll(() => fs.rmSync(tmp, { recursive: true, force: true }));

/** 5wkd.pdb with residue 301 (ASN) repeated in `n` alternate locations, slightly shifted. */
function manyAltlocs(n: number): string {
  const ids = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789'.slice(0, n);
  const lines = fs.readFileSync(path.join(FIXTURES, '5wkd.pdb'), 'utf8').split('\n');
  const out: string[] = [];
  let done = false;
  for (const l of lines) {
    const isRes =
      (l.startsWith('ATOM') || l.startsWith('HETATM')) && l.slice(22, 26).trim() === '301';
    if (!isRes) {
      out.push(l);
      continue;
    }
    if (done) continue;
    done = true;
    const group = lines.filter((x) => x.startsWith('ATOM') && x.slice(22, 26).trim() === '301');
    for (let k = 0; k < ids.length; k++) {
      for (const g of group) {
        const x = (Number(g.slice(30, 38)) + 0.01 * k).toFixed(3).padStart(8);
        const occ = (1 / ids.length).toFixed(2).padStart(6);
        out.push(
          g.slice(0, 16) + ids[k] + g.slice(17, 30) + x + g.slice(38, 54) + occ + g.slice(60),
        );
      }
    }
  }
  return out.join('\n');
}

describe('odd but valid input', () => {
  it('a residue in 62 alternate locations: one conformer each, as gemmi sees them', async () => {
    const file = path.join(tmp, 'many-altlocs.pdb');
    fs.writeFileSync(file, manyAltlocs(62));
    const g = gemmiResidues(file);
    const s = await readStructure(fs.readFileSync(file), file);
    const m = s.models[0];
    const t = buildConformers(s, m);
    const tor = computeTorsions(s, m, t);
    const r = g.findIndex((x) => x.seq === 301);
    expect(g[r].altlocs.length).toBe(62);
    expect(t.countOfResidue[r]).toBe(62);
    for (let k = t.firstOfResidue[r]; k < t.firstOfResidue[r] + 62; k++) {
      expect(g[r].altlocs).toContain(s.strings[t.altloc[k]]);
      expect(Number.isNaN(tor.phi[k])).toBe(false);
      expect(Number.isNaN(tor.chi[k * 5])).toBe(false);
    }
    expect(m.residues.atomEnd[r] - m.residues.atomStart[r]).toBe(g[r].atoms);
  });

  it('an unknown residue name inside a chain is kept, counted and linked when peptide-bonded', async () => {
    // rename ASN 301 of 5wkd to a component no table knows (ZZX): it keeps N, CA, C and its
    // peptide bonds, so it is an amino acid of the chain (gemmi's table does not know it either)
    const text = fs
      .readFileSync(path.join(FIXTURES, '5wkd.pdb'), 'utf8')
      .split('\n')
      .map((l) =>
        l.startsWith('ATOM') && l.slice(22, 26).trim() === '301'
          ? 'HETATM' + l.slice(6, 17) + 'ZZX' + l.slice(20)
          : l,
      )
      .join('\n');
    const file = path.join(tmp, 'unknown.pdb');
    fs.writeFileSync(file, text);
    const g = gemmiResidues(file);
    const s = await readStructure(fs.readFileSync(file), file);
    const m = s.models[0];
    const r = g.findIndex((x) => x.name === 'ZZX');
    expect(r).toBeGreaterThanOrEqual(0);
    expect(s.strings[m.residues.name[r]]).toBe('ZZX');
    expect(m.residues.kind[r]).toBe(ResidueKind.Protein);
    const t = buildConformers(s, m);
    const tor = computeTorsions(s, m, t);
    expect(Number.isNaN(tor.phi[t.firstOfResidue[r + 1]])).toBe(false);
  });

  it('Unicode in free text (PDB REMARK, mmCIF title) does not disturb reading', async () => {
    const pdb =
      'REMARK   1 Modèle affiné — Δ résidus, 構造, ψ/φ ✓\n' +
      fs.readFileSync(path.join(FIXTURES, '5wkd.pdb'), 'utf8');
    const a = await readStructure(new TextEncoder().encode(pdb), 'u.pdb');
    const b = await readStructure(fs.readFileSync(path.join(FIXTURES, '5wkd.pdb')), '5wkd.pdb');
    expect(a.models[0].atoms.count).toBe(b.models[0].atoms.count);
    const cif = fs
      .readFileSync(path.join(FIXTURES, '5i55.cif'), 'utf8')
      .replace(/\n_struct\.title\s+.*\n/, "\n_struct.title 'Struktur mit Ümlauten — ψ/φ, 構造'\n");
    expect(cif).toContain('Ümlauten');
    const c = await readStructure(new TextEncoder().encode(cif), 'u.cif');
    const d = await readStructure(fs.readFileSync(path.join(FIXTURES, '5i55.cif')), '5i55.cif');
    expect(c.models[0].atoms.count).toBe(d.models[0].atoms.count);
  });
});
