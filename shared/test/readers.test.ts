/**
 * Readers checked against gemmi (python3-gemmi under /usr/bin/python3) on every real fixture,
 * cross-format identity (mmCIF vs PDB vs BinaryCIF of one entry), and bad input.
 */
import * as fs from 'fs';
import * as path from 'path';
import { gzipSync } from 'fflate';
import { readStructure, sniffStructure, StructureReadError } from '../src';
import type { Model, Structure } from '../src';
import { ResidueKind } from '../src/model/types';
import { nodeGunzip } from '../src/cli/node-gunzip';
import { FIXTURES, referenceFor, STRUCTURE_FIXTURES } from './reference/reference';
import type { RefEntry } from './reference/reference';

const read = (f: string): Promise<Structure> =>
  readStructure(fs.readFileSync(path.join(FIXTURES, f)), f);

let ref: Record<string, RefEntry>;
beforeAll(() => {
  ref = referenceFor(STRUCTURE_FIXTURES);
});

function chainsByAuth(s: Structure, m: Model): Record<string, { residues: number; atoms: number }> {
  const out: Record<string, { residues: number; atoms: number }> = {};
  for (let c = 0; c < m.chains.count; c++) {
    const id = s.strings[m.chains.authId[c]];
    const e = (out[id] ??= { residues: 0, atoms: 0 });
    e.residues += m.chains.residueEnd[c] - m.chains.residueStart[c];
    for (let r = m.chains.residueStart[c]; r < m.chains.residueEnd[c]; r++)
      e.atoms += m.residues.atomEnd[r] - m.residues.atomStart[r];
  }
  return out;
}

describe('readers agree with gemmi on every fixture', () => {
  it.each(STRUCTURE_FIXTURES)(
    '%s: models, chains, residues, atoms, altlocs, hydrogens',
    async (f) => {
      const r = ref[f];
      expect(r.error).toBeUndefined();
      const s = await read(f);
      expect(s.models.length).toBe(r.models);
      s.models.forEach((m, i) => {
        const g = r.modelInfo![i];
        expect(chainsByAuth(s, m)).toEqual(g.chains);
        let alt = 0;
        let h = 0;
        for (let a = 0; a < m.atoms.count; a++) {
          if (m.atoms.altloc[a] !== 0) alt++;
          const el = s.strings[m.atoms.element[a]];
          if (el === 'H' || el === 'D') h++;
        }
        expect(alt).toBe(g.altlocAtoms);
        expect(h).toBe(g.hydrogens);
        // waters by gemmi's Residue.is_water()
        let waters = 0;
        for (let q = 0; q < m.residues.count; q++)
          if (m.residues.kind[q] === ResidueKind.Water) waters++;
        expect(waters).toBe(g.kinds.water);
      });
    },
  );

  it.each(STRUCTURE_FIXTURES)(
    '%s: every residue gemmi tabulates as amino acid / nucleotide gets that kind',
    async (f) => {
      const s = await read(f);
      const g = ref[f].modelInfo![0];
      let protein = 0;
      let nucleic = 0;
      const m = s.models[0];
      for (let q = 0; q < m.residues.count; q++) {
        if (m.residues.kind[q] === ResidueKind.Protein) protein++;
        if (m.residues.kind[q] === ResidueKind.Nucleic) nucleic++;
      }
      // gemmi's table knows the standard and the common modified components; our kind may add
      // polymer residues gemmi does not tabulate (caps, rare modifications), never fewer.
      expect(protein).toBeGreaterThanOrEqual(g.kinds.aminoAcid);
      expect(nucleic).toBe(g.kinds.nucleic);
    },
  );

  it('maps modified residues to the parent named in _pdbx_struct_mod_residue (read by gemmi)', async () => {
    let checked = 0;
    for (const f of STRUCTURE_FIXTURES.filter((x) => x.includes('.cif'))) {
      const pairs = ref[f].modResidues ?? [];
      if (pairs.length === 0) continue;
      const s = await read(f);
      const m = s.models[0];
      for (const [comp, parent] of pairs) {
        for (let q = 0; q < m.residues.count; q++) {
          if (s.strings[m.residues.name[q]] !== comp) continue;
          expect(s.strings[m.residues.parent[q]]).toBe(parent);
          expect(m.residues.modified[q]).toBe(1);
          expect(m.residues.kind[q]).toBe(ResidueKind.Protein);
          checked++;
        }
      }
    }
    expect(checked).toBeGreaterThan(0);
  });

  it('maps MSE to MET in the PDB file through MODRES or the built-in table (1A8O.pdb)', async () => {
    const s = await read('1A8O.pdb');
    const m = s.models[0];
    let mse = 0;
    for (let q = 0; q < m.residues.count; q++) {
      if (s.strings[m.residues.name[q]] === 'MSE') {
        // wwPDB CCD: _chem_comp.mon_nstd_parent_comp_id of MSE is MET
        expect(s.strings[m.residues.parent[q]]).toBe('MET');
        mse++;
      }
    }
    expect(mse).toBeGreaterThan(0);
  });
});

