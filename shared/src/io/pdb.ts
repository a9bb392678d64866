/**
 * Legacy PDB fixed-column reader (wwPDB PDB Format 3.3). Streams over the bytes line by line;
 * numeric fields are parsed straight from the bytes and text fields are interned through a
 * numeric key of their bytes, so no string or object is made per atom.
 */
import type { Structure } from '../model/types';
import { NO_LABEL_SEQ, StructureBuilder } from './builder';
import { StructureReadError } from './errors';

const SP = 32;

/**
 * Bytes [s, e) of the line (at most 4), read as a fixed-width field, packed 7 bits per byte into
 * a small integer (fast Map key; beyond the line end counts as blank); -1 for non-ASCII bytes.
 */
function fieldKey(buf: Uint8Array, s: number, e: number, lineEnd: number): number {
  let k = 0;
  for (let i = s; i < e; i++) {
    const c = i < lineEnd ? buf[i] : SP;
    if (c > 127) return -1;
    k = (k << 7) | c;
  }
  return k;
}

function fieldStr(buf: Uint8Array, s: number, e: number, lineEnd: number): string {
  let out = '';
  const end = Math.min(e, lineEnd);
  for (let i = s; i < end; i++) out += String.fromCharCode(buf[i]);
  return out.trim();
}

function isBlank(buf: Uint8Array, s: number, e: number, lineEnd: number): boolean {
  const end = Math.min(e, lineEnd);
  for (let i = s; i < end; i++) if (buf[i] !== SP) return false;
  return true;
}

const POW10 = [1, 10, 100, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15];

/**
 * Decimal number in a fixed field; NaN when blank or malformed. One integer accumulator divided
 * by an exact power of ten: correctly rounded, the same double as parseFloat.
 */
function fieldFloat(buf: Uint8Array, s: number, e: number, lineEnd: number): number {
  const end = e < lineEnd ? e : lineEnd;
  let i = s;
  while (i < end && buf[i] === SP) i++;
  if (i === end) return NaN;
  let neg = false;
  let c = buf[i];
  if (c === 45 /* - */) {
    neg = true;
    i++;
  } else if (c === 43 /* + */) i++;
  let v = 0;
  let digits = 0;
  let frac = -1;
  for (; i < end; i++) {
    c = buf[i];
    if (c >= 48 && c <= 57) {
      v = v * 10 + (c - 48);
      digits++;
      if (frac >= 0) frac++;
    } else if (c === 46 /* . */ && frac < 0) frac = 0;
    else break;
  }
  while (i < end && buf[i] === SP) i++;
  if (i !== end || digits === 0 || digits > 15) return NaN;
  if (frac > 0) v /= POW10[frac];
  return neg ? -v : v;
}

/**
 * The common coordinate layout "%8.3f" (decimal point in the field's fifth column, wwPDB format
 * 3.3): integer part and three decimals read at fixed places. NaN when the field differs (the
 * caller then uses the general fieldFloat).
 */
function fixed83(buf: Uint8Array, s: number): number {
  const f0 = buf[s + 5] - 48;
  const f1 = buf[s + 6] - 48;
  const f2 = buf[s + 7] - 48;
  if (buf[s + 4] !== 46 || f0 < 0 || f0 > 9 || f1 < 0 || f1 > 9 || f2 < 0 || f2 > 9) return NaN;
  let v = 0;
  let neg = false;
  let digits = 0;
  for (let i = s; i < s + 4; i++) {
    const c = buf[i];
    if (c >= 48 && c <= 57) {
      v = v * 10 + (c - 48);
      digits++;
    } else if (c === 45 && digits === 0 && !neg) neg = true;
    else if (c !== SP || digits > 0 || neg) return NaN;
  }
  if (digits === 0) return NaN;
  const r = (v * 1000 + f0 * 100 + f1 * 10 + f2) / 1000;
  return neg ? -r : r;
}

/** Integer in a fixed field; NaN when blank or malformed. */
function fieldInt(buf: Uint8Array, s: number, e: number, lineEnd: number): number {
  const end = Math.min(e, lineEnd);
  let i = s;
  while (i < end && buf[i] === SP) i++;
  if (i === end) return NaN;
  let neg = false;
  if (buf[i] === 45) {
    neg = true;
    i++;
  }
  let v = 0;
  let digits = 0;
  while (i < end && buf[i] >= 48 && buf[i] <= 57) {
    v = v * 10 + (buf[i] - 48);
    i++;
    digits++;
  }
  while (i < end && buf[i] === SP) i++;
  if (i !== end || digits === 0) return NaN;
  return neg ? -v : v;
}

function startsWith(buf: Uint8Array, p: number, lineEnd: number, word: string): boolean {
  if (p + word.length > lineEnd) return false;
  for (let k = 0; k < word.length; k++) if (buf[p + k] !== word.charCodeAt(k)) return false;
  return true;
}

