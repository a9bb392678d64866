/**
 * Figure rendering: template + preset + parameters + report → Vega-Lite spec → SVG, and the
 * journal-readiness check of the result. Same inputs ⇒ byte-identical SVG.
 */
import type { Report } from '@foldfolio/shared';
import { datasetFor } from './datasets.js';
import { figureReferenceForReport } from './figure-reference.js';
import { checkReadiness, type ReadinessResult } from './readiness.js';
import { finishSvg, PT_PER_MM, svgSize } from './svg.js';
import { loadFigureTemplate, loadPreset, type FigureTemplate } from './templates.js';
import type { FigureInput, FigureManifest, Preset } from './types.js';
import { sharedVegaHost, type VegaHost } from './vega-host.js';

export type ParamValues = Record<string, number | string | boolean>;

export class FigureParameterError extends Error {}

/** Manifest defaults overlaid by the caller's values, each checked against its declaration. */
export function resolveParameters(manifest: FigureManifest, values: ParamValues = {}): ParamValues {
  const out: ParamValues = {};
  for (const p of manifest.parameters) out[p.name] = p.default;
  for (const [k, v] of Object.entries(values)) {
    const def = manifest.parameters.find((p) => p.name === k);
    if (!def)
      throw new FigureParameterError(
        `The figure "${manifest.id}" has no parameter "${k}"; use one of ${manifest.parameters.map((p) => p.name).join(', ') || '(none)'}.`,
      );
    if (typeof v !== def.type)
      throw new FigureParameterError(`Parameter "${k}" of "${manifest.id}" must be a ${def.type}.`);
    if (
      typeof v === 'number' &&
      ((def.min !== undefined && v < def.min) ||
        (def.max !== undefined && v > def.max) ||
        !Number.isFinite(v))
    ) {
      throw new FigureParameterError(
        `Parameter "${k}" of "${manifest.id}" must lie between ${def.min} and ${def.max}.`,
      );
    }
    out[k] = v;
  }
  return out;
}

/** Vega-Lite config from the preset: fonts, sizes and line widths in points (1 px = 1 pt). */
export function baseConfig(preset: Preset): Record<string, unknown> {
  const t = preset.tones;
  return {
    font: preset.fonts.symbols,
    view: { stroke: t.muted, strokeWidth: preset.lineWidthPt.axis, fill: null },
    axis: {
      labelFont: preset.fonts.symbols,
      titleFont: preset.fonts.symbols,
      labelFontSize: preset.fontSizePt.label,
      titleFontSize: preset.fontSizePt.axisTitle,
      titleFontWeight: 'normal',
      labelColor: t.ink,
      titleColor: t.ink,
      domainColor: t.ink,
      tickColor: t.ink,
      domainWidth: preset.lineWidthPt.axis,
      tickWidth: preset.lineWidthPt.axis,
      tickSize: 3,
      gridColor: t.grid,
      gridWidth: preset.lineWidthPt.grid,
      labelPadding: 2,
      titlePadding: 3,
    },
    legend: {
      labelFont: preset.fonts.symbols,
      titleFont: preset.fonts.symbols,
      labelFontSize: preset.fontSizePt.label,
      titleFontSize: preset.fontSizePt.axisTitle,
      titleFontWeight: 'normal',
      symbolStrokeWidth: preset.lineWidthPt.data,
    },
    header: {
      labelFont: preset.fonts.text,
      labelFontSize: preset.fontSizePt.title,
      titleFont: preset.fonts.text,
    },
    title: { font: preset.fonts.text, fontSize: preset.fontSizePt.title },
    text: { font: preset.fonts.symbols },
  };
}

function lookup(path: string, scope: Record<string, unknown>): unknown {
  let cur: unknown = scope;
  for (const part of path.split('.')) {
    if (
      cur === null ||
      typeof cur !== 'object' ||
      !Object.prototype.hasOwnProperty.call(cur, part)
    ) {
      throw new FigureParameterError(
        `The template refers to an unknown parameter "${path}"; check its spec against the manifest.`,
      );
    }
    cur = (cur as Record<string, unknown>)[part];
  }
  return cur;
}

