/**
 * Reads experimental statistics from an uploaded file: PDBx/mmCIF items (text or BinaryCIF)
 * or the legacy PDB header (REMARK 2/3/200/210, CRYST1, EXPDTA). Every value keeps its source.
 */
import { CIF } from 'molstar/lib/commonjs/mol-io/reader/cif';
import type { CifBlock, CifField } from 'molstar/lib/commonjs/mol-io/reader/cif/data-model';
import type { ExperimentalValue } from '../report/types';
import { sniffStructure, type ReadOptions } from '../io/read';
import { scanAtomSite } from '../io/cif-atom-site';
import { EXPERIMENT_FIELDS, type ExperimentMethod } from './fields';

export interface ExperimentalStats {
  method: ExperimentMethod;
  /** keyed by EXPERIMENT_FIELDS keys; absent when the file does not state it */
  values: Record<string, ExperimentalValue>;
}

export class ExperimentReadError extends Error {}

/** Maps a PDBx `_exptl.method` / PDB EXPDTA text to our method word. */
export function methodFromText(text: string | null | undefined): ExperimentMethod {
  const t = (text ?? '').toUpperCase();
  if (t.includes('X-RAY')) return 'x-ray';
  if (t.includes('NEUTRON')) return 'neutron';
  if (t.includes('ELECTRON MICROSCOPY') || t.includes('CRYO')) return 'electron-microscopy';
  if (t.includes('NMR')) return 'nmr';
  return 'unknown';
}

function present(field: CifField | undefined, row: number): boolean {
  // valueKind 0 = present; 1 = '.', 2 = '?' (molstar Column.ValueKind)
  return !!field && row < field.rowCount && field.valueKind(row) === 0;
}

function fieldOf(block: CifBlock, item: string): CifField | undefined {
  const dot = item.indexOf('.');
  const cat = block.categories[item.slice(0, dot)];
  return cat?.getField(item.slice(dot + 1));
}

/** Row of `_reflns_shell` with the smallest d_res_high: the highest-resolution shell. */
function highestShellRow(block: CifBlock): number {
  const f = fieldOf(block, 'reflns_shell.d_res_high');
  if (!f) return 0;
  let best = 0;
  let bestD = Infinity;
  for (let r = 0; r < f.rowCount; r++) {
    if (!present(f, r)) continue;
    const d = f.float(r);
    if (d < bestD) {
      bestD = d;
      best = r;
    }
  }
  return best;
}

function toValue(raw: string, kind: 'number' | 'string'): string | number | null {
  const s = raw.trim();
  if (
    s === '' ||
    s === '?' ||
    s === '.' ||
    s.toUpperCase() === 'NULL' ||
    s.toUpperCase() === 'NONE'
  )
    return null;
  if (kind === 'number') {
    const n = Number(s);
    return Number.isFinite(n) ? n : null;
  }
  return s;
}

export function readExperimentFromCifBlock(block: CifBlock): ExperimentalStats {
  const methodField = fieldOf(block, 'exptl.method');
  const method = methodFromText(present(methodField, 0) ? methodField!.str(0) : null);
  const values: Record<string, ExperimentalValue> = {};
  const shellRow = highestShellRow(block);
  for (const def of EXPERIMENT_FIELDS) {
    if (def.methods && method !== 'unknown' && !def.methods.includes(method)) continue;
    for (const item of def.items) {
      const f = fieldOf(block, item);
      const row = def.shell ? shellRow : 0;
      if (!present(f, row)) continue;
      const v = toValue(f!.str(row), def.kind);
      if (v === null) continue;
      values[def.key] = { value: v, source: `_${item}` };
      break;
    }
  }
  if (!values.refinementProgram) {
    // `_software` rows classified "refinement" name the program when `_computing` is absent
    const name = fieldOf(block, 'software.name');
    const cls = fieldOf(block, 'software.classification');
    if (name && cls) {
      for (let r = 0; r < name.rowCount; r++) {
        if (present(cls, r) && cls.str(r).toLowerCase() === 'refinement' && present(name, r)) {
          values.refinementProgram = { value: name.str(r), source: '_software.name' };
          break;
        }
      }
    }
  }
  return { method, values };
}