/** Everything a hierarchy says, as comparable rows (coordinates rounded to the PDB's 0.001 Å). */
function flatten(s: Structure, withHet = true): string[] {
  const out: string[] = [];
  for (const m of s.models) {
    for (let q = 0; q < m.residues.count; q++) {
      const c = m.residues.chain[q];
      const head = `${m.num}|${s.strings[m.chains.authId[c]]}|${m.residues.authSeq[q]}|${s.strings[m.residues.icode[q]]}|${s.strings[m.residues.name[q]]}|${s.strings[m.residues.parent[q]]}|${m.residues.kind[q]}`;
      for (let a = m.residues.atomStart[q]; a < m.residues.atomEnd[q]; a++) {
        out.push(
          `${head}|${s.strings[m.atoms.name[a]]}|${s.strings[m.atoms.altloc[a]]}|${s.strings[m.atoms.element[a]]}|` +
            `${m.atoms.x[a].toFixed(3)}|${m.atoms.y[a].toFixed(3)}|${m.atoms.z[a].toFixed(3)}|${m.atoms.occupancy[a].toFixed(2)}|${m.atoms.bIso[a].toFixed(2)}|${withHet ? m.atoms.hetatm[a] : '-'}|${m.atoms.charge[a]}`,
        );
      }
    }
  }
  return out;
}

describe('the mmCIF _atom_site fast path', () => {
  const cifs = STRUCTURE_FIXTURES.filter((f) => f.includes('.cif'));
  it.each(cifs)('%s: identical to reading every item through Mol*', async (f) => {
    const bytes = fs.readFileSync(path.join(FIXTURES, f));
    const fast = await readStructure(bytes, f);
    const slow = await readStructure(bytes, f, { cifFastPath: false });
    expect(flatten(fast)).toEqual(flatten(slow));
    expect(fast.entities).toEqual(slow.entities);
    expect(fast.id).toBe(slow.id);
    for (let i = 0; i < fast.models.length; i++) {
      const a = fast.models[i];
      const b = slow.models[i];
      expect(Array.from(a.residues.labelSeq)).toEqual(Array.from(b.residues.labelSeq));
      expect(Array.from(a.residues.labelAsym, (x) => fast.strings[x])).toEqual(
        Array.from(b.residues.labelAsym, (x) => slow.strings[x]),
      );
      expect(Array.from(a.atoms.serial)).toEqual(Array.from(b.atoms.serial));
      expect(Array.from(a.chains.entity, (x) => fast.strings[x])).toEqual(
        Array.from(b.chains.entity, (x) => slow.strings[x]),
      );
    }
  });

  it('a damaged value in _atom_site names its line in the original file', async () => {
    const lines = fs.readFileSync(path.join(FIXTURES, '1A8O.cif'), 'utf8').split('\n');
    const i = lines.findIndex((l) => l.startsWith('ATOM')) + 10;
    lines[i] = lines[i].replace(/ (-?\d+\.\d+) /, ' 1x.5 ');
    const e = await (async () => {
      try {
        await readStructure(new TextEncoder().encode(lines.join('\n')), 'bad.cif');
      } catch (err) {
        return err as StructureReadError;
      }
      throw new Error('read without error');
    })();
    expect(e).toBeInstanceOf(StructureReadError);
    expect(e.line).toBe(i + 1);
    expect(e.message).toMatch(/Cartn_x/);
  });

  it('a Mol* parse error after the _atom_site loop keeps the line number of the original file', async () => {
    const text = fs.readFileSync(path.join(FIXTURES, '1A8O.cif'), 'utf8');
    const lines = text.split('\n');
    // an unterminated multi-line text field after the coordinates
    const at = lines.length - 2;
    lines.splice(at, 0, ';broken text field never closed');
    const bytes = new TextEncoder().encode(lines.join('\n'));
    let err: StructureReadError | undefined;
    try {
      await readStructure(bytes, 'bad.cif');
    } catch (e) {
      err = e as StructureReadError;
    }
    const slow = await readStructure(bytes, 'bad.cif', { cifFastPath: false }).then(
      () => undefined,
      (e: StructureReadError) => e,
    );
    expect(err).toBeInstanceOf(StructureReadError);
    expect(slow).toBeInstanceOf(StructureReadError);
    expect(err!.line).toBe(slow!.line);
  });
});

