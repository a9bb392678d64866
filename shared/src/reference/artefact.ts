/**
 * The reference artefact: empirical (phi, psi) and chi densities built by
 * `npm run build-reference` from the reference set, plus the hard-sphere steric maps.
 * The JSON is small (grids as base64 uint16 log-densities) so the browser can import it too.
 *
 * Pure TypeScript, no Node or DOM APIs.
 */
import type { RamaClass } from '../report/types';
import type { StericKind, StericMap } from '../validation/steric';
import { type TorusGrid, densityAt, percentileOf } from './density';

export const REFERENCE_SCHEMA = 'foldfolio.reference/1' as const;

/** One density table (Ramachandran class or side-chain type). */
export interface DensityTable {
  dims: 1 | 2;
  stepDeg: number;
  /** reference data points used */
  n: number;
  pilotSigmaDeg: number;
  /** natural-log density (per cell, cells summing to 1) encoded as uint16 between lnMin and lnMax */
  lnMin: number;
  lnMax: number;
  grid: string;
  /** ln-density levels: at or above `favored` encloses 98 % of the reference data, `allowed` 99.95 % */
  levels: { favored: number; allowed: number };
  /** ln-density of the reference data at the fractions of `percentileFractions()` */
  quantiles: number[];
}

export interface ReferenceArtefact {
  schema: typeof REFERENCE_SCHEMA;
  /** human-readable id, e.g. 'foldfolio-ref-1100-3f2a9c1b7d04' */
  id: string;
  /** SHA-256 (hex) of the sorted input list (name + file SHA-256) and the parameters */
  sha256: string;
  parameters: Record<string, number | string | boolean>;
  inputs: { files: number; residuesUsed: number; residuesSeen: number };
  rama: Record<RamaClass, DensityTable>;
  rotamer: Record<string, DensityTable & { chiUsed: number; symmetricLastChi: boolean }>;
  steric: Record<StericKind, { tauDeg: number; stepDeg: number; size: number; codes: string }>;
}

const B64 = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';

/** Base64 (RFC 4648) without Node's Buffer or the DOM's btoa, so the engine stays portable. */
export function toBase64(bytes: Uint8Array): string {
  let out = '';
  let i = 0;
  for (; i + 2 < bytes.length; i += 3) {
    const v = (bytes[i] << 16) | (bytes[i + 1] << 8) | bytes[i + 2];
    out += B64[(v >> 18) & 63] + B64[(v >> 12) & 63] + B64[(v >> 6) & 63] + B64[v & 63];
  }
  const rest = bytes.length - i;
  if (rest === 1) {
    const v = bytes[i] << 16;
    out += B64[(v >> 18) & 63] + B64[(v >> 12) & 63] + '==';
  } else if (rest === 2) {
    const v = (bytes[i] << 16) | (bytes[i + 1] << 8);
    out += B64[(v >> 18) & 63] + B64[(v >> 12) & 63] + B64[(v >> 6) & 63] + '=';
  }
  return out;
}

const B64_INDEX = (() => {
  const t = new Int16Array(128).fill(-1);
  for (let i = 0; i < 64; i++) t[B64.charCodeAt(i)] = i;
  return t;
})();

export function fromBase64(s: string): Uint8Array {
  let len = s.length;
  while (len > 0 && s[len - 1] === '=') len--;
  const out = new Uint8Array(Math.floor((len * 3) / 4));
  let o = 0;
  let acc = 0;
  let bits = 0;
  for (let i = 0; i < len; i++) {
    const v = B64_INDEX[s.charCodeAt(i)];
    if (v < 0)
      throw new Error(
        'The reference artefact is corrupt (bad base64); rebuild it with `npm run build-reference`.',
      );
    acc = (acc << 6) | v;
    bits += 6;
    if (bits >= 8) {
      bits -= 8;
      out[o++] = (acc >> bits) & 255;
    }
  }
  return out;
}

/** Encode a density grid as uint16 ln-values (little-endian) between lnMin and lnMax. */
export function encodeLnGrid(lnValues: Float64Array, lnMin: number, lnMax: number): string {
  const bytes = new Uint8Array(lnValues.length * 2);
  const span = lnMax - lnMin;
  for (let i = 0; i < lnValues.length; i++) {
    const q = Math.max(0, Math.min(65535, Math.round(((lnValues[i] - lnMin) / span) * 65535)));
    bytes[2 * i] = q & 255;
    bytes[2 * i + 1] = q >> 8;
  }
  return toBase64(bytes);
}

export function decodeLnGrid(b64: string, lnMin: number, lnMax: number): Float64Array {
  const bytes = fromBase64(b64);
  const out = new Float64Array(bytes.length / 2);
  const span = lnMax - lnMin;
  for (let i = 0; i < out.length; i++)
    out[i] = lnMin + ((bytes[2 * i] | (bytes[2 * i + 1] << 8)) / 65535) * span;
  return out;
}

/** A decoded density table, ready for lookups. */
export class DensityLookup {
  readonly grid: TorusGrid;
  readonly lnDensity: Float64Array;
  constructor(
    readonly table: DensityTable,
    readonly fractions: readonly number[],
  ) {
    this.grid = { dims: table.dims, stepDeg: table.stepDeg, size: Math.round(360 / table.stepDeg) };
    this.lnDensity = decodeLnGrid(table.grid, table.lnMin, table.lnMax);
  }
  /** interpolated ln-density at angles (degrees) */
  lnAt(a: number, b = 0): number {
    return densityAt(this.lnDensity, this.grid, a, b);
  }
  /** percentile (0–100) of a ln-density among the reference data */
  percentile(ln: number): number {
    return percentileOf(ln, this.fractions, this.table.quantiles);
  }
}

export function decodeStericMap(
  kind: StericKind,
  s: ReferenceArtefact['steric'][StericKind],
): StericMap {
  return { kind, tauDeg: s.tauDeg, stepDeg: s.stepDeg, size: s.size, codes: fromBase64(s.codes) };
}