class KeyedInterner {
  private readonly map = new Map<number, number>();
  constructor(
    private readonly b: StructureBuilder,
    private readonly upper = false,
  ) {}
  get(buf: Uint8Array, s: number, e: number, lineEnd: number): number {
    const k = fieldKey(buf, s, e, lineEnd);
    let v = k >= 0 ? this.map.get(k) : undefined;
    if (v === undefined) {
      const str = fieldStr(buf, s, e, lineEnd);
      v = this.b.intern(this.upper ? str.toUpperCase() : str);
      if (k >= 0) this.map.set(k, v);
    }
    return v;
  }
}

/** Element from the atom name when columns 77–78 are blank (PDB Format 3.3 name alignment). */
function elementFromName(buf: Uint8Array, s: number, lineEnd: number): string {
  const c0 = s < lineEnd ? buf[s] : SP;
  const c1 = s + 1 < lineEnd ? buf[s + 1] : SP;
  if (c0 === SP || (c0 >= 48 && c0 <= 57)) return String.fromCharCode(c1).toUpperCase();
  if (c0 === 72 /* H */) return 'H';
  return (String.fromCharCode(c0) + (c1 >= 65 && c1 <= 122 ? String.fromCharCode(c1) : ''))
    .toUpperCase()
    .trim();
}

function lineError(line: number, what: string): StructureReadError {
  return new StructureReadError(`Line ${line}: ${what}`, { line, item: 'ATOM/HETATM' });
}

