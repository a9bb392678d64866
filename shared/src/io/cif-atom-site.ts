/**
 * Fast path for the `_atom_site` loop of PDBx/mmCIF text: a byte-level scanner that reads the
 * loop's rows straight into the builder (no string or object per value), while Mol*'s parser
 * reads the rest of the file (entities, modifications, experiment). Large models are almost all
 * `_atom_site`; this halves their read time. The scanner declines (returns null) on anything it
 * does not handle — multi-line `;` values inside the loop, a non-loop `_atom_site` — and the
 * caller then uses Mol* for the whole file, so both paths give the same hierarchy (tested).
 */
import { NO_LABEL_SEQ, StructureBuilder } from './builder';
import { StructureReadError } from './errors';

export interface AtomSiteScan {
  /** byte offset of the `loop_` line that opens the table */
  loopStart: number;
  /** first byte of the rows and the end of the rows (start of the line that ends the loop) */
  dataStart: number;
  dataEnd: number;
  /** 1-based line number of the first row byte */
  dataLine: number;
  fields: string[];
}

const NL = 10;
/** 1 for CIF whitespace bytes (space, tab, LF, CR) */
const WS = new Uint8Array(256);
WS[32] = WS[9] = WS[10] = WS[13] = 1;
const CR = 13;
const SP = 32;
const TAB = 9;

function lineEndOf(b: Uint8Array, p: number): number {
  const e = b.indexOf(NL, p);
  return e < 0 ? b.length : e;
}

function startsWithAt(b: Uint8Array, p: number, word: string): boolean {
  if (p + word.length > b.length) return false;
  for (let k = 0; k < word.length; k++) if (b[p + k] !== word.charCodeAt(k)) return false;
  return true;
}

function trimmedLine(b: Uint8Array, p: number, e: number): string {
  let s = '';
  for (let i = p; i < e; i++) s += String.fromCharCode(b[i]);
  return s.trim();
}

/** Locate the `_atom_site` loop; null when absent or in a form the fast path leaves to Mol*. */
export function scanAtomSite(b: Uint8Array): AtomSiteScan | null {
  let p = 0;
  let line = 1;
  let prevLoop = -1; // start of the last `loop_` line seen with nothing but comments after it
  while (p < b.length) {
    const e = lineEndOf(b, p);
    if (startsWithAt(b, p, '_atom_site.')) {
      if (prevLoop < 0) return null;
      const fields: string[] = [];
      let q = p;
      while (q < b.length && startsWithAt(b, q, '_atom_site.')) {
        const qe = lineEndOf(b, q);
        const name = trimmedLine(b, q + 11, qe);
        if (name === '' || /\s/.test(name)) return null; // a value on the name line: not a loop header
        fields.push(name);
        q = qe + 1;
        line++;
      }
      const dataStart = q;
      const dataLine = line;
      // rows run until a line starting a new item, loop, block or comment
      while (q < b.length) {
        const c = b[q];
        if (
          c === 35 /* # */ ||
          c === 95 /* _ */ ||
          startsWithAt(b, q, 'loop_') ||
          startsWithAt(b, q, 'data_') ||
          startsWithAt(b, q, 'save_')
        )
          break;
        if (c === 59 /* ; */) return null; // multi-line text value: leave to Mol*
        q = lineEndOf(b, q) + 1;
      }
      return { loopStart: prevLoop, dataStart, dataEnd: Math.min(q, b.length), dataLine, fields };
    }
    const c = b[p];
    if (startsWithAt(b, p, 'loop_')) prevLoop = p;
    else if (c !== 35 && c !== SP && c !== TAB && c !== NL && c !== CR && p !== e) prevLoop = -1;
    p = e + 1;
    line++;
  }
  return null;
}

