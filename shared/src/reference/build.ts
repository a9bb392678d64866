/**
 * Building the reference artefact from structures (pure part; file reading and hashing live in
 * `src/cli/build-reference.ts`).
 *
 * Residue filter (Lovell et al. 2003, Proteins 50:437): skip residues with any backbone atom
 * (N, CA, C, O) B > 30 Å², any atom with occupancy < 1, alternate conformations (in the residue
 * or its backbone neighbours), chain ends and residues next to breaks. Only the first model is
 * used. Side chains additionally need every atom of the residue at B ≤ 30 Å² (our choice).
 */
import type { Structure } from '../model/types';
import { ResidueKind } from '../model/types';
import type { RamaClass } from '../report/types';
import { buildConformers } from '../model/conformers';
import { computeTorsions, MAX_CHI } from '../validation/torsions';
import { RAMA_CLASSES, ramaClassOf } from '../validation/ramachandran';
import { ROTAMER_CHI_USED, ROTAMER_SYMMETRIC } from '../validation/rotamer';
import { computeStericMap, type StericKind } from '../validation/steric';
import {
  DensityLookup,
  REFERENCE_SCHEMA,
  type DensityTable,
  type ReferenceArtefact,
  encodeLnGrid,
  toBase64,
} from './artefact';
import { DEFAULT_KDE, adaptiveKde, makeGrid, percentileFractions, quantileSorted } from './density';

export const BUILD_PARAMETERS = {
  backboneBMaxA2: 30, // Lovell et al. 2003
  occupancyMin: 1, // Lovell et al. 2003: occupancy < 1 out
  sideChainBMaxA2: 30, // our choice (same cut as the backbone)
  ramaStepDeg: 2, // SCIENCE.md: grid ≤ 2°
  rotamerStepDeg: 5, // chi grid; side-chain wells are wide (our choice)
  favoredFraction: 0.98, // Lovell et al. 2003
  allowedFraction: 0.9995, // Lovell et al. 2003
  kdeAlpha: DEFAULT_KDE.alpha, // Silverman 1986 §5.3
  kdeLambdaMin: DEFAULT_KDE.lambdaMin,
  kdeLambdaMax: DEFAULT_KDE.lambdaMax,
  kdeSigmaMinDeg: DEFAULT_KDE.sigmaMinDeg,
  kdeSigmaMaxDeg: DEFAULT_KDE.sigmaMaxDeg,
  kdeSpreadCapDeg: DEFAULT_KDE.spreadCapDeg,
  lnRange: 25, // dynamic range of the stored ln-density (e^-25 of the peak is "zero")
  stericTauDeg: 110, // classic τ (Ramachandran & Sasisekharan 1968)
  stericStepDeg: 2,
} as const;

export interface Observations {
  rama: Record<RamaClass, number[]>;
  rotamer: Record<string, number[]>;
  residuesSeen: number;
  residuesUsed: number;
}

export function emptyObservations(): Observations {
  const rama = {} as Record<RamaClass, number[]>;
  for (const c of RAMA_CLASSES) rama[c] = [];
  const rotamer: Record<string, number[]> = {};
  for (const t of Object.keys(ROTAMER_CHI_USED).sort()) rotamer[t] = [];
  return { rama, rotamer, residuesSeen: 0, residuesUsed: 0 };
}

/** Add the filtered residues of one structure (first model) to the observations. */
export function collectObservations(structure: Structure, obs: Observations): void {
  const model = structure.models[0];
  if (!model) return;
  const t = buildConformers(structure, model);
  const tor = computeTorsions(structure, model, t);
  const { kind, parent, atomStart, atomEnd } = model.residues;
  const { bIso, occupancy, altloc } = model.atoms;
  const S = structure.strings;
  const P = BUILD_PARAMETERS;
  for (let k = 0; k < t.count; k++) {
    const r = t.residue[k];
    if (kind[r] !== ResidueKind.Protein) continue;
    obs.residuesSeen++;
    if (t.countOfResidue[r] !== 1 || t.altloc[k] !== 0) continue;
    let ok = true;
    let sideOk = true;
    for (let i = atomStart[r]; i < atomEnd[r]; i++) {
      if (altloc[i] !== 0 || occupancy[i] < P.occupancyMin) ok = false;
      if (bIso[i] > P.sideChainBMaxA2) sideOk = false;
    }
    for (const a of [t.n[k], t.ca[k], t.c[k], t.o[k]])
      if (a < 0 || bIso[a] > P.backboneBMaxA2) ok = false;
    if (!ok) continue;
    const par = S[parent[r]];
    let used = false;
    const p = t.prev[k];
    const q = t.next[k];
    const phi = tor.phi[k];
    const psi = tor.psi[k];
    if (
      p >= 0 &&
      q >= 0 &&
      t.countOfResidue[t.residue[p]] === 1 &&
      t.countOfResidue[t.residue[q]] === 1 &&
      Number.isFinite(phi) &&
      Number.isFinite(psi)
    ) {
      const omegaBefore = Number.isFinite(tor.omega[p]) ? tor.omega[p] : null;
      const cls = ramaClassOf(par, omegaBefore, S[parent[t.residue[q]]]);
      obs.rama[cls].push(phi, psi);
      used = true;
    }
    const nChi = ROTAMER_CHI_USED[par];
    if (nChi && sideOk) {
      let finite = true;
      for (let j = 0; j < nChi; j++) if (!Number.isFinite(tor.chi[k * MAX_CHI + j])) finite = false;
      if (finite) {
        for (let j = 0; j < nChi; j++) obs.rotamer[par].push(tor.chi[k * MAX_CHI + j]);
        used = true;
      }
    }
    if (used) obs.residuesUsed++;
  }
}

