/**
 * Runs the Python reference helper (gemmi + Biopython under Debian's /usr/bin/python3) once per
 * set of inputs and caches the JSON in the OS temp folder, keyed by the hash of the script and
 * the input files, so several test files of one run share it. Nothing here is committed output.
 */
import { execFileSync } from 'child_process';
import { createHash } from 'crypto';
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';

export const FIXTURES = path.join(__dirname, '..', 'fixtures');
const SCRIPT = path.join(__dirname, 'structure_reference.py');

export interface RefRow {
  chain: string;
  seq: number;
  icode: string;
  name: string;
  altloc: string;
  phi: number | null;
  psi: number | null;
  omega: number | null;
  gemmiPhi?: number | null;
  gemmiPsi?: number | null;
  gemmiOmega?: number | null;
}
export interface RefModel {
  chains: Record<string, { residues: number; atoms: number }>;
  altlocAtoms: number;
  hydrogens: number;
  kinds: { water: number; aminoAcid: number; nucleic: number };
  rows: RefRow[];
}
export interface RefEntry {
  models?: number;
  modelInfo?: RefModel[];
  modResidues?: [string, string][];
  chi?: {
    chain: string;
    seq: number;
    icode: string;
    name: string;
    chi?: (number | null)[];
    error?: string;
  }[];
  error?: string;
  chiError?: string;
}

export function referenceFor(files: string[]): Record<string, RefEntry> {
  const h = createHash('sha256');
  h.update(fs.readFileSync(SCRIPT));
  for (const f of files) h.update(f).update(fs.readFileSync(path.join(FIXTURES, f)));
  const cache = path.join(
    os.tmpdir(),
    `foldfolio-structure-ref-${h.digest('hex').slice(0, 16)}.json`,
  );
  if (fs.existsSync(cache))
    return JSON.parse(fs.readFileSync(cache, 'utf8')) as Record<string, RefEntry>;
  const out = execFileSync(
    '/usr/bin/python3',
    [SCRIPT, ...files.map((f) => path.join(FIXTURES, f))],
    {
      encoding: 'utf8',
      maxBuffer: 512 << 20,
    },
  );
  fs.writeFileSync(cache + '.tmp', out);
  fs.renameSync(cache + '.tmp', cache);
  return JSON.parse(out) as Record<string, RefEntry>;
}

/** The fixtures gemmi can read as structures (all but the bad-input files and BinaryCIF). */
export const STRUCTURE_FIXTURES = [
  '1A7G.cif',
  '1A8O.cif',
  '1A8O.pdb',
  '1AS5.cif',
  '1GBT.cif',
  '1LCD.cif',
  '1lzh.pdb.gz',
  '1pfe.cif.gz',
  '2BEG.cif',
  '2OFG.cif',
  '2XHE.cif',
  '2XHE.pdb',
  '3JQH.cif',
  '3dg1_final.cif',
  '4CUP.cif',
  '4ZHL.cif',
  '4oz7.pdb',
  '5cvz_final.pdb',
  '5i55.cif',
  '5wkd.pdb',
  '6WQA.cif',
  '7CFN.cif',
];
