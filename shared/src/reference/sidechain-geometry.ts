/**
 * Our side-chain ideal-geometry library, built by Engh & Huber's method (Engh & Huber 1991,
 * Acta Cryst A47:392: the ideal value of a bond or angle type is the mean over accurately
 * determined structures, its σ the sample standard deviation). Engh & Huber averaged
 * small-molecule crystal structures; we average well-determined atoms of protein crystal
 * structures (the reference set). Pure part: observation and statistics; file reading and
 * hashing live in `src/cli/build-geometry.ts`.
 *
 * Filter (thresholds: common practice, no source): first model only; residues whose component
 * is a standard amino acid itself (modified residues are left out: their chemistry differs);
 * a term is observed only when every atom of it has occupancy 1, no altloc and B ≤ 20 Å². Files
 * that state a resolution worse than 1.2 Å are skipped; files that state none are used (the
 * reference set has its headers removed, so the per-atom filter carries the accuracy choice).
 *
 * Statistics: per term type the mean and sample SD, trimmed iteratively to ±4 SD until nothing
 * more is removed (robust against mis-modelled residues). Means and SDs are rounded to 0.001 Å /
 * 0.1°. Chemically equivalent terms are pooled (`validation/ideal/sidechain-topology.ts`).
 *
 * The same statistics are collected for backbone terms (N–CA, CA–C, C–O, N–CA–C, CA–C–O,
 * CA–CB) by the classes of `validation/ideal/engh-huber.ts`: not used by the engine, they show
 * that the method reproduces the published backbone values (see `test/sidechain-geometry.test.ts`).
 */
import type { Structure } from '../model/types';
import { ResidueKind } from '../model/types';
import { buildConformers, findAtom, stringIndex } from '../model/conformers';
import { STANDARD_AMINO_ACIDS } from '../io/residue-tables';
import { angleDeg, distanceA } from '../geometry/vec';
import { SIDE_CHAIN_TOPOLOGY } from '../validation/ideal/sidechain-topology';
import { residueClass } from '../validation/ideal/engh-huber';

export const SIDECHAIN_GEOMETRY_SCHEMA = 'foldfolio.sidechain-geometry/1';
/** The library version shipped with this engine: the id the report names. */
export const SIDECHAIN_GEOMETRY_ID = 'foldfolio-sidechain-geometry-1';

export const GEOMETRY_BUILD_PARAMETERS = {
  resolutionMaxA: 1.2, // files stating a worse resolution are skipped (common practice, no source)
  occupancyMin: 1, // every atom of a term (common practice, no source)
  bMaxA2: 20, // every atom of a term (common practice, no source)
  trimSd: 4, // iterative trimming at ±4 SD (common practice, no source)
  minCount: 30, // a term type with fewer observations is left out of the library (our choice)
  bondDigits: 3, // 0.001 Å
  angleDigits: 1, // 0.1°
} as const;

/** n, mean, sd of one term type (after trimming). */
export type TermStats = [n: number, mean: number, sd: number];

export interface SideChainGeometryLibrary {
  schema: typeof SIDECHAIN_GEOMETRY_SCHEMA;
  id: string;
  /** SHA-256 of the sorted `name<TAB>sha256(file)` input list plus the build parameters */
  sha256: string;
  parameters: typeof GEOMETRY_BUILD_PARAMETERS;
  inputs: {
    files: number;
    filesUsed: number;
    filesWithoutResolution: number;
    filesAboveResolution: number;
  };
  /** residue → term key → [n, mean, sd]; Å */
  bonds: Record<string, Record<string, TermStats>>;
  /** residue → term key → [n, mean, sd]; degrees */
  angles: Record<string, Record<string, TermStats>>;
  /** the method check: class → term → [n, mean, sd] (classes as in `engh-huber.ts`) */
  backbone: Record<string, Record<string, TermStats>>;
}

export interface GeometryObservations {
  bonds: Map<string, number[]>;
  angles: Map<string, number[]>;
  backbone: Map<string, number[]>;
  files: number;
  filesUsed: number;
  filesWithoutResolution: number;
  filesAboveResolution: number;
}