/** Replaces every {"$param": "a.b"} object of the spec by its value. */
export function substitute(node: unknown, scope: Record<string, unknown>): unknown {
  if (Array.isArray(node)) return node.map((n) => substitute(n, scope));
  if (node && typeof node === 'object') {
    const o = node as Record<string, unknown>;
    const keys = Object.keys(o);
    if (keys.length === 1 && keys[0] === '$param' && typeof o.$param === 'string')
      return lookup(o.$param, scope);
    const out: Record<string, unknown> = {};
    for (const k of keys) out[k] = substitute(o[k], scope);
    return out;
  }
  return node;
}

export interface FigureRequest extends FigureInput {
  templateId: string;
  presetId: string;
  params?: ParamValues;
  /** override the built-in template (a saved version) */
  template?: FigureTemplate;
  embedFonts?: boolean;
}

export interface RenderedFigure {
  templateId: string;
  templateVersion: number;
  presetId: string;
  svg: string;
  spec: Record<string, unknown>;
  readiness: ReadinessResult;
  /** rows drawn (the data behind the figure, for packages) */
  rows: Record<string, unknown>[];
}

/** Caption lines under the figure, wrapped to the width (0.62 em per character: a safe mean for Merriweather). */
export function captionFor(
  report: Report,
  manifest: FigureManifest,
  widthPt: number,
  fontPt: number,
): string[] {
  const ref = report.reference?.id ?? 'none (regions not drawn)';
  const n = report.models.length;
  // the torsion figure draws every model of an ensemble, the others the first model
  const models =
    n > 1
      ? manifest.data === 'torsion'
        ? ` All ${n} models.`
        : ` Model ${report.models[0].model} of ${n}.`
      : '';
  const words =
    `${manifest.title}.${models} Foldfolio engine ${report.engine.version}; reference ${ref}; template ${manifest.id} v${manifest.version}.`.split(
      ' ',
    );
  const maxChars = Math.max(20, Math.floor(widthPt / (fontPt * 0.62)));
  const lines: string[] = [];
  let line = '';
  for (const w of words) {
    if (line && line.length + 1 + w.length > maxChars) {
      lines.push(line);
      line = w;
    } else line = line ? `${line} ${w}` : w;
  }
  if (line) lines.push(line);
  return lines;
}

/**
 * A few rows that lay out like all of them: the first row of every combination of text
 * values, the rows holding each numeric field's minimum and maximum, and every label row.
 */
export function probeRows(rows: Record<string, unknown>[]): Record<string, unknown>[] {
  if (rows.length <= 200) return rows;
  const keep = new Set<number>();
  const seen = new Set<string>();
  const min = new Map<string, [number, number]>();
  const max = new Map<string, [number, number]>();
  rows.forEach((r, i) => {
    const sig: string[] = [];
    for (const [k, v] of Object.entries(r)) {
      if (typeof v === 'string' && k !== 'label') sig.push(`${k}=${v}`);
      else if (typeof v === 'number') {
        if (!min.has(k) || v < min.get(k)![0]) min.set(k, [v, i]);
        if (!max.has(k) || v > max.get(k)![0]) max.set(k, [v, i]);
      }
    }
    const key = sig.join('|');
    if (!seen.has(key) || r.kind === 'label' || r.kind === 'frame') {
      seen.add(key);
      keep.add(i);
    }
  });
  for (const [, i] of min.values()) keep.add(i);
  for (const [, i] of max.values()) keep.add(i);
  return rows.filter((_, i) => keep.has(i));
}

