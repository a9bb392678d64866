// Public surface of the Foldfolio structure engine.
export * from './report/types';
export * from './model/types';
export * from './api/types';
export * from './api/workflow';
export * from './api/packages';
export * from './experiment';
// Readers, hierarchy lookups and torsions (engine I).
export * from './io/errors';
export * from './io/read';
export { DEFAULT_MAX_UNCOMPRESSED_BYTES, GunzipTooLarge } from './io/gzip';
export type { GunzipFunction } from './io/gzip';
export * from './model/conformers';
export * from './geometry/vec';
export * from './geometry/torsion';
export * from './geometry/superpose';
export * from './validation/torsions';
export * from './report/build';
export * from './report/cautions';
export { ENGINE_VERSION } from './report/version';
export { sha256Hex } from './report/sha256';
// Covalent geometry, peptides, chirality, Cβ, secondary structure, composition, ensembles,
// neighbour grid and demo models (engine geometry).
export * from './geometry/grid';
export * from './validation/covalent';
export * from './validation/peptides';
export * from './validation/chirality';
export * from './validation/composition';
export * from './validation/ensemble';
export * from './secondary/dssp';
export { buildDemoStructures, buildDemoStructure, demoSpecs, writeMmcif } from './demo/build';
export type { DemoStructure, DemoFault, DemoFaultKind, DemoSpec, DemoChainSpec } from './demo/build';
// Reference distributions, verdicts, steric maps, riding hydrogens, all-atom overlaps (engine II).
export * from './reference';
export { DensityLookup, REFERENCE_SCHEMA } from './reference/artefact';
export * from './validation/ramachandran';
export * from './validation/rotamer';
export * from './validation/steric';
export * from './validation/hydrogens';
export * from './validation/overlaps';