const round6 = (x: number): number => Math.round(x * 1e6) / 1e6;

/** Density table for angle tuples; reference quantiles are read back through the stored (decoded) grid. */
export function buildDensityTable(
  points: Float64Array,
  dims: 1 | 2,
  stepDeg: number,
  weights?: Float64Array,
): DensityTable {
  const P = BUILD_PARAMETERS;
  const grid = makeGrid(dims, stepDeg);
  const kde = adaptiveKde(points, grid, DEFAULT_KDE, weights);
  let maxD = 0;
  for (const d of kde.density) if (d > maxD) maxD = d;
  const lnMax = Math.ceil(Math.log(maxD) * 1e4) / 1e4;
  const lnMin = lnMax - P.lnRange;
  const ln = new Float64Array(kde.density.length);
  for (let i = 0; i < ln.length; i++)
    ln[i] = kde.density[i] > 0 ? Math.max(lnMin, Math.log(kde.density[i])) : lnMin;
  const table: DensityTable = {
    dims,
    stepDeg,
    n: weights ? Math.round(weights.reduce((s, w) => s + w, 0)) : points.length / dims,
    pilotSigmaDeg: round6(kde.pilotSigmaDeg),
    lnMin,
    lnMax,
    grid: encodeLnGrid(ln, lnMin, lnMax),
    levels: { favored: 0, allowed: 0 },
    quantiles: [],
  };
  const fr = percentileFractions();
  const look = new DensityLookup(table, fr);
  const count = points.length / dims;
  const vals: number[] = [];
  for (let i = 0; i < count; i++) {
    vals.push(dims === 1 ? look.lnAt(points[i]) : look.lnAt(points[2 * i], points[2 * i + 1]));
  }
  const sorted = Float64Array.from(vals).sort();
  table.levels = {
    favored: quantileSorted(sorted, 1 - P.favoredFraction),
    allowed: quantileSorted(sorted, 1 - P.allowedFraction),
  };
  table.quantiles = fr.map((f) => round6(quantileSorted(sorted, f)));
  return table;
}

/** Build the artefact from observations. `id` and `sha256` come from the caller (input list hash). */
export function buildArtefact(
  obs: Observations,
  id: string,
  sha256: string,
  files: number,
): ReferenceArtefact {
  const P = BUILD_PARAMETERS;
  const rama = {} as Record<RamaClass, DensityTable>;
  for (const c of RAMA_CLASSES)
    rama[c] = buildDensityTable(Float64Array.from(obs.rama[c]), 2, P.ramaStepDeg);
  const rotamer: ReferenceArtefact['rotamer'] = {};
  for (const type of Object.keys(obs.rotamer).sort()) {
    const used = ROTAMER_CHI_USED[type];
    const raw = obs.rotamer[type];
    if (raw.length === 0) continue;
    const symmetric = ROTAMER_SYMMETRIC.has(type) && used === 2;
    let pts = Float64Array.from(raw);
    let weights: Float64Array | undefined;
    if (symmetric) {
      // Each residue at chi2 and chi2 + 180° with half weight; both copies sit at the same
      // density (the 5° grid is symmetric under a 180° shift), so both enter the quantiles.
      const n = raw.length / 2;
      pts = new Float64Array(raw.length * 2);
      weights = new Float64Array(n * 2);
      for (let i = 0; i < n; i++) {
        const c2 = raw[2 * i + 1];
        pts[4 * i] = raw[2 * i];
        pts[4 * i + 1] = c2;
        pts[4 * i + 2] = raw[2 * i];
        pts[4 * i + 3] = c2 > 0 ? c2 - 180 : c2 + 180;
        weights[2 * i] = 0.5;
        weights[2 * i + 1] = 0.5;
      }
    }
    rotamer[type] = {
      ...buildDensityTable(pts, used === 1 ? 1 : 2, P.rotamerStepDeg, weights),
      chiUsed: used,
      symmetricLastChi: symmetric,
    };
  }
  const steric = {} as ReferenceArtefact['steric'];
  for (const kind of ['ala', 'gly', 'pro'] as StericKind[]) {
    const m = computeStericMap(kind, P.stericTauDeg, P.stericStepDeg);
    steric[kind] = { tauDeg: m.tauDeg, stepDeg: m.stepDeg, size: m.size, codes: toBase64(m.codes) };
  }
  const parameters: ReferenceArtefact['parameters'] = { ...P };
  return {
    schema: REFERENCE_SCHEMA,
    id,
    sha256,
    parameters,
    inputs: { files, residuesUsed: obs.residuesUsed, residuesSeen: obs.residuesSeen },
    rama,
    rotamer,
    steric,
  };
}

/** Canonical serialisation: same artefact ⇒ same bytes. */
export function serializeArtefact(a: ReferenceArtefact): string {
  return JSON.stringify(a) + '\n';
}