describe('one entry, several formats, one hierarchy', () => {
  // The ATOM/HETATM flag is compared only between mmCIF and BinaryCIF: 1A8O.cif writes its MSE
  // residues as ATOM while 1A8O.pdb writes them as HETATM (the files themselves differ).
  it.each([
    ['1A8O.cif', '1A8O.pdb', false],
    ['2XHE.cif', '2XHE.pdb', false],
    ['1GBT.cif', '1gbt.bcif.gz', true],
    ['3JQH.cif', '3jqh.bcif.gz', true],
  ])('%s and %s give identical hierarchies', async (a, b, het) => {
    const sa = await read(a);
    const sb = await read(b);
    const fa = flatten(sa, het);
    const fb = flatten(sb, het);
    expect(fa.length).toBeGreaterThan(200);
    expect(fb).toEqual(fa);
  });

  it('sniffs the format from content, not the name', () => {
    const cif = fs.readFileSync(path.join(FIXTURES, '1A8O.cif'));
    expect(sniffStructure(cif, 'model.pdb').format).toBe('mmcif');
    const pdb = fs.readFileSync(path.join(FIXTURES, '1A8O.pdb'));
    expect(sniffStructure(pdb, 'model.cif').format).toBe('pdb');
    // files from hydrogen-adding programs start with USER records (wwPDB format 3.3 + USER)
    const user = new TextEncoder().encode(
      'USER  MOD reduce added hydrogens\n' + pdb.toString('latin1'),
    );
    expect(sniffStructure(user, 'x').format).toBe('pdb');
    const bcif = sniffStructure(fs.readFileSync(path.join(FIXTURES, '1gbt.bcif.gz')));
    expect(bcif.format).toBe('bcif');
    expect(bcif.gzip).toBe(true);
  });
});

