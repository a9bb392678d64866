/**
 * Ideal side-chain geometry: our library (`reference/data/sidechain-geometry.json`, built by
 * `npm run build-geometry -w shared` from the reference set by Engh & Huber's method, see
 * `reference/sidechain-geometry.ts`), decoded once into per-residue arrays aligned with the
 * terms of `sidechain-topology.ts`.
 *
 * σ used for Z-scores: the library SD, but at least SIGMA_FLOOR. The library SDs come from
 * restrained refinements and are often far below Engh & Huber's (ring bonds 0.004–0.01 Å, ring
 * angles 0.2–0.5°): they measure how tightly refinement held the atoms, not how much the
 * chemistry varies, and would call ordinary differences between restraint libraries outliers.
 */
import shipped from '../../reference/data/sidechain-geometry.json';
import {
  SIDECHAIN_GEOMETRY_SCHEMA,
  type SideChainGeometryLibrary,
} from '../../reference/sidechain-geometry';
import { SIDE_CHAIN_TOPOLOGY, type SideChainTopology } from './sidechain-topology';

/**
 * Smallest σ used: the smallest σ of the Engh & Huber 2001 backbone table (ITC F (2006)
 * section 18.3.2.3, as in `engh-huber.ts`): 0.015 Å (Gly N–CA) and 1.2° (Pro N–CA–CB). No
 * side-chain term is judged more strictly than the strictest published backbone term (our
 * choice; on 1EJG at 0.54 Å the unfloored SDs gave angle RMS-Z 1.57 and 13 angle outliers,
 * these floors 1.21 and 6, backbone terms included).
 */
export const SIGMA_FLOOR = { bond: 0.015, angle: 1.2 } as const;

export interface SideChainIdeals {
  topology: SideChainTopology;
  /** per bond term of the topology: ideal (Å) and σ; NaN when the library lacks the type */
  bondIdeal: Float64Array;
  bondSigma: Float64Array;
  angleIdeal: Float64Array;
  angleSigma: Float64Array;
}

export interface LoadedSideChainLibrary {
  id: string;
  sha256: string;
  residues: ReadonlyMap<string, SideChainIdeals>;
}

const cache = new WeakMap<object, LoadedSideChainLibrary>();

export function loadSideChainLibrary(lib: SideChainGeometryLibrary): LoadedSideChainLibrary {
  const hit = cache.get(lib);
  if (hit) return hit;
  if (lib.schema !== SIDECHAIN_GEOMETRY_SCHEMA)
    throw new Error(
      `Side-chain geometry library has schema '${String(lib.schema)}', this engine reads '${SIDECHAIN_GEOMETRY_SCHEMA}'; rebuild it with \`npm run build-geometry -w shared\`.`,
    );
  const residues = new Map<string, SideChainIdeals>();
  for (const [res, topology] of SIDE_CHAIN_TOPOLOGY) {
    const fill = (
      keys: string[],
      table: Record<string, [number, number, number]> | undefined,
      floor: number,
    ): [Float64Array, Float64Array] => {
      const ideal = new Float64Array(keys.length).fill(NaN);
      const sigma = new Float64Array(keys.length).fill(NaN);
      keys.forEach((k, i) => {
        const e = table?.[k];
        if (e === undefined) return;
        ideal[i] = e[1];
        sigma[i] = Math.max(e[2], floor);
      });
      return [ideal, sigma];
    };
    const [bondIdeal, bondSigma] = fill(topology.bondKeys, lib.bonds[res], SIGMA_FLOOR.bond);
    const [angleIdeal, angleSigma] = fill(topology.angleKeys, lib.angles[res], SIGMA_FLOOR.angle);
    residues.set(res, { topology, bondIdeal, bondSigma, angleIdeal, angleSigma });
  }
  const out = { id: lib.id, sha256: lib.sha256, residues };
  cache.set(lib, out);
  return out;
}

/** The library shipped with this engine version. */
export function defaultSideChainLibrary(): LoadedSideChainLibrary {
  return loadSideChainLibrary(shipped as unknown as SideChainGeometryLibrary);
}
