/** Test helpers for the covalent-geometry, peptide, chirality and DSSP checks. */
import { execFileSync } from 'child_process';
import * as fs from 'fs';
import * as path from 'path';
import { readStructure } from '../../src/io/read';
import type { Structure } from '../../src/model/types';

export const FIXTURES = path.join(__dirname, '..', 'fixtures');
export const REFERENCE = path.join(__dirname, '..', 'reference');

export function loadFixture(name: string): Promise<Structure> {
  return readStructure(fs.readFileSync(path.join(FIXTURES, name)), name);
}

/** Runs a reference helper with Debian's python (gemmi, Biopython) and parses its JSON. */
export function runReference<T>(script: string, ...args: string[]): T {
  const out = execFileSync('/usr/bin/python3', [path.join(REFERENCE, script), ...args], {
    encoding: 'utf8',
    maxBuffer: 256 << 20,
  });
  return JSON.parse(out) as T;
}

export function residueKey(chain: string, seq: number, icode: string): string {
  return `${chain}:${seq}${icode}`;
}