/** Interns byte ranges: ≤ 4 ASCII bytes through a packed integer key, longer ones as strings. */
class ByteInterner {
  private readonly short: Map<number, number>[] = [
    new Map(),
    new Map(),
    new Map(),
    new Map(),
    new Map(),
  ];
  constructor(
    private readonly b: StructureBuilder,
    private readonly decode: (u: Uint8Array) => string,
    private readonly upper: boolean,
  ) {}
  get(buf: Uint8Array, s: number, e: number): number {
    const n = e - s;
    if (n <= 4) {
      let k = 0;
      let ascii = true;
      for (let i = s; i < e; i++) {
        const c = buf[i];
        if (c > 127) ascii = false;
        k = (k << 7) | c;
      }
      if (ascii) {
        const m = this.short[n];
        let v = m.get(k);
        if (v === undefined) {
          v = this.b.intern(this.text(buf, s, e));
          m.set(k, v);
        }
        return v;
      }
    }
    return this.b.intern(this.text(buf, s, e));
  }
  private text(buf: Uint8Array, s: number, e: number): string {
    const t = this.decode(buf.subarray(s, e));
    return this.upper ? t.toUpperCase() : t;
  }
}

const POW10 = [1, 10, 100, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15];

/** Decimal number from bytes (optionally with exponent); NaN when malformed. */
function parseNumber(buf: Uint8Array, s: number, e: number): number {
  let i = s;
  let neg = false;
  if (buf[i] === 45) {
    neg = true;
    i++;
  } else if (buf[i] === 43) i++;
  let v = 0;
  let digits = 0;
  let frac = -1;
  for (; i < e; i++) {
    const c = buf[i];
    if (c >= 48 && c <= 57) {
      v = v * 10 + (c - 48);
      digits++;
      if (frac >= 0) frac++;
    } else if (c === 46 && frac < 0) frac = 0;
    else break;
  }
  if (digits === 0) return NaN;
  if (i < e || digits > 15) {
    // exponent, parenthesised uncertainty or very long digits: the general parser
    let t = '';
    for (let k = s; k < e; k++) t += String.fromCharCode(buf[k]);
    const paren = t.indexOf('(');
    const x = Number(paren >= 0 ? t.slice(0, paren) : t);
    return Number.isFinite(x) ? x : NaN;
  }
  if (frac > 0) v /= POW10[frac];
  return neg ? -v : v;
}

// column roles
const X = 0,
  Y = 1,
  Z = 2,
  OCC = 3,
  B = 4,
  ATOM = 5,
  COMP = 6,
  LASYM = 7,
  AASYM = 8,
  ICODE = 9,
  ALT = 10,
  TYPE = 11,
  ENTITY = 12,
  LSEQ = 13,
  ASEQ = 14,
  MODEL = 15,
  ID = 16,
  CHARGE = 17,
  GROUP = 18;
const ROLES = 19;

function roleColumns(fields: string[]): Int32Array {
  const col = (...names: string[]): number => {
    for (const n of names) {
      const i = fields.indexOf(n);
      if (i >= 0) return i;
    }
    return -1;
  };
  const r = new Int32Array(ROLES);
  r[X] = col('Cartn_x');
  r[Y] = col('Cartn_y');
  r[Z] = col('Cartn_z');
  r[OCC] = col('occupancy');
  r[B] = col('B_iso_or_equiv');
  r[ATOM] = col('auth_atom_id', 'label_atom_id');
  r[COMP] = col('auth_comp_id', 'label_comp_id');
  r[LASYM] = col('label_asym_id', 'auth_asym_id');
  r[AASYM] = col('auth_asym_id', 'label_asym_id');
  r[ICODE] = col('pdbx_PDB_ins_code');
  r[ALT] = col('label_alt_id');
  r[TYPE] = col('type_symbol');
  r[ENTITY] = col('label_entity_id');
  r[LSEQ] = col('label_seq_id');
  r[ASEQ] = col('auth_seq_id');
  r[MODEL] = col('pdbx_PDB_model_num');
  r[ID] = col('id');
  r[CHARGE] = col('pdbx_formal_charge');
  r[GROUP] = col('group_PDB');
  return r;
}

