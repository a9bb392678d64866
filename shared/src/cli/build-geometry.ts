/**
 * `npm run build-geometry -w shared -- [folder] [--list names.txt] [--out file.json] [--id id]`
 *
 * Builds the side-chain ideal-geometry library (`reference/sidechain-geometry.ts`) from a folder
 * of coordinate files (default ../shared/data/reference-set, as build-reference). Node edge:
 * reads files, hashes the input list, writes JSON. Deterministic: files in sorted order,
 * canonical serialisation, so the same input gives byte-identical output.
 */
import { createHash } from 'node:crypto';
import { readFileSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { readExperimentFromBytes } from '../experiment/read';
import {
  GEOMETRY_BUILD_PARAMETERS,
  SIDECHAIN_GEOMETRY_ID,
  buildGeometryLibrary,
  collectGeometry,
  emptyGeometryObservations,
  serializeGeometryLibrary,
  type SideChainGeometryLibrary,
} from '../reference/sidechain-geometry';
import { DEFAULT_REFERENCE_FOLDER } from './build-reference';
import { readReferenceFiles } from './reference-files';
import { nodeGunzip } from './node-gunzip';
import { parseBuilderArgs } from './builder-args';

export const DEFAULT_GEOMETRY_OUT = resolve(
  __dirname,
  '../../src/reference/data/sidechain-geometry.json',
);

/**
 * SHA-256 of the sorted `name<TAB>sha256(file)` list plus the build parameters, without building:
 * the tests recompute the shipped library's input hash with it, apart from the build pass.
 */
export function geometryInputHash(folder: string, names: string[]): string {
  const list = createHash('sha256');
  for (const name of names.slice().sort()) {
    const bytes = readFileSync(join(folder, name));
    list.update(`${name}\t${createHash('sha256').update(bytes).digest('hex')}\n`);
  }
  list.update(JSON.stringify(GEOMETRY_BUILD_PARAMETERS));
  return list.digest('hex');
}

/** The file's stated high-resolution limit (refinement, else reflections), or null. */
function statedResolution(
  values: Record<string, { value: string | number | null }>,
): number | null {
  for (const key of ['refineResolutionHighA', 'resolutionHighA']) {
    const v = values[key]?.value;
    const x = typeof v === 'number' ? v : typeof v === 'string' ? Number(v) : NaN;
    if (Number.isFinite(x) && x > 0) return x;
  }
  return null;
}

export async function buildGeometryFromFolder(
  folder: string,
  options: { names?: string[]; id?: string } = {},
): Promise<{ library: SideChainGeometryLibrary; json: string }> {
  const obs = emptyGeometryObservations();
  const { sha256 } = await readReferenceFiles(
    folder,
    options.names,
    GEOMETRY_BUILD_PARAMETERS,
    async (name, bytes, s) => {
      // the header records only (PDB header / mmCIF without _atom_site)
      const exp = await readExperimentFromBytes(bytes, name, { gunzip: nodeGunzip });
      collectGeometry(s, statedResolution(exp.values), obs);
    },
  );
  const library = buildGeometryLibrary(obs, options.id ?? SIDECHAIN_GEOMETRY_ID, sha256);
  return { library, json: serializeGeometryLibrary(library) };
}

async function main(argv: string[]): Promise<void> {
  const { folder, out, names, id } = parseBuilderArgs(
    argv,
    { folder: DEFAULT_REFERENCE_FOLDER, out: DEFAULT_GEOMETRY_OUT },
    'id',
  );
  const t0 = Date.now();
  const { library, json } = await buildGeometryFromFolder(folder, { names, id });
  writeFileSync(out, json);
  const i = library.inputs;
  process.stdout.write(
    `side-chain geometry ${library.id}: ${i.filesUsed} of ${i.files} files used (${i.filesWithoutResolution} state no resolution, ${i.filesAboveResolution} above ${GEOMETRY_BUILD_PARAMETERS.resolutionMaxA} Å), ${json.length} bytes → ${out} (${((Date.now() - t0) / 1000).toFixed(1)} s)\n`,
  );
}

if (require.main === module) {
  main(process.argv.slice(2)).catch((e: unknown) => {
    process.stderr.write(`build-geometry: ${(e as Error).message}\n`);
    process.exit(1);
  });
}