export function buildSpec(
  req: FigureRequest,
  preset: Preset,
  template: FigureTemplate,
  /** points to take off the layout width so the natural width meets the preset (second pass) */
  shrinkPt = 0,
  /** the rows, when already computed */
  given?: Record<string, unknown>[],
): { spec: Record<string, unknown>; rows: Record<string, unknown>[] } {
  const m = template.manifest;
  const params = resolveParameters(m, req.params);
  const all = given ?? datasetFor(m.data, req);
  const rows = (req as { probe?: boolean }).probe ? probeRows(all) : all;
  const widthPt = preset.widthMm * PT_PER_MM;
  const columns = Math.max(1, Math.min(preset.panelColumns, 6));
  // left axis (~34 pt) plus gaps between panels; panels square
  // quarter-point steps: the width then follows the shrink closely, so the passes converge
  const q = (x: number) => Math.floor(x * 4) / 4;
  const panelWidthPt = q((widthPt - 42 - shrinkPt - (columns - 1) * 10) / columns);
  const scope: Record<string, unknown> = {
    ...params,
    preset,
    widthPt: q(widthPt - 46 - shrinkPt),
    columns,
    panelWidthPt,
    smallColumns: columns * 2,
    // two panels per preset column, leaving room for a colour legend (~50 pt)
    smallPanelPt: q((widthPt - 92 - shrinkPt - (columns * 2 - 1) * 8) / (columns * 2)),
    halfWidthPt: q((widthPt - 52 - shrinkPt) / 2),
    caption: captionFor(req.report, m, widthPt - 20 - shrinkPt, preset.fontSizePt.annotation),
    baseConfig: baseConfig(preset),
  };
  let parsed: unknown;
  try {
    parsed = JSON.parse(template.specText);
  } catch (e) {
    throw new FigureParameterError(
      `The spec of template "${m.id}" is not valid JSON (${(e as Error).message}); fix it and save again.`,
    );
  }
  const spec = substitute(parsed, scope) as Record<string, unknown>;
  const keep = m.probeLayers;
  if ((req as { probe?: boolean }).probe && keep) {
    // the probe only measures width: layers drawn inside the plot cannot change it
    const holder = (spec.spec ?? spec) as { layer?: { name?: string }[] };
    if (holder.layer)
      holder.layer = holder.layer.filter((l) => l.name !== undefined && keep.includes(l.name));
  }
  spec.datasets = { rows };
  return { spec, rows };
}

export async function renderFigure(
  req: FigureRequest,
  host: VegaHost = sharedVegaHost(),
): Promise<RenderedFigure> {
  const preset = loadPreset(req.presetId);
  const template = req.template ?? loadFigureTemplate(req.templateId);
  if (req.reference === undefined)
    req = { ...req, reference: figureReferenceForReport(req.report) };
  // axes, titles and legends take a width known only after layout: find the width to give
  // the plot on a small probe of the rows (same categories and extents), then render once
  const targetPt = preset.widthMm * PT_PER_MM;
  const data = datasetFor(template.manifest.data, req);
  const probe = buildSpec({ ...req, probe: true } as FigureRequest, preset, template, 0, data);
  const probeOver = svgSize(await host.render(probe.spec)).widthPx - targetPt;
  // panel widths enter the layout linearly, so one measured excess gives the correction
  let shrink = probeOver <= 0 && probeOver > -6 ? 0 : Math.ceil(probeOver);
  let { spec, rows } = buildSpec(req, preset, template, shrink, data);
  let raw = await host.render(spec);
  for (let pass = 0; pass < 2; pass++) {
    const over = svgSize(raw).widthPx - targetPt;
    if (over <= 0 && over > -6) break;
    // the probe missed something (e.g. a long count label): a corrective full pass
    shrink += Math.ceil(over);
    ({ spec, rows } = buildSpec(req, preset, template, shrink, data));
    raw = await host.render(spec);
  }
  const svg = finishSvg(raw, preset, {
    embedFonts: req.embedFonts,
    description: `${template.manifest.id} v${template.manifest.version}, preset ${preset.id} v${preset.version}, engine ${req.report.engine.version}`,
  });
  const readiness = checkReadiness(svg, preset);
  return {
    templateId: template.manifest.id,
    templateVersion: template.manifest.version,
    presetId: preset.id,
    svg,
    spec,
    readiness,
    rows,
  };
}
