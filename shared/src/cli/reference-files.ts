/**
 * The input side of the data builders (`build-reference`, `build-geometry`; Node edge): the
 * coordinate files of a folder, each read once, parsed, and hashed into the input-list SHA-256
 * the artefacts record (`name<TAB>sha256(file)` per file in sorted order, then the build
 * parameters as JSON).
 */
import { createHash } from 'node:crypto';
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { readStructure } from '../io/read';
import type { Structure } from '../model/types';
import { nodeGunzip } from './node-gunzip';

const STRUCTURE_FILE = /\.(pdb|ent|cif|bcif)(\.gz)?$/i;

/** Sorted coordinate file names of a folder. */
export function listStructureFiles(folder: string): string[] {
  return readdirSync(folder)
    .filter((f) => STRUCTURE_FILE.test(f))
    .sort();
}

/**
 * Reads every named file of `folder` (default: all coordinate files) in sorted order, hands each
 * parsed structure to `visit`, and returns the sorted names and the input-list SHA-256 (hex).
 * A file that cannot be read stops the build with its name.
 */
export async function readReferenceFiles(
  folder: string,
  names: string[] | undefined,
  parameters: unknown,
  visit: (name: string, bytes: Uint8Array, structure: Structure) => void | Promise<void>,
): Promise<{ names: string[]; sha256: string }> {
  const sorted = (names ?? listStructureFiles(folder)).slice().sort();
  if (sorted.length === 0)
    throw new Error(
      `No coordinate files (*.pdb, *.cif, optionally .gz) found in ${folder}; pass the reference-set folder as the first argument.`,
    );
  const list = createHash('sha256');
  for (const name of sorted) {
    const buf = readFileSync(join(folder, name));
    list.update(`${name}\t${createHash('sha256').update(buf).digest('hex')}\n`);
    const bytes = new Uint8Array(buf.buffer, buf.byteOffset, buf.byteLength);
    try {
      await visit(name, bytes, await readStructure(bytes, name, { gunzip: nodeGunzip }));
    } catch (e) {
      throw new Error(
        `Could not read ${name} (${(e as Error).message}); remove it from the input list or fix the file.`,
      );
    }
  }
  list.update(JSON.stringify(parameters));
  return { names: sorted, sha256: list.digest('hex') };
}