interface RemarkRule {
  key: string;
  remark: number;
  /** matched against the text after "REMARK nnn" up to the colon */
  label: RegExp;
}

// Labels as printed by the wwPDB's legacy format (PDB File Format v3.3 REMARK 2/3/200/210).
const REMARK_RULES: RemarkRule[] = [
  { key: 'refineResolutionHighA', remark: 3, label: /^RESOLUTION RANGE HIGH/ },
  { key: 'refineResolutionLowA', remark: 3, label: /^RESOLUTION RANGE LOW/ },
  { key: 'reflectionsRefinement', remark: 3, label: /^NUMBER OF REFLECTIONS$/ },
  { key: 'refineCompletenessPct', remark: 3, label: /^COMPLETENESS (FOR RANGE|\(WORKING\+TEST\))/ },
  { key: 'rWork', remark: 3, label: /^R VALUE +\(WORKING SET\)$/ },
  { key: 'rFree', remark: 3, label: /^FREE R VALUE$/ },
  { key: 'reflectionsFree', remark: 3, label: /^FREE R VALUE TEST SET COUNT$/ },
  { key: 'bMeanRefined', remark: 3, label: /^MEAN B VALUE/ },
  { key: 'wilsonB', remark: 3, label: /^FROM WILSON PLOT/ },
  { key: 'refinementProgram', remark: 3, label: /^PROGRAM$/ },
  { key: 'reflectionsUnique', remark: 200, label: /^NUMBER OF UNIQUE REFLECTIONS$/ },
  { key: 'resolutionHighA', remark: 200, label: /^RESOLUTION RANGE HIGH/ },
  { key: 'resolutionLowA', remark: 200, label: /^RESOLUTION RANGE LOW/ },
  { key: 'completenessPct', remark: 200, label: /^COMPLETENESS FOR RANGE/ },
  { key: 'multiplicity', remark: 200, label: /^DATA REDUNDANCY$/ },
  { key: 'rMerge', remark: 200, label: /^R MERGE +\(I\)$/ },
  { key: 'rMerge', remark: 200, label: /^R SYM +\(I\)$/ },
  { key: 'iOverSigma', remark: 200, label: /^<I\/SIGMA\(I\)> FOR THE DATA SET$/ },
  { key: 'shellResolutionHighA', remark: 200, label: /^HIGHEST RESOLUTION SHELL, RANGE HIGH/ },
  { key: 'shellResolutionLowA', remark: 200, label: /^HIGHEST RESOLUTION SHELL, RANGE LOW/ },
  { key: 'shellCompletenessPct', remark: 200, label: /^COMPLETENESS FOR SHELL/ },
  { key: 'shellMultiplicity', remark: 200, label: /^DATA REDUNDANCY IN SHELL$/ },
  { key: 'shellRMerge', remark: 200, label: /^R MERGE FOR SHELL +\(I\)$/ },
  { key: 'shellRMerge', remark: 200, label: /^R SYM FOR SHELL +\(I\)$/ },
  { key: 'shellIOverSigma', remark: 200, label: /^<I\/SIGMA\(I\)> FOR SHELL$/ },
  { key: 'wavelengthA', remark: 200, label: /^WAVELENGTH OR RANGE/ },
  { key: 'beamline', remark: 200, label: /^BEAMLINE$/ },
  { key: 'nmrTemperatureK', remark: 210, label: /^TEMPERATURE/ },
  { key: 'nmrPH', remark: 210, label: /^PH$/ },
];

