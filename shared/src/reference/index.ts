/**
 * The reference artefact shipped with the engine (built by `npm run build-reference` from
 * ../shared/data/reference-set and committed) and its loader.
 */
import shipped from './data/reference.json';
import type { ReferenceArtefact } from './artefact';
import { loadReference, type Reference } from './reference';

export type { Reference } from './reference';
export type { ReferenceArtefact, DensityTable } from './artefact';
export { loadReference } from './reference';

/** The reference shipped with this engine version (decoded once). */
export function defaultReference(): Reference {
  return loadReference(shipped as ReferenceArtefact);
}