export function emptyGeometryObservations(): GeometryObservations {
  return {
    bonds: new Map(),
    angles: new Map(),
    backbone: new Map(),
    files: 0,
    filesUsed: 0,
    filesWithoutResolution: 0,
    filesAboveResolution: 0,
  };
}

function push(m: Map<string, number[]>, key: string, v: number): void {
  const a = m.get(key);
  if (a) a.push(v);
  else m.set(key, [v]);
}

/** CA–CB substitution class of the backbone table (as `caCbBond` in `engh-huber.ts`). */
function cbClass(parent: string): string {
  if (parent === 'ALA') return 'CH3';
  if (parent === 'ILE' || parent === 'THR' || parent === 'VAL') return 'CH';
  if (parent === 'PRO') return 'pro';
  return 'CH2';
}

/**
 * Add the filtered terms of one structure (first model). `resolutionA` is the file's stated
 * resolution, or null when it states none.
 */
export function collectGeometry(
  structure: Structure,
  resolutionA: number | null,
  obs: GeometryObservations,
): void {
  const P = GEOMETRY_BUILD_PARAMETERS;
  obs.files++;
  if (resolutionA === null) obs.filesWithoutResolution++;
  else if (!(resolutionA <= P.resolutionMaxA)) {
    obs.filesAboveResolution++;
    return;
  }
  const model = structure.models[0];
  if (!model) return;
  obs.filesUsed++;
  const t = buildConformers(structure, model);
  const { kind, name, parent } = model.residues;
  const { bIso, occupancy, altloc } = model.atoms;
  const S = structure.strings;
  const good = (i: number): boolean =>
    i >= 0 && altloc[i] === 0 && occupancy[i] >= P.occupancyMin && bIso[i] <= P.bMaxA2;
  const nameIdx = new Map<string, number>();
  const idx = (s: string): number => {
    let v = nameIdx.get(s);
    if (v === undefined) nameIdx.set(s, (v = stringIndex(structure, s)));
    return v;
  };
  const atoms = model.atoms;
  for (let r = 0; r < model.residues.count; r++) {
    if (kind[r] !== ResidueKind.Protein) continue;
    const par = S[parent[r]];
    if (S[name[r]] !== par || !STANDARD_AMINO_ACIDS.has(par)) continue;
    const k = t.firstOfResidue[r];
    // backbone terms (method check)
    const cls = residueClass(par);
    const n = t.n[k];
    const ca = t.ca[k];
    const c = t.c[k];
    const o = t.o[k];
    const cb = t.cb[k];
    if (good(n) && good(ca)) push(obs.backbone, `${cls}:N-CA`, distanceA(atoms, n, ca));
    if (good(ca) && good(c)) push(obs.backbone, `${cls}:CA-C`, distanceA(atoms, ca, c));
    if (good(c) && good(o)) push(obs.backbone, `${cls}:C-O`, distanceA(atoms, c, o));
    if (good(n) && good(ca) && good(c))
      push(obs.backbone, `${cls}:N-CA-C`, angleDeg(atoms, n, ca, c));
    if (good(ca) && good(c) && good(o))
      push(obs.backbone, `${cls}:CA-C-O`, angleDeg(atoms, ca, c, o));
    if (cls !== 'gly' && good(ca) && good(cb))
      push(obs.backbone, `${cbClass(par)}:CA-CB`, distanceA(atoms, ca, cb));
    // side-chain terms
    const topo = SIDE_CHAIN_TOPOLOGY.get(par);
    if (!topo) continue;
    const slots = topo.atoms.map((a) => {
      const ni = idx(a);
      const i = ni < 0 ? -1 : findAtom(model, r, ni, t.altloc[k]);
      return good(i) ? i : -1;
    });
    for (let b = 0; b < topo.bondKeys.length; b++) {
      const i = slots[topo.bondSlots[2 * b]];
      const j = slots[topo.bondSlots[2 * b + 1]];
      if (i >= 0 && j >= 0) push(obs.bonds, `${par}:${topo.bondKeys[b]}`, distanceA(atoms, i, j));
    }
    for (let a = 0; a < topo.angleKeys.length; a++) {
      const i = slots[topo.angleSlots[3 * a]];
      const j = slots[topo.angleSlots[3 * a + 1]];
      const l = slots[topo.angleSlots[3 * a + 2]];
      if (i >= 0 && j >= 0 && l >= 0)
        push(obs.angles, `${par}:${topo.angleKeys[a]}`, angleDeg(atoms, i, j, l));
    }
  }
}