export function readExperimentFromPdb(text: string): ExperimentalStats {
  const values: Record<string, ExperimentalValue> = {};
  let method: ExperimentMethod = 'unknown';
  const kinds = new Map(EXPERIMENT_FIELDS.map((f) => [f.key, f.kind]));
  const lines = text.split(/\r?\n/);
  for (const line of lines) {
    const rec = line.slice(0, 6);
    if (rec === 'EXPDTA' && method === 'unknown') {
      method = methodFromText(line.slice(10));
    } else if (rec === 'CRYST1' && line.length >= 54) {
      const cell: [string, number, number][] = [
        ['cellA', 6, 15],
        ['cellB', 15, 24],
        ['cellC', 24, 33],
        ['cellAlpha', 33, 40],
        ['cellBeta', 40, 47],
        ['cellGamma', 47, 54],
      ];
      for (const [key, a, b] of cell) {
        const v = toValue(line.slice(a, b), 'number');
        if (v !== null) values[key] = { value: v, source: 'CRYST1' };
      }
      const sg = line.slice(55, 66).trim();
      if (sg) values.spaceGroup = { value: sg, source: 'CRYST1' };
    } else if (rec === 'REMARK') {
      const num = Number(line.slice(6, 10));
      const body = line.slice(11);
      if (num === 2) {
        const m = /RESOLUTION\.\s+([0-9.]+)\s+ANGSTROM/.exec(body);
        if (m && !values.refineResolutionHighA)
          values.resolutionRemark2 = { value: Number(m[1]), source: 'REMARK 2' };
        continue;
      }
      const colon = body.indexOf(':');
      if (colon < 0) continue;
      const label = body.slice(0, colon).trim().replace(/\s+/g, ' ').replace(/ \(/g, ' (');
      const raw = body.slice(colon + 1);
      for (const rule of REMARK_RULES) {
        if (rule.remark !== num || values[rule.key]) continue;
        // compare with runs of spaces collapsed so alignment differences do not matter
        if (!rule.label.test(label.replace(/ +/g, ' ')) && !rule.label.test(label)) continue;
        const v = toValue(raw, kinds.get(rule.key) ?? 'string');
        if (v === null) continue;
        values[rule.key] = { value: v, source: `REMARK ${num} '${label}'` };
      }
    }
  }
  // REMARK 2 carries the resolution when REMARK 3 does not
  const r2 = values.resolutionRemark2;
  delete values.resolutionRemark2;
  if (r2 && !values.refineResolutionHighA) values.refineResolutionHighA = r2;
  if (method === 'unknown' && (values.rWork || values.rFree || values.refineResolutionHighA)) {
    // a refinement against diffraction data without an EXPDTA record (e.g. an author's file)
    method = 'x-ray';
  }
  return { method, values };
}

function looksLikePdb(text: string): boolean {
  return (
    /^(HEADER|REMARK|CRYST1|ATOM {2}|HETATM|MODEL |EXPDTA|TITLE |COMPND)/m.test(
      text.slice(0, 4000),
    ) && !/^data_/m.test(text.slice(0, 4000))
  );
}

/** Text input: PDBx/mmCIF or legacy PDB, detected from the content. */
export async function readExperimentFromText(text: string): Promise<ExperimentalStats> {
  if (looksLikePdb(text)) return readExperimentFromPdb(text);
  if (!/^\s*data_/m.test(text.slice(0, 65536))) {
    throw new ExperimentReadError(
      'The file is neither PDBx/mmCIF (no data_ block) nor a PDB file (no HEADER, REMARK, CRYST1 or ATOM records); upload the model as .cif, .bcif or .pdb.',
    );
  }
  const parsed = await CIF.parse(text).run();
  if (parsed.isError) {
    throw new ExperimentReadError(
      `The file could not be read as PDBx/mmCIF (${parsed.toString()}); check that it is a complete mmCIF or PDB file and upload it again.`,
    );
  }
  const block = parsed.result.blocks[0];
  if (!block)
    throw new ExperimentReadError(
      'The mmCIF file has no data block; upload a complete PDBx/mmCIF file.',
    );
  return readExperimentFromCifBlock(block);
}

/** BinaryCIF input (already decompressed). */
export async function readExperimentFromBinaryCif(bytes: Uint8Array): Promise<ExperimentalStats> {
  const parsed = await CIF.parseBinary(bytes).run();
  if (parsed.isError) {
    throw new ExperimentReadError(
      `The BinaryCIF file could not be read (${parsed.toString()}); upload the mmCIF text instead.`,
    );
  }
  const block = parsed.result.blocks[0];
  if (!block)
    throw new ExperimentReadError('The BinaryCIF file has no data block; upload a complete file.');
  return readExperimentFromCifBlock(block);
}

/** The report's `experiment` record (method separately in `report.method`). */
export function experimentRecord(stats: ExperimentalStats): Record<string, ExperimentalValue> {
  const out: Record<string, ExperimentalValue> = {};
  for (const k of Object.keys(stats.values).sort()) out[k] = stats.values[k];
  return out;
}

/** Byte offset of the first coordinate record of a PDB file (headers always precede it). */
function pdbHeaderEnd(b: Uint8Array): number {
  // Byte scan for the usual all-ASCII header: the same answer as the text search below without
  // decoding up to 4 MB per file (a tenth of the experiment step's time on the reference set).
  const limit = Math.min(b.length, 1 << 22);
  for (let i = 0; i < limit; i++) {
    const c = b[i];
    if (c >= 0x80) return pdbHeaderEndText(b); // non-ASCII: the decoder's byte count decides
    if ((i === 0 || b[i - 1] === 10 || b[i - 1] === 13) && i + 6 <= limit && startsRecord(b, i))
      return i;
  }
  return pdbHeaderEndText(b);
}

/** "ATOM  ", "HETATM" or "MODEL " at byte i */
function startsRecord(b: Uint8Array, i: number): boolean {
  const c0 = b[i];
  if (c0 === 65)
    // A T O M space space
    return (
      b[i + 1] === 84 && b[i + 2] === 79 && b[i + 3] === 77 && b[i + 4] === 32 && b[i + 5] === 32
    );
  if (c0 === 72)
    // H E T A T M
    return (
      b[i + 1] === 69 && b[i + 2] === 84 && b[i + 3] === 65 && b[i + 4] === 84 && b[i + 5] === 77
    );
  if (c0 === 77)
    // M O D E L space
    return (
      b[i + 1] === 79 && b[i + 2] === 68 && b[i + 3] === 69 && b[i + 4] === 76 && b[i + 5] === 32
    );
  return false;
}

function pdbHeaderEndText(b: Uint8Array): number {
  const text = new TextDecoder().decode(b.subarray(0, Math.min(b.length, 1 << 22)));
  const m = /^(ATOM {2}|HETATM|MODEL )/m.exec(text);
  return m ? new TextEncoder().encode(text.slice(0, m.index)).length : b.length;
}

/**
 * Any supported upload (mmCIF, BinaryCIF, PDB, each optionally gzip) → experimental statistics.
 * Only the records that can hold them are parsed: the PDB header before the coordinates, and an
 * mmCIF file without its `_atom_site` rows (found by the reader's byte scanner).
 */
export async function readExperimentFromBytes(
  bytes: Uint8Array,
  filenameHint = '',
  options: ReadOptions = {},
): Promise<ExperimentalStats> {
  const s = sniffStructure(bytes, filenameHint, options);
  if (s.format === 'bcif') return readExperimentFromBinaryCif(s.bytes);
  const utf8 = new TextDecoder();
  if (s.format === 'pdb')
    return readExperimentFromPdb(utf8.decode(s.bytes.subarray(0, pdbHeaderEnd(s.bytes))));
  const scan = scanAtomSite(s.bytes);
  if (scan === null) return readExperimentFromText(utf8.decode(s.bytes));
  const rest =
    utf8.decode(s.bytes.subarray(0, scan.loopStart)) + utf8.decode(s.bytes.subarray(scan.dataEnd));
  const parsed = await CIF.parse(rest).run();
  const block = parsed.isError ? undefined : parsed.result.blocks[0];
  // a file holding nothing but its atoms states no experiment
  if (block === undefined) return { method: 'unknown', values: {} };
  return readExperimentFromCifBlock(block);
}