const MISSING_COLUMN: Record<number, string> = {
  [X]: 'Cartn_x',
  [Y]: 'Cartn_y',
  [Z]: 'Cartn_z',
  [ATOM]: 'auth_atom_id',
  [COMP]: 'auth_comp_id',
  [AASYM]: 'auth_asym_id',
};

/** Fill the builder from the rows of a scanned `_atom_site` loop. */
export function fillAtomSite(buf: Uint8Array, scan: AtomSiteScan, b: StructureBuilder): void {
  const ncol = scan.fields.length;
  const role = roleColumns(scan.fields);
  for (const k of [X, Y, Z, ATOM, COMP, AASYM]) {
    if (role[k] < 0) {
      throw new StructureReadError(
        `The _atom_site table has no _atom_site.${MISSING_COLUMN[k]} column, which every model needs; export the model again with full atom records.`,
        { item: `_atom_site.${MISSING_COLUMN[k]}` },
      );
    }
  }
  const utf8 = new TextDecoder('utf-8');
  const decode = (u: Uint8Array): string => utf8.decode(u);
  const plain = new ByteInterner(b, decode, false);
  const upper = new ByteInterner(b, decode, true);
  // token bounds of the current row, per column; and whether the token is '.'/'?' (absent)
  const ts = new Int32Array(ncol);
  const te = new Int32Array(ncol);
  const absent = new Uint8Array(ncol);
  // previous row's token bounds per column, for "same as the row above" reuse
  const ps = new Int32Array(ncol).fill(-1);
  const pe = new Int32Array(ncol).fill(-1);
  const prevIdx = new Int32Array(ROLES).fill(-1);
  const end = scan.dataEnd;
  let p = scan.dataStart;
  let line = scan.dataLine;
  let rowLine = line;
  let c = 0; // column of the next token
  let row = 0;

  const same = (j: number): boolean => {
    const s0 = ps[j];
    if (s0 < 0) return false;
    const n = te[j] - ts[j];
    if (pe[j] - s0 !== n) return false;
    const s1 = ts[j];
    for (let k = 0; k < n; k++) if (buf[s0 + k] !== buf[s1 + k]) return false;
    return true;
  };
  const str = (roleId: number, interner: ByteInterner): number => {
    const j = role[roleId];
    if (j < 0 || absent[j] === 1) return (prevIdx[roleId] = 0);
    if (prevIdx[roleId] >= 0 && same(j)) return prevIdx[roleId];
    return (prevIdx[roleId] = interner.get(buf, ts[j], te[j]));
  };
  const text = (j: number): string => decode(buf.subarray(ts[j], te[j]));
  const bad = (item: string, what: string): StructureReadError =>
    new StructureReadError(
      `Line ${rowLine}: _atom_site.${item} ${what}; fix that row (or remove the atom) and upload again.`,
      { line: rowLine, item: `_atom_site.${item}` },
    );
  const num = (roleId: number, item: string, dflt: number, required: boolean): number => {
    const j = role[roleId];
    if (j < 0 || absent[j] === 1) {
      if (required) throw bad(item, 'is missing (? or .)');
      return dflt;
    }
    const v = parseNumber(buf, ts[j], te[j]);
    if (Number.isNaN(v)) throw bad(item, `"${text(j)}" is not a number`);
    return v;
  };
  const int = (roleId: number, item: string, dflt: number): number => {
    const v = num(roleId, item, dflt, false);
    if (!Number.isInteger(v)) throw bad(item, `"${text(role[roleId])}" is not an integer`);
    return v;
  };

  const finishRow = (): void => {
    const i = b.next();
    b.x[i] = num(X, 'Cartn_x', 0, true);
    b.y[i] = num(Y, 'Cartn_y', 0, true);
    b.z[i] = num(Z, 'Cartn_z', 0, true);
    b.occupancy[i] = num(OCC, 'occupancy', 1, false);
    b.bIso[i] = num(B, 'B_iso_or_equiv', 0, false);
    b.name[i] = str(ATOM, plain);
    b.resName[i] = str(COMP, plain);
    b.chainLabel[i] = str(LASYM, plain);
    b.chainAuth[i] = str(AASYM, plain);
    b.icode[i] = str(ICODE, plain);
    b.altloc[i] = str(ALT, plain);
    b.element[i] = str(TYPE, upper);
    b.entity[i] = str(ENTITY, plain);
    const jl = role[LSEQ];
    const ls =
      jl >= 0 && i > 0 && same(jl) ? b.labelSeq[i - 1] : int(LSEQ, 'label_seq_id', NO_LABEL_SEQ);
    b.labelSeq[i] = ls;
    const ja = role[ASEQ];
    b.authSeq[i] =
      ja >= 0 && i > 0 && same(ja)
        ? b.authSeq[i - 1]
        : int(ASEQ, 'auth_seq_id', ls === NO_LABEL_SEQ ? 0 : ls);
    const jm = role[MODEL];
    b.modelNum[i] =
      jm >= 0 && i > 0 && same(jm) ? b.modelNum[i - 1] : int(MODEL, 'pdbx_PDB_model_num', 1);
    const jid = role[ID];
    const id = jid >= 0 && absent[jid] === 0 ? parseNumber(buf, ts[jid], te[jid]) : NaN;
    b.serial[i] = Number.isInteger(id) ? id : row + 1;
    const jc = role[CHARGE];
    if (jc >= 0 && absent[jc] === 0) {
      const q = i > 0 && same(jc) ? b.charge[i - 1] : parseNumber(buf, ts[jc], te[jc]);
      if (!Number.isInteger(q) || q < -8 || q > 8) {
        throw new StructureReadError(
          `Line ${rowLine}: _atom_site.pdbx_formal_charge "${text(jc)}" is not a possible formal charge; correct it (an integer such as -1 or 2) and upload again.`,
          { line: rowLine, item: '_atom_site.pdbx_formal_charge' },
        );
      }
      b.charge[i] = q;
    }
    const jg = role[GROUP];
    if (jg >= 0) {
      b.hetatm[i] =
        i > 0 && same(jg)
          ? b.hetatm[i - 1]
          : te[jg] - ts[jg] === 6 && buf[ts[jg]] === 72 /* H */
            ? 1
            : 0;
    }
    for (let j = 0; j < ncol; j++) {
      ps[j] = ts[j];
      pe[j] = te[j];
    }
    row++;
  };

  while (p < end) {
    const ch = buf[p];
    if (WS[ch] === 1) {
      if (ch === NL) line++;
      p++;
      continue;
    }
    if (c === 0) rowLine = line;
    let s: number;
    let e: number;
    let isAbsent = 0;
    if (ch === 39 || ch === 34) {
      // quoted: ends at the same quote followed by whitespace or end of line (CIF 1.1)
      s = p + 1;
      let q = s;
      while (q < end) {
        if (
          buf[q] === ch &&
          (q + 1 >= end ||
            buf[q + 1] === SP ||
            buf[q + 1] === TAB ||
            buf[q + 1] === NL ||
            buf[q + 1] === CR)
        )
          break;
        if (buf[q] === NL)
          throw new StructureReadError(
            `Line ${line}: a quoted value in _atom_site is not closed on its line; fix the quotes and upload again.`,
            { line, item: '_atom_site' },
          );
        q++;
      }
      e = q;
      p = q + 1;
    } else {
      s = p;
      let q = p + 1;
      while (q < end && WS[buf[q]] === 0) q++;
      e = q;
      p = q;
      if (e - s === 1 && (ch === 46 || ch === 63)) isAbsent = 1; // '.' or '?'
    }
    ts[c] = s;
    te[c] = e;
    absent[c] = isAbsent;
    c++;
    if (c === ncol) {
      finishRow();
      c = 0;
    }
  }
  if (c !== 0) {
    throw new StructureReadError(
      `Line ${rowLine}: the last _atom_site row has ${c} of its ${ncol} values, so the file was cut short or a row is damaged; get the complete file and upload it again.`,
      { line: rowLine, item: '_atom_site' },
    );
  }
}
