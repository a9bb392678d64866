/**
 * Journal-readiness check of a finished SVG: width equals the preset, height within the page,
 * no text under the minimum size and no line under the minimum width at print size, and the
 * categorical colours stay apart under simulated colour-vision deficiencies. Each failure names
 * the element at fault.
 */
import { parseDocument } from 'htmlparser2';
import type { Preset } from './types.js';
import { missingGlyphs, PT_PER_MM } from './svg.js';

export interface ReadinessIssue {
  check: 'size' | 'font' | 'line' | 'palette' | 'glyph';
  /** the offending element: mark name and text or colour */
  element: string;
  message: string;
}

export interface ReadinessResult {
  ok: boolean;
  widthMm: number;
  heightMm: number;
  minFontPt: number | null;
  minLineWidthPt: number | null;
  issues: ReadinessIssue[];
}

interface El {
  type: string;
  name?: string;
  attribs?: Record<string, string>;
  children?: El[];
  data?: string;
}

function textOf(el: El): string {
  if (el.type === 'text') return el.data ?? '';
  // a tspan with its own position is a new line of a multi-line text
  return (el.children ?? [])
    .map((c) => (c.name === 'tspan' && c.attribs?.x !== undefined ? ' ' : '') + textOf(c))
    .join('')
    .trim();
}

function styleMap(style: string | undefined): Record<string, string> {
  const out: Record<string, string> = {};
  for (const part of (style ?? '').split(';')) {
    const i = part.indexOf(':');
    if (i > 0) out[part.slice(0, i).trim()] = part.slice(i + 1).trim();
  }
  return out;
}

// --- colour-vision simulation -----------------------------------------------------------
// Machado, Oliveira & Fernandes 2009 (IEEE TVCG 15:1291), severity 1.0 matrices on linear RGB
// (from memory; each row sums to 1, as in the paper's tables).
export const CVD_MATRICES: Record<'protanopia' | 'deuteranopia' | 'tritanopia', number[][]> = {
  protanopia: [
    [0.152286, 1.052583, -0.204868],
    [0.114503, 0.786281, 0.099216],
    [-0.003882, -0.048116, 1.051998],
  ],
  deuteranopia: [
    [0.367322, 0.860646, -0.227968],
    [0.280085, 0.672501, 0.047413],
    [-0.01182, 0.04294, 0.968881],
  ],
  tritanopia: [
    [1.255528, -0.076749, -0.178779],
    [-0.078411, 0.930809, 0.147602],
    [0.004733, 0.691367, 0.3039],
  ],
};

/** Smallest CIE76 ΔE*ab between two categorical colours that still reads as different (common practice, from memory). */
export const MIN_DELTA_E = 10;

function parseHex(c: string): [number, number, number] | null {
  const m = /^#([0-9a-f]{3}|[0-9a-f]{6})$/i.exec(c.trim());
  if (!m) return null;
  const h = m[1].length === 3 ? m[1].replace(/./g, (x) => x + x) : m[1];
  return [
    parseInt(h.slice(0, 2), 16) / 255,
    parseInt(h.slice(2, 4), 16) / 255,
    parseInt(h.slice(4, 6), 16) / 255,
  ];
}

// sRGB transfer function (IEC 61966-2-1)
const toLinear = (v: number) => (v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4);

/** CIE L*a*b* (D65) of a linear-RGB colour. */
function labOfLinear(rgb: number[]): [number, number, number] {
  const [r, g, b] = rgb.map((v) => Math.min(1, Math.max(0, v)));
  // sRGB → XYZ (IEC 61966-2-1), D65 white
  const x = (0.4124 * r + 0.3576 * g + 0.1805 * b) / 0.95047;
  const y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
  const z = (0.0193 * r + 0.1192 * g + 0.9505 * b) / 1.08883;
  const f = (t: number) => (t > 216 / 24389 ? Math.cbrt(t) : ((24389 / 27) * t + 16) / 116);
  return [116 * f(y) - 16, 500 * (f(x) - f(y)), 200 * (f(y) - f(z))];
}

