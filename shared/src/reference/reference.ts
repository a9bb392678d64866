/**
 * A loaded reference: decoded density tables and steric maps with the lookups the verdicts
 * need. Decoding is done once per artefact and cached.
 *
 * Pure TypeScript, no Node or DOM APIs.
 */
import type { RamaClass } from '../report/types';
import type { StericKind, StericMap } from '../validation/steric';
import {
  DensityLookup,
  REFERENCE_SCHEMA,
  type ReferenceArtefact,
  decodeStericMap,
} from './artefact';
import { percentileFractions } from './density';

export interface Reference {
  id: string;
  sha256: string;
  artefact: ReferenceArtefact;
  rama: Record<RamaClass, DensityLookup>;
  rotamer: Map<string, DensityLookup>;
  steric: Record<StericKind, StericMap>;
}

const cache = new WeakMap<ReferenceArtefact, Reference>();

export function loadReference(artefact: ReferenceArtefact): Reference {
  const hit = cache.get(artefact);
  if (hit) return hit;
  if (artefact.schema !== REFERENCE_SCHEMA)
    throw new Error(
      `Reference artefact has schema '${String(artefact.schema)}', this engine reads '${REFERENCE_SCHEMA}'; rebuild it with \`npm run build-reference\`.`,
    );
  const fr = percentileFractions();
  const rama = {} as Record<RamaClass, DensityLookup>;
  for (const k of Object.keys(artefact.rama) as RamaClass[])
    rama[k] = new DensityLookup(artefact.rama[k], fr);
  const rotamer = new Map<string, DensityLookup>();
  for (const k of Object.keys(artefact.rotamer).sort())
    rotamer.set(k, new DensityLookup(artefact.rotamer[k], fr));
  const steric = {
    ala: decodeStericMap('ala', artefact.steric.ala),
    gly: decodeStericMap('gly', artefact.steric.gly),
    pro: decodeStericMap('pro', artefact.steric.pro),
  };
  const ref: Reference = {
    id: artefact.id,
    sha256: artefact.sha256,
    artefact,
    rama,
    rotamer,
    steric,
  };
  cache.set(artefact, ref);
  return ref;
}