export function readPdb(buf: Uint8Array, gzip: boolean): Structure {
  // ~81 bytes per ATOM line: a good first guess of the atom count
  const b = new StructureBuilder(Math.ceil(buf.length / 81));
  const names = new KeyedInterner(b);
  const resNames = new KeyedInterner(b);
  const chains = new KeyedInterner(b);
  const singles = new KeyedInterner(b);
  const elements = new KeyedInterner(b, true);
  const elementByName = new Map<number, number>();
  let model = 1;
  let afterTer = false;
  let prevAtomLine = -1;
  // previous atom line whose element came from columns 77–78 (and is the atom just before)
  let prevElementLine = -1;
  let id = '';
  const seqres = new Map<string, string[]>();
  const len = buf.length;
  let p = 0;
  let line = 0;
  while (p < len) {
    line++;
    let e = buf.indexOf(10, p);
    if (e < 0) e = len;
    let lineEnd = e;
    if (lineEnd > p && buf[lineEnd - 1] === 13) lineEnd--;
    const c0 = buf[p];
    const isAtom = c0 === 65 && startsWith(buf, p, lineEnd, 'ATOM  ');
    const isHet = !isAtom && c0 === 72 && startsWith(buf, p, lineEnd, 'HETATM');
    if (isAtom || isHet) {
      if (lineEnd - p < 54) {
        throw lineError(
          line,
          `the ${isAtom ? 'ATOM' : 'HETATM'} record is cut short (${lineEnd - p} characters; coordinates need columns 31–54); the file may be truncated — export it again and upload the complete file.`,
        );
      }
      const i = b.next();
      let x = fixed83(buf, p + 30);
      if (Number.isNaN(x)) x = fieldFloat(buf, p + 30, p + 38, lineEnd);
      let y = fixed83(buf, p + 38);
      if (Number.isNaN(y)) y = fieldFloat(buf, p + 38, p + 46, lineEnd);
      let z = fixed83(buf, p + 46);
      if (Number.isNaN(z)) z = fieldFloat(buf, p + 46, p + 54, lineEnd);
      if (Number.isNaN(x) || Number.isNaN(y) || Number.isNaN(z)) {
        throw lineError(
          line,
          'the coordinates in columns 31–54 are not three numbers; fix that line (or remove the atom) and upload again.',
        );
      }
      b.x[i] = x;
      b.y[i] = y;
      b.z[i] = z;
      const occ = fieldFloat(buf, p + 54, p + 60, lineEnd);
      if (Number.isNaN(occ) && !isBlank(buf, p + 54, p + 60, lineEnd)) {
        throw lineError(
          line,
          'the occupancy in columns 55–60 is not a number; fix that line and upload again.',
        );
      }
      b.occupancy[i] = Number.isNaN(occ) ? 1 : occ;
      const bf = fieldFloat(buf, p + 60, p + 66, lineEnd);
      if (Number.isNaN(bf) && !isBlank(buf, p + 60, p + 66, lineEnd)) {
        throw lineError(
          line,
          'the B-factor in columns 61–66 is not a number; fix that line and upload again.',
        );
      }
      b.bIso[i] = Number.isNaN(bf) ? 0 : bf;
      const serial = fieldInt(buf, p + 6, p + 11, lineEnd);
      // hybrid-36 serials (files over 99,999 atoms) are not decimal: number atoms in order then
      b.serial[i] = Number.isNaN(serial) ? i + 1 : serial;
      b.name[i] = names.get(buf, p + 12, p + 16, lineEnd);
      b.altloc[i] =
        prevAtomLine >= 0 && buf[p + 16] === buf[prevAtomLine + 16]
          ? b.altloc[i - 1]
          : singles.get(buf, p + 16, p + 17, lineEnd);
      let same = prevAtomLine >= 0 && i > 0 && lineEnd - p >= 27;
      for (let q = 17; same && q < 27; q++) if (buf[p + q] !== buf[prevAtomLine + q]) same = false;
      if (same) {
        // columns 18–27 (residue name, chain, number, icode) as on the previous atom line
        b.resName[i] = b.resName[i - 1];
        b.chainAuth[i] = b.chainAuth[i - 1];
        b.chainLabel[i] = b.chainLabel[i - 1];
        b.authSeq[i] = b.authSeq[i - 1];
        b.icode[i] = b.icode[i - 1];
      } else {
        b.resName[i] = resNames.get(buf, p + 17, p + 21, lineEnd);
        const ch = chains.get(buf, p + 21, p + 22, lineEnd);
        b.chainAuth[i] = ch;
        b.chainLabel[i] = ch;
        const seq = fieldInt(buf, p + 22, p + 26, lineEnd);
        if (Number.isNaN(seq)) {
          throw lineError(
            line,
            'the residue number in columns 23–26 is not an integer; fix that line and upload again.',
          );
        }
        b.authSeq[i] = seq;
        b.icode[i] = singles.get(buf, p + 26, p + 27, lineEnd);
      }
      prevAtomLine = p;
      b.labelSeq[i] = NO_LABEL_SEQ;
      b.modelNum[i] = model;
      b.hetatm[i] = isHet ? 1 : 0;
      if (afterTer) {
        b.residueBreak[i] = 1;
        afterTer = false;
      }
      if (isBlank(buf, p + 76, p + 78, lineEnd)) {
        const k = fieldKey(buf, p + 12, p + 14, lineEnd);
        let el = k >= 0 ? elementByName.get(k) : undefined;
        if (el === undefined) {
          el = b.intern(elementFromName(buf, p + 12, lineEnd));
          if (k >= 0) elementByName.set(k, el);
        }
        b.element[i] = el;
        prevElementLine = -1;
      } else {
        b.element[i] =
          prevElementLine >= 0 &&
          buf[p + 76] === buf[prevElementLine + 76] &&
          buf[p + 77] === buf[prevElementLine + 77]
            ? b.element[i - 1]
            : elements.get(buf, p + 76, p + 78, lineEnd);
        prevElementLine = p;
      }
      if (!isBlank(buf, p + 78, p + 80, lineEnd)) {
        const d = p + 78 < lineEnd ? buf[p + 78] : SP;
        const s = p + 79 < lineEnd ? buf[p + 79] : SP;
        if (d >= 48 && d <= 57 && (s === 43 || s === 45)) {
          b.charge[i] = (s === 45 ? -1 : 1) * (d - 48);
        } else {
          throw lineError(
            line,
            `the formal-charge columns 79–80 hold "${fieldStr(buf, p + 78, p + 80, lineEnd)}", which is not a charge such as "2+" or "1-"; blank columns 73–80 if they hold old annotations (segment ids, line numbers), or write the charge correctly, and upload again.`,
          );
        }
      }
    } else if (startsWith(buf, p, lineEnd, 'MODEL ')) {
      const m = fieldInt(buf, p + 6, lineEnd, lineEnd);
      if (Number.isNaN(m))
        throw lineError(
          line,
          'the MODEL record has no model number in columns 11–14; number the model and upload again.',
        );
      model = m;
    } else if (startsWith(buf, p, lineEnd, 'ENDMDL')) {
      afterTer = false;
    } else if (startsWith(buf, p, lineEnd, 'TER')) {
      afterTer = true;
    } else if (startsWith(buf, p, lineEnd, 'MODRES')) {
      const comp = fieldStr(buf, p + 12, p + 15, lineEnd);
      const parent = fieldStr(buf, p + 24, p + 27, lineEnd);
      if (comp !== '' && parent !== '') b.fileParents.set(comp, parent);
    } else if (startsWith(buf, p, lineEnd, 'SEQRES')) {
      const chain = fieldStr(buf, p + 11, p + 12, lineEnd);
      let list = seqres.get(chain);
      if (list === undefined) seqres.set(chain, (list = []));
      for (let c = p + 19; c < lineEnd; c += 4) {
        const r = fieldStr(buf, c, c + 4, lineEnd);
        if (r !== '') list.push(r);
      }
    } else if (startsWith(buf, p, lineEnd, 'HEADER')) {
      id = fieldStr(buf, p + 62, p + 66, lineEnd);
    }
    p = e + 1;
  }
  for (const [chain, seq] of seqres) {
    b.entities.push({ id: chain, type: 'polymer', sequence: seq });
  }
  return b.finish('pdb', gzip, id);
}
