/**
 * `npm run build-reference -- [folder] [--list names.txt] [--out file.json] [--id name]`
 *
 * Builds the reference artefact from a folder of coordinate files (default
 * ../shared/data/reference-set). Node edge: reads files, hashes the input list, writes JSON.
 * Deterministic: files are processed in sorted order and the artefact is serialised canonically.
 */
import { writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import {
  BUILD_PARAMETERS,
  buildArtefact,
  collectObservations,
  emptyObservations,
  serializeArtefact,
} from '../reference/build';
import type { ReferenceArtefact } from '../reference/artefact';

export { listStructureFiles } from './reference-files';
import { readReferenceFiles } from './reference-files';
import { parseBuilderArgs } from './builder-args';

export const DEFAULT_REFERENCE_FOLDER = resolve(__dirname, '../../../../shared/data/reference-set');
export const DEFAULT_REFERENCE_OUT = resolve(__dirname, '../../src/reference/data/reference.json');

export interface BuildOptions {
  /** file names (relative to folder) to use; default: every coordinate file in the folder */
  names?: string[];
  /** id prefix; the id is `${prefix}-${files}-${sha256 first 12}` */
  idPrefix?: string;
}

export async function buildReferenceFromFolder(
  folder: string,
  options: BuildOptions = {},
): Promise<{ artefact: ReferenceArtefact; json: string }> {
  const obs = emptyObservations();
  const { names, sha256 } = await readReferenceFiles(
    folder,
    options.names,
    BUILD_PARAMETERS,
    (_name, _bytes, s) => collectObservations(s, obs),
  );
  const id = `${options.idPrefix ?? 'foldfolio-ref'}-${names.length}-${sha256.slice(0, 12)}`;
  const artefact = buildArtefact(obs, id, sha256, names.length);
  return { artefact, json: serializeArtefact(artefact) };
}

async function main(argv: string[]): Promise<void> {
  const {
    folder,
    out,
    names,
    id: idPrefix,
  } = parseBuilderArgs(
    argv,
    { folder: DEFAULT_REFERENCE_FOLDER, out: DEFAULT_REFERENCE_OUT },
    'prefix',
  );
  const t0 = Date.now();
  const { artefact, json } = await buildReferenceFromFolder(folder, { names, idPrefix });
  writeFileSync(out, json);
  process.stdout.write(
    `reference ${artefact.id}: ${artefact.inputs.files} files, ${artefact.inputs.residuesUsed} of ${artefact.inputs.residuesSeen} residues used, ${json.length} bytes → ${out} (${((Date.now() - t0) / 1000).toFixed(1)} s)\n`,
  );
}

if (require.main === module) {
  main(process.argv.slice(2)).catch((e: unknown) => {
    process.stderr.write(`build-reference: ${(e as Error).message}\n`);
    process.exit(1);
  });
}