describe('bad input gets a clear error, never a partial structure', () => {
  async function failure(
    bytes: Uint8Array,
    name: string,
    options = {},
  ): Promise<StructureReadError> {
    try {
      await readStructure(bytes, name, options);
    } catch (e) {
      expect(e).toBeInstanceOf(StructureReadError);
      return e as StructureReadError;
    }
    throw new Error(`${name} was read without an error`);
  }

  it('truncated mmCIF names the line', async () => {
    const text = fs.readFileSync(path.join(FIXTURES, '1GBT.cif'), 'utf8');
    // cut in the middle of an _atom_site row
    const cut = text.indexOf('ATOM', Math.floor(text.length * 0.6)) + 30;
    // (a final newline added, so the parser itself must notice the row is incomplete)
    const e = await failure(new TextEncoder().encode(text.slice(0, cut) + '\n'), '1GBT-cut.cif');
    // the fast _atom_site scanner names the incomplete row's line
    expect(e.line).toBe(text.slice(0, cut).split('\n').length);
    expect(e.message).toMatch(/cut short/);
    expect(e.message).toMatch(/upload/);
    // and Mol*'s parser, reading the same bytes, reports the damage too
    const m = await failure(new TextEncoder().encode(text.slice(0, cut) + '\n'), '1GBT-cut.cif', {
      cifFastPath: false,
    });
    expect(m.line).toBeGreaterThan(100);
    expect(m.message).toMatch(/could not be parsed at line \d+/);
  });

  it('truncated mmCIF cut inside the last value of a row (would parse) names the last line', async () => {
    const text = fs.readFileSync(path.join(FIXTURES, '1GBT.cif'), 'utf8');
    // cut just before the newline ending an _atom_site row: every column is still there
    const rowEnd = text.indexOf('\n', text.indexOf('ATOM', Math.floor(text.length * 0.5)));
    const cut = text.slice(0, rowEnd - 1);
    const e = await failure(new TextEncoder().encode(cut), '1GBT-cut.cif');
    expect(e.line).toBe(cut.split('\n').length);
    expect(e.message).toMatch(/cut short/);
  });

  it('truncated BinaryCIF', async () => {
    const gz = fs.readFileSync(path.join(FIXTURES, '1gbt.bcif.gz'));
    const raw = (await import('zlib')).gunzipSync(gz);
    const e = await failure(raw.subarray(0, Math.floor(raw.length * 0.7)), '1gbt.bcif');
    expect(e.message).toMatch(/BinaryCIF/);
  });

  it('pdb1gdr.ent: malformed charge column reported with its line', async () => {
    const e = await failure(fs.readFileSync(path.join(FIXTURES, 'pdb1gdr.ent')), 'pdb1gdr.ent');
    // the first ATOM record of the file is line 108 and carries "09" in columns 79–80
    const lines = fs.readFileSync(path.join(FIXTURES, 'pdb1gdr.ent'), 'utf8').split('\n');
    const first = lines.findIndex((l) => l.startsWith('ATOM')) + 1;
    expect(e.line).toBe(first);
    expect(e.message).toContain(`Line ${first}`);
    expect(e.message).toMatch(/charge/);
  });

  it('5moo_header.pdb: a header without atoms', async () => {
    const e = await failure(
      fs.readFileSync(path.join(FIXTURES, '5moo_header.pdb')),
      '5moo_header.pdb',
    );
    expect(e.message).toMatch(/no atom records/);
  });

  it('an empty file', async () => {
    const e = await failure(new Uint8Array(0), 'empty.cif');
    expect(e.message).toMatch(/empty/);
  });

  it('random bytes', async () => {
    // deterministic pseudo-random bytes (LCG, Numerical Recipes constants)
    const bytes = new Uint8Array(5000);
    let v = 12345;
    for (let i = 0; i < bytes.length; i++) {
      v = (Math.imul(v, 1664525) + 1013904223) >>> 0;
      bytes[i] = v >>> 24;
    }
    const e = await failure(bytes, 'noise.bin');
    expect(e.message).toMatch(/not a coordinate file/);
  });

  it('a gzip bomb stops at the size limit', async () => {
    const bomb = gzipSync(new Uint8Array(20 * 1024 * 1024), { level: 9 });
    expect(bomb.length).toBeLessThan(100 * 1024);
    const e = await failure(bomb, 'bomb.pdb.gz', { maxUncompressedBytes: 1024 * 1024 });
    expect(e.message).toMatch(/expands to more than 1048576 bytes/);
  });

  it('a gzip bomb stops at the size limit with the Node zlib gunzip too', async () => {
    const bomb = gzipSync(new Uint8Array(20 * 1024 * 1024), { level: 9 });
    const e = await failure(bomb, 'bomb.pdb.gz', {
      maxUncompressedBytes: 1024 * 1024,
      gunzip: nodeGunzip,
    });
    expect(e.message).toMatch(/expands to more than 1048576 bytes/);
    // and the same file under the limit is read through zlib: identical to the pure-JS path
    const gz = fs.readFileSync(path.join(FIXTURES, '1pfe.cif.gz'));
    const a = await readStructure(gz, '1pfe.cif.gz', { gunzip: nodeGunzip });
    const b = await readStructure(gz, '1pfe.cif.gz');
    expect(flatten(a)).toEqual(flatten(b));
  });

  it('a damaged gzip stream', async () => {
    const gz = fs.readFileSync(path.join(FIXTURES, '1pfe.cif.gz'));
    const e = await failure(gz.subarray(0, Math.floor(gz.length / 2)), '1pfe.cif.gz');
    expect(e.item).toBe('gzip');
    const z = await failure(gz.subarray(0, Math.floor(gz.length / 2)), '1pfe.cif.gz', {
      gunzip: nodeGunzip,
    });
    expect(z.item).toBe('gzip');
  });

  it('a PDB ATOM record with letters in the coordinates names the line', async () => {
    const text = fs.readFileSync(path.join(FIXTURES, '5wkd.pdb'), 'utf8').split('\n');
    const i = text.findIndex((l) => l.startsWith('ATOM'));
    text[i] = text[i].slice(0, 30) + '   1x.000' + text[i].slice(39);
    const e = await failure(new TextEncoder().encode(text.join('\n')), 'bad.pdb');
    expect(e.line).toBe(i + 1);
  });
});
