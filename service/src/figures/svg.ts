/**
 * SVG post-processing after Vega: physical size in mm from the preset, text split into runs of
 * the font that has each glyph (Greek → Noto Serif Greek), and the used fonts embedded.
 */
import { createRequire } from 'node:module';
import { FALLBACK_ORDER, FIGURE_FONTS, fontDataUri } from './fonts.js';
import type { Preset } from './types.js';

const require = createRequire(import.meta.url);
interface FkFont {
  hasGlyphForCodePoint(cp: number): boolean;
}
const fontkit = require('fontkit') as { openSync(path: string): FkFont };

let opened: Map<string, FkFont> | null = null;
function fonts(): Map<string, FkFont> {
  if (!opened) opened = new Map(FIGURE_FONTS.map((f) => [f.family, fontkit.openSync(f.file)]));
  return opened;
}

export const PT_PER_MM = 72 / 25.4;

/** Characters of a text that none of the figure fonts can draw (they would print as boxes). */
export function missingGlyphs(text: string): string[] {
  const f = [...fonts().values()];
  const out = new Set<string>();
  for (const ch of text) {
    const cp = ch.codePointAt(0)!;
    if (cp <= 0x20) continue;
    if (!f.some((x) => x.hasGlyphForCodePoint(cp))) out.add(ch);
  }
  return [...out];
}

function decode(s: string): string {
  return s
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&quot;/g, '"')
    .replace(/&#39;/g, "'")
    .replace(/&#x([0-9a-f]+);/gi, (_, h: string) => String.fromCodePoint(parseInt(h, 16)))
    .replace(/&#(\d+);/g, (_, d: string) => String.fromCodePoint(Number(d)))
    .replace(/&amp;/g, '&');
}

export function escapeXml(s: string): string {
  return s
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;');
}

/** Runs of characters with the family that draws them: the element's own, else the first fallback. */
export function fontRuns(text: string, primary: string): { family: string; text: string }[] {
  const f = fonts();
  const order = [primary, ...FALLBACK_ORDER.filter((x) => x !== primary)].filter((x) => f.has(x));
  const runs: { family: string; text: string }[] = [];
  for (const ch of text) {
    const cp = ch.codePointAt(0)!;
    const fam = order.find((x) => f.get(x)!.hasGlyphForCodePoint(cp)) ?? primary;
    const last = runs[runs.length - 1];
    if (last && last.family === fam) last.text += ch;
    else runs.push({ family: fam, text: ch });
  }
  return runs;
}

export interface SvgSize {
  widthPx: number;
  heightPx: number;
}

export function svgSize(svg: string): SvgSize {
  const m = /<svg[^>]*\bviewBox="0 0 ([\d.]+) ([\d.]+)"/.exec(svg);
  if (!m) throw new Error('The renderer produced an SVG without a viewBox.');
  return { widthPx: Number(m[1]), heightPx: Number(m[2]) };
}

export interface FinishOptions {
  embedFonts?: boolean;
  /** a line of metadata written into <desc> (template id, versions) */
  description?: string;
}

export function finishSvg(raw: string, preset: Preset, opts: FinishOptions = {}): string {
  const { widthPx, heightPx } = svgSize(raw);
  const widthMm = preset.widthMm;
  const heightMm = Math.round((heightPx / widthPx) * widthMm * 1000) / 1000;
  // 3 decimals of a point (0.35 µm) are far below print resolution and keep files small
  const round3 = (m: string) => String(Math.round(Number(m) * 1000) / 1000);
  let svg = raw.replace(
    / (d|transform|x1|x2|y1|y2|x|y|width|height)="([^"]*)"/g,
    (_w, attr: string, val: string) => ` ${attr}="${val.replace(/-?\d+\.\d{4,}/g, round3)}"`,
  );
  svg = svg.replace(
    /<svg([^>]*?) width="[\d.]+" height="[\d.]+"/,
    `<svg$1 width="${widthMm}mm" height="${heightMm}mm"`,
  );
  // split text by font coverage; Vega writes text content without nested tags for one-line labels
  svg = svg.replace(/<text([^>]*)>([^<]*)<\/text>/g, (whole, attrs: string, content: string) => {
    const fam = /font-family="([^"]*)"/.exec(attrs)?.[1];
    if (!fam) return whole;
    const primary = decode(fam)
      .split(',')[0]
      .trim()
      .replace(/^['"]|['"]$/g, '');
    const runs = fontRuns(decode(content), primary);
    if (runs.length === 1 && runs[0].family === primary) return whole;
    const inner = runs
      .map((r) =>
        r.family === primary
          ? escapeXml(r.text)
          : `<tspan font-family="${escapeXml(r.family)}">${escapeXml(r.text)}</tspan>`,
      )
      .join('');
    return `<text${attrs}>${inner}</text>`;
  });
  const used = FIGURE_FONTS.map((f) => f.family).filter(
    (fam) => svg.includes(`font-family="${fam}"`) || svg.includes(`font-family="&quot;${fam}`),
  );
  const head: string[] = [];
  if (opts.description) head.push(`<desc>${escapeXml(opts.description)}</desc>`);
  if (opts.embedFonts !== false && used.length) {
    const faces = used
      .map((fam) => `@font-face{font-family:"${fam}";src:url(${fontDataUri(fam)}) format("woff");}`)
      .join('');
    head.push(`<defs><style>${faces}</style></defs>`);
  }
  if (head.length) svg = svg.replace(/(<svg[^>]*>)/, `$1${head.join('')}`);
  return svg;
}