export function simulate(
  hex: string,
  deficiency: keyof typeof CVD_MATRICES | 'normal',
): [number, number, number] {
  const rgb = parseHex(hex);
  if (!rgb) throw new Error(`Not a hex colour: ${hex}`);
  const lin = rgb.map(toLinear);
  if (deficiency === 'normal') return labOfLinear(lin);
  const m = CVD_MATRICES[deficiency];
  return labOfLinear(m.map((row) => row[0] * lin[0] + row[1] * lin[1] + row[2] * lin[2]));
}

/** CIE C*ab of a hex colour (0 for anything that is not #rgb/#rrggbb). */
export function chroma(hex: string): number {
  if (!parseHex(hex)) return 0;
  const [, a, b] = simulate(hex, 'normal');
  return Math.hypot(a, b);
}

export function deltaE(a: [number, number, number], b: [number, number, number]): number {
  return Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
}

/** Pairs of colours closer than MIN_DELTA_E under normal vision or a simulated deficiency. */
export function paletteConflicts(
  colours: string[],
): { a: string; b: string; vision: string; deltaE: number }[] {
  const out: { a: string; b: string; vision: string; deltaE: number }[] = [];
  const visions = ['normal', 'protanopia', 'deuteranopia', 'tritanopia'] as const;
  for (let i = 0; i < colours.length; i++) {
    for (let j = i + 1; j < colours.length; j++) {
      for (const v of visions) {
        const d = deltaE(simulate(colours[i], v), simulate(colours[j], v));
        if (d < MIN_DELTA_E) {
          out.push({ a: colours[i], b: colours[j], vision: v, deltaE: Math.round(d * 10) / 10 });
          break;
        }
      }
    }
  }
  return out;
}

