/**
 * SVG → PDF (pdfkit + svg-to-pdfkit, fonts registered from the shipped WOFF files and embedded
 * as subsets, fixed dates) and SVG → PNG at a chosen dpi (resvg, fonts from the same files).
 */
import { createRequire } from 'node:module';
import { Resvg } from '@resvg/resvg-js';
import { FIGURE_FONTS, sfntFontFiles } from './fonts.js';
import { PT_PER_MM } from './svg.js';

const require = createRequire(import.meta.url);
type PdfDoc = {
  registerFont(name: string, src: string): void;
  on(ev: string, fn: (chunk?: Buffer) => void): void;
  end(): void;
};
const PDFDocument = require('pdfkit') as new (opts: Record<string, unknown>) => PdfDoc;
const SVGtoPDF = require('svg-to-pdfkit') as (
  doc: PdfDoc,
  svg: string,
  x: number,
  y: number,
  opts: Record<string, unknown>,
) => void;

/** Physical size of a finished SVG (width/height attributes in mm). */
export function svgSizeMm(svg: string): { widthMm: number; heightMm: number } {
  const m = /<svg[^>]*\bwidth="([\d.]+)mm" height="([\d.]+)mm"/.exec(svg);
  if (!m)
    throw new Error(
      'The SVG has no size in millimetres; render it through the figure pipeline first.',
    );
  return { widthMm: Number(m[1]), heightMm: Number(m[2]) };
}

export interface PdfOptions {
  /** the PDF's creation date; fixed so the same figure gives the same bytes */
  date?: Date;
  title?: string;
}

export const FIXED_PDF_DATE = new Date(Date.UTC(2000, 0, 1, 0, 0, 0));

export function svgToPdf(svg: string, opts: PdfOptions = {}): Promise<Buffer> {
  const { widthMm, heightMm } = svgSizeMm(svg);
  const w = widthMm * PT_PER_MM;
  const h = heightMm * PT_PER_MM;
  const date = opts.date ?? FIXED_PDF_DATE;
  const doc = new PDFDocument({
    size: [w, h],
    margin: 0,
    autoFirstPage: true,
    compress: true,
    info: {
      Title: opts.title ?? 'Foldfolio figure',
      Producer: 'Foldfolio',
      Creator: 'Foldfolio',
      CreationDate: date,
      ModDate: date,
    },
  });
  for (const f of FIGURE_FONTS) doc.registerFont(f.family, f.file);
  const chunks: Buffer[] = [];
  return new Promise<Buffer>((resolve, reject) => {
    doc.on('data', (c) => chunks.push(c!));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', (e) => reject(e));
    try {
      SVGtoPDF(doc, svg, 0, 0, {
        width: w,
        height: h,
        preserveAspectRatio: 'xMinYMin meet',
        assumePt: false,
        fontCallback: (family: string) => {
          const fam = family
            .split(',')[0]
            .trim()
            .replace(/^['"]|['"]$/g, '');
          return FIGURE_FONTS.some((f) => f.family === fam) ? fam : FIGURE_FONTS[1].family;
        },
      });
      doc.end();
    } catch (e) {
      reject(e);
    }
  });
}

export function svgToPng(svg: string, dpi = 300): Buffer {
  if (!(dpi >= 36 && dpi <= 1200))
    throw new Error('Choose a PNG resolution between 36 and 1200 dpi.');
  const { widthMm } = svgSizeMm(svg);
  const widthPx = Math.round((widthMm / 25.4) * dpi);
  // resvg ignores @font-face data URIs: give it the same fonts as files
  const plain = svg.replace(/<defs><style>@font-face[^<]*<\/style><\/defs>/, '');
  const r = new Resvg(plain, {
    fitTo: { mode: 'width', value: widthPx },
    font: {
      fontFiles: sfntFontFiles(),
      loadSystemFonts: false,
      defaultFontFamily: FIGURE_FONTS[1].family,
    },
    background: 'white',
  });
  return withDpi(r.render().asPng(), dpi);
}

// CRC-32 as the PNG specification (ISO/IEC 15948, annex D) defines it
const CRC_TABLE = (() => {
  const t = new Uint32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    t[n] = c >>> 0;
  }
  return t;
})();
function crc32(buf: Buffer): number {
  let c = 0xffffffff;
  for (const b of buf) c = CRC_TABLE[(c ^ b) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

/** Adds a pHYs chunk (pixels per metre) after IHDR so programs read the intended dpi. */
export function withDpi(png: Buffer, dpi: number): Buffer {
  const ppm = Math.round(dpi / 0.0254);
  const data = Buffer.alloc(9);
  data.writeUInt32BE(ppm, 0);
  data.writeUInt32BE(ppm, 4);
  data.writeUInt8(1, 8); // unit: metre
  const type = Buffer.from('pHYs', 'latin1');
  const len = Buffer.alloc(4);
  len.writeUInt32BE(9, 0);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(Buffer.concat([type, data])), 0);
  // signature (8) + IHDR chunk (4 length + 4 type + 13 data + 4 CRC) = 33 bytes
  const at = 33;
  const rest = png.subarray(at).toString('latin1').includes('pHYs') ? null : png.subarray(at);
  if (!rest) return png;
  return Buffer.concat([png.subarray(0, at), len, type, data, crc, rest]);
}
