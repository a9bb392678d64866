/**
 * The shipped figure fonts (@fontsource WOFF files): which file covers which characters, real
 * advance widths for Vega's layout, per-character fallback runs for SVG/PDF, and WOFF→SFNT for
 * the PNG rasteriser (resvg reads TrueType/OpenType only).
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { createRequire } from 'node:module';
import { inflateSync } from 'node:zlib';

const require = createRequire(import.meta.url);

export interface FigureFont {
  /** family name used in the SVG and registered in PDFs */
  family: string;
  file: string;
}

function fontsourceFile(pkg: string, file: string): string {
  return join(dirname(require.resolve(`${pkg}/package.json`)), 'files', file);
}

/** Order matters: a character is set in the element's own family if it has the glyph, else the first later one that does. */
export const FIGURE_FONTS: readonly FigureFont[] = [
  {
    family: 'Merriweather',
    file: fontsourceFile('@fontsource/merriweather', 'merriweather-latin-400-normal.woff'),
  },
  {
    family: 'Noto Serif',
    file: fontsourceFile('@fontsource/noto-serif', 'noto-serif-latin-400-normal.woff'),
  },
  // Merriweather has no Greek (φ ψ χ ω vanish): the Greek subset of Noto Serif covers them
  {
    family: 'Noto Serif Greek',
    file: fontsourceFile('@fontsource/noto-serif', 'noto-serif-greek-400-normal.woff'),
  },
];

export const FALLBACK_ORDER = FIGURE_FONTS.map((f) => f.family);

/** SFNT bytes from a WOFF 1.0 file (W3C WOFF File Format 1.0, sections 3–5). */
export function woffToSfnt(woff: Buffer): Buffer {
  if (woff.readUInt32BE(0) !== 0x774f4646) throw new Error('Not a WOFF 1.0 font file.');
  const flavor = woff.readUInt32BE(4);
  const numTables = woff.readUInt16BE(12);
  const tables: { tag: number; checksum: number; data: Buffer }[] = [];
  for (let i = 0; i < numTables; i++) {
    const e = 44 + i * 20;
    const tag = woff.readUInt32BE(e);
    const offset = woff.readUInt32BE(e + 4);
    const compLength = woff.readUInt32BE(e + 8);
    const origLength = woff.readUInt32BE(e + 12);
    const checksum = woff.readUInt32BE(e + 16);
    const raw = woff.subarray(offset, offset + compLength);
    tables.push({
      tag,
      checksum,
      data: compLength < origLength ? inflateSync(raw) : Buffer.from(raw),
    });
  }
  let searchRange = 1;
  let entrySelector = 0;
  while (searchRange * 2 <= numTables) {
    searchRange *= 2;
    entrySelector++;
  }
  searchRange *= 16;
  const headerLen = 12 + numTables * 16;
  const parts: Buffer[] = [];
  const header = Buffer.alloc(headerLen);
  header.writeUInt32BE(flavor, 0);
  header.writeUInt16BE(numTables, 4);
  header.writeUInt16BE(searchRange, 6);
  header.writeUInt16BE(entrySelector, 8);
  header.writeUInt16BE(numTables * 16 - searchRange, 10);
  let offset = headerLen;
  tables.forEach((t, i) => {
    const e = 12 + i * 16;
    header.writeUInt32BE(t.tag, e);
    header.writeUInt32BE(t.checksum, e + 4);
    header.writeUInt32BE(offset, e + 8);
    header.writeUInt32BE(t.data.length, e + 12);
    const padded = Buffer.alloc((t.data.length + 3) & ~3);
    t.data.copy(padded);
    parts.push(padded);
    offset += padded.length;
  });
  return Buffer.concat([header, ...parts]);
}

/** TrueType copies of the figure fonts in a cache folder keyed by content (for resvg). */
export function sfntFontFiles(): string[] {
  return FIGURE_FONTS.map((f) => {
    const woff = readFileSync(f.file);
    const hash = createHash('sha256').update(woff).digest('hex').slice(0, 16);
    const dir = join(tmpdir(), 'foldfolio-fonts');
    const out = join(dir, `${hash}.ttf`);
    if (!existsSync(out)) {
      mkdirSync(dir, { recursive: true });
      writeFileSync(out, woffToSfnt(woff));
    }
    return out;
  });
}

/** base64 of each font file, for @font-face rules embedded in the SVG */
const embedCache = new Map<string, string>();
export function fontDataUri(family: string): string {
  const f = FIGURE_FONTS.find((x) => x.family === family);
  if (!f) throw new Error(`Unknown figure font ${family}.`);
  let b64 = embedCache.get(family);
  if (!b64) {
    b64 = readFileSync(f.file).toString('base64');
    embedCache.set(family, b64);
  }
  return `data:font/woff;base64,${b64}`;
}