export function checkReadiness(svg: string, preset: Preset): ReadinessResult {
  const doc = parseDocument(svg, { xmlMode: true }) as unknown as El;
  const root = (doc.children ?? []).find((c) => c.type === 'tag' && c.name === 'svg');
  const issues: ReadinessIssue[] = [];
  if (!root) {
    return {
      ok: false,
      widthMm: 0,
      heightMm: 0,
      minFontPt: null,
      minLineWidthPt: null,
      issues: [{ check: 'size', element: 'svg', message: 'The output is not an SVG document.' }],
    };
  }
  const a = root.attribs ?? {};
  const widthMm = parseFloat(a.width ?? '0');
  const heightMm = parseFloat(a.height ?? '0');
  const vb = (a.viewBox ?? '').split(/\s+/).map(Number);
  if (!a.width?.endsWith('mm') || Math.abs(widthMm - preset.widthMm) > 0.01) {
    issues.push({
      check: 'size',
      element: 'svg',
      message: `The figure is ${a.width ?? 'unsized'} wide; the ${preset.name} preset needs ${preset.widthMm} mm.`,
    });
  }
  if (heightMm > preset.maxHeightMm) {
    issues.push({
      check: 'size',
      element: 'svg',
      message: `The figure is ${heightMm} mm tall, more than the ${preset.maxHeightMm} mm a page holds; use a wider preset or fewer panels.`,
    });
  }
  // print points per SVG user unit
  const scale = vb.length === 4 && vb[2] > 0 ? (widthMm * PT_PER_MM) / vb[2] : 1;
  let minFont: number | null = null;
  let minLine: number | null = null;
  const colours = new Set<string>();
  const categorical = new Set(
    [...Object.values(preset.palette), preset.tones.ink].map((c) => c.toUpperCase()),
  );
  const fontIssues = new Map<string, ReadinessIssue>();
  const lineIssues = new Map<string, ReadinessIssue>();
  const glyphIssues = new Map<string, ReadinessIssue>();

  const walk = (el: El, inh: Record<string, string>, mark: string) => {
    if (el.type !== 'tag') return;
    const at = { ...el.attribs, ...styleMap(el.attribs?.style) };
    const cur: Record<string, string> = { ...inh };
    for (const k of [
      'font-size',
      'stroke',
      'stroke-width',
      'fill',
      'stroke-opacity',
      'fill-opacity',
      'opacity',
    ])
      if (at[k] !== undefined) cur[k] = at[k];
    const cls = el.attribs?.class ?? '';
    const nameMatch = /role-mark\s+(\S+)/.exec(cls) ?? /role-(axis|legend|title|frame)/.exec(cls);
    const here = nameMatch ? nameMatch[1] : mark;
    if (el.name === 'text') {
      const size = parseFloat(cur['font-size'] ?? '11') * scale;
      const label = textOf(el).trim();
      minFont = minFont === null ? size : Math.min(minFont, size);
      const missing = missingGlyphs(label);
      if (missing.length && !glyphIssues.has(label)) {
        glyphIssues.set(label, {
          check: 'glyph',
          element: `${here}: "${label}"`,
          message: `Text "${label}" (${here}) uses ${missing.join(' ')}, which no shipped font draws (it would print as a box); write it another way.`,
        });
      }
      if (size < preset.minFontPt - 1e-6 && label) {
        const key = `${here}|${size.toFixed(2)}`;
        if (!fontIssues.has(key))
          fontIssues.set(key, {
            check: 'font',
            element: `${here}: "${label}"`,
            message: `Text "${label}" (${here}) prints at ${size.toFixed(2)} pt, under the ${preset.minFontPt} pt minimum.`,
          });
      }
      return;
    }
    const stroke = cur.stroke;
    const drawsLine =
      ['path', 'line', 'rect', 'circle', 'polyline', 'polygon'].includes(el.name ?? '') &&
      stroke &&
      stroke !== 'none' &&
      stroke !== 'transparent' &&
      cur['stroke-opacity'] !== '0';
    if (drawsLine && !/background/.test(cls)) {
      const w = parseFloat(cur['stroke-width'] ?? '1') * scale;
      if (w > 0) {
        minLine = minLine === null ? w : Math.min(minLine, w);
        if (w < preset.minLineWidthPt - 1e-6) {
          const key = `${here}|${w.toFixed(3)}`;
          if (!lineIssues.has(key))
            lineIssues.set(key, {
              check: 'line',
              element: here,
              message: `Lines of ${here} print at ${w.toFixed(3)} pt, under the ${preset.minLineWidthPt} pt minimum.`,
            });
        }
      }
    }
    // colours that carry meaning: the preset's categorical palette and ink anywhere, and any
    // saturated colour (CIE chroma > 20) a data mark uses; axes, grid and the pale reference
    // tones are neutral by design
    if (el.name === 'path' || el.name === 'rect' || el.name === 'line' || el.name === 'circle') {
      const invisible = cur.opacity === '0' || cur['fill-opacity'] === '0';
      for (const c of invisible ? [] : [cur.fill, cur.stroke]) {
        if (!c) continue;
        const up = c.toUpperCase();
        if (categorical.has(up) || (/_marks$/.test(here) && chroma(up) > 20)) colours.add(up);
      }
    }
    for (const ch of el.children ?? []) walk(ch, cur, here);
  };
  walk(root, {}, 'figure');
  issues.push(...fontIssues.values(), ...lineIssues.values(), ...glyphIssues.values());
  for (const c of paletteConflicts([...colours].sort())) {
    issues.push({
      check: 'palette',
      element: `${c.a} / ${c.b}`,
      message: `Colours ${c.a} and ${c.b} differ by only ΔE ${c.deltaE} under ${c.vision} vision; pick colours further apart.`,
    });
  }
  return {
    ok: issues.length === 0,
    widthMm,
    heightMm,
    minFontPt: minFont === null ? null : Math.round((minFont as number) * 1000) / 1000,
    minLineWidthPt: minLine === null ? null : Math.round((minLine as number) * 1000) / 1000,
    issues,
  };
}