/** Mean and sample SD, trimmed iteratively to ±`trimSd` SD; values in input order. */
export function trimmedStats(values: readonly number[], trimSd: number): TermStats {
  let keep = values.slice();
  for (;;) {
    const n = keep.length;
    if (n < 2) return [n, n === 1 ? keep[0] : NaN, NaN];
    let sum = 0;
    for (const v of keep) sum += v;
    const mean = sum / n;
    let ss = 0;
    for (const v of keep) ss += (v - mean) * (v - mean);
    const sd = Math.sqrt(ss / (n - 1));
    const next = keep.filter((v) => Math.abs(v - mean) <= trimSd * sd);
    if (next.length === n) return [n, mean, sd];
    keep = next;
  }
}

const roundTo = (x: number, digits: number): number => {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
};

function table(
  m: Map<string, number[]>,
  digits: (key: string) => number,
): Record<string, Record<string, TermStats>> {
  const P = GEOMETRY_BUILD_PARAMETERS;
  const out: Record<string, Record<string, TermStats>> = {};
  for (const full of [...m.keys()].sort()) {
    const values = m.get(full)!;
    const [group, key] = full.split(':');
    const [n, mean, sd] = trimmedStats(values, P.trimSd);
    if (n < P.minCount) continue;
    const d = digits(key);
    (out[group] ??= {})[key] = [n, roundTo(mean, d), roundTo(sd, d)];
  }
  return out;
}

/** The library from the observations; `id` and `sha256` come from the caller. */
export function buildGeometryLibrary(
  obs: GeometryObservations,
  id: string,
  sha256: string,
): SideChainGeometryLibrary {
  const P = GEOMETRY_BUILD_PARAMETERS;
  const isAngle = (key: string): boolean => key.split('-').length === 3;
  return {
    schema: SIDECHAIN_GEOMETRY_SCHEMA,
    id,
    sha256,
    parameters: GEOMETRY_BUILD_PARAMETERS,
    inputs: {
      files: obs.files,
      filesUsed: obs.filesUsed,
      filesWithoutResolution: obs.filesWithoutResolution,
      filesAboveResolution: obs.filesAboveResolution,
    },
    bonds: table(obs.bonds, () => P.bondDigits),
    angles: table(obs.angles, () => P.angleDigits),
    backbone: table(obs.backbone, (k) => (isAngle(k) ? P.angleDigits : P.bondDigits)),
  };
}

/** Canonical JSON: fixed key order, one term per line. */
export function serializeGeometryLibrary(lib: SideChainGeometryLibrary): string {
  const section = (t: Record<string, Record<string, TermStats>>): string =>
    '{\n' +
    Object.keys(t)
      .sort()
      .map(
        (g) =>
          `    ${JSON.stringify(g)}: {\n` +
          Object.keys(t[g])
            .sort()
            .map(
              (k) => `      ${JSON.stringify(k)}: ${JSON.stringify(t[g][k]).replace(/,/g, ', ')}`,
            )
            .join(',\n') +
          '\n    }',
      )
      .join(',\n') +
    '\n  }';
  return (
    '{\n' +
    `  "schema": ${JSON.stringify(lib.schema)},\n` +
    `  "id": ${JSON.stringify(lib.id)},\n` +
    `  "sha256": ${JSON.stringify(lib.sha256)},\n` +
    `  "parameters": ${JSON.stringify(lib.parameters).replace(/,/g, ', ')},\n` +
    `  "inputs": ${JSON.stringify(lib.inputs).replace(/,/g, ', ')},\n` +
    `  "bonds": ${section(lib.bonds)},\n` +
    `  "angles": ${section(lib.angles)},\n` +
    `  "backbone": ${section(lib.backbone)}\n` +
    '}\n'
  );
}
