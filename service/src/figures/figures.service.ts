/**
 * Figures of a manuscript's model version through the API: the pinned template version, the
 * stored report, helper-6's renderer (Vega in its worker thread) and a small in-memory cache
 * keyed by a hash of every input, so repeated previews and exports do not re-render.
 */
import { createHash } from 'node:crypto';
import { BadRequestException, ConflictException, Injectable } from '@nestjs/common';
import type { Report } from '@foldfolio/shared';
import { AnalysesService } from '../analyses/analyses.service.js';
import { ModelsService } from '../models/models.service.js';
import { TemplatesService, type ResolvedTemplate } from '../templates/templates.service.js';
import { svgToPdf, svgToPng } from './export.js';
import { FigureParameterError, renderFigure, type ParamValues } from './render.js';
import type { ReadinessResult } from './readiness.js';
import { listPresets } from './templates.js';

export interface FigureResult {
  key: string;
  presetId: string;
  template: { templateId: string; n: number };
  renderKey: string;
  svg: string;
  readiness: ReadinessResult;
}

const CACHE_SIZE = 48;

@Injectable()
export class FiguresService {
  private readonly cache = new Map<string, Promise<FigureResult>>();

  constructor(
    private readonly models: ModelsService,
    private readonly analyses: AnalysesService,
    private readonly templates: TemplatesService,
  ) {}

  presets(): { id: string; name: string; widthMm: number }[] {
    return listPresets().map((p) => ({ id: p.id, name: p.name, widthMm: p.widthMm }));
  }

  /** The report of a version and of the analysed version before it (for comparison figures). */
  async reports(
    manuscriptId: string,
    versionId: string,
  ): Promise<{ report: Report; previous: Report | null }> {
    const v = await this.models.findVersion(manuscriptId, versionId);
    const report = await this.analyses.report(v.id);
    let previous: Report | null = null;
    let n = v.n;
    for (;;) {
      const p = await this.models.previous(manuscriptId, n);
      if (!p) break;
      const a = await this.analyses.get(p.id);
      if (a?.status === 'done') {
        previous = await this.analyses.report(p.id);
        break;
      }
      n = p.n;
    }
    return { report, previous };
  }

  parseParams(text: string | undefined): ParamValues {
    if (!text) return {};
    let v: unknown;
    try {
      v = JSON.parse(text);
    } catch {
      throw new BadRequestException(
        'params must be a JSON object such as {"markSize": 12}; check the quotes.',
      );
    }
    if (!v || typeof v !== 'object' || Array.isArray(v))
      throw new BadRequestException('params must be a JSON object such as {"markSize": 12}.');
    return v as ParamValues;
  }

  async render(
    manuscriptId: string,
    versionId: string,
    key: string,
    presetId: string,
    params: ParamValues,
    draft?: ResolvedTemplate,
  ): Promise<FigureResult> {
    const tpl = draft ?? (await this.templates.resolve(manuscriptId, key));
    if (tpl.kind !== 'figure' || !tpl.figure)
      throw new BadRequestException(
        `"${key}" is a table template; open it in the Methods table tab.`,
      );
    if (!listPresets().some((p) => p.id === presetId))
      throw new BadRequestException(
        `There is no preset "${presetId}"; choose one of ${listPresets()
          .map((p) => p.id)
          .join(', ')}.`,
      );
    const { report, previous } = await this.reports(manuscriptId, versionId);
    if (tpl.figure.manifest.needsComparison && !previous)
      throw new ConflictException(
        'This figure compares two versions; upload and analyse a second model version first.',
      );
    const renderKey = createHash('sha256')
      .update(
        JSON.stringify({
          report: report.input.sha256,
          engine: report.engine.version,
          reference: report.reference?.id ?? null,
          previous: tpl.figure.manifest.needsComparison ? (previous?.input.sha256 ?? null) : null,
          template: tpl.sha256,
          manifest: tpl.figure.manifest,
          presetId,
          params: Object.keys(params)
            .sort()
            .map((k) => [k, params[k]]),
        }),
      )
      .digest('hex');
    const hit = this.cache.get(renderKey);
    if (hit) return hit;
    const job = (async (): Promise<FigureResult> => {
      try {
        const fig = await renderFigure({
          report,
          previous,
          templateId: key,
          presetId,
          params,
          template: tpl.figure,
        });
        return {
          key,
          presetId,
          template: tpl.ref,
          renderKey,
          svg: fig.svg,
          readiness: fig.readiness,
        };
      } catch (e) {
        if (e instanceof FigureParameterError) throw new BadRequestException(e.message);
        throw new BadRequestException(
          `The figure could not be drawn: ${(e as Error).message.replace(/^The figure could not be drawn: /, '')}`,
        );
      }
    })();
    // failed renders are not cached: the next request tries again
    job.catch(() => this.cache.delete(renderKey));
    this.cache.set(renderKey, job);
    while (this.cache.size > CACHE_SIZE) this.cache.delete(this.cache.keys().next().value!);
    return job;
  }

  async exportBytes(
    fig: FigureResult,
    format: 'svg' | 'pdf' | 'png',
    dpi: number,
    title: string,
  ): Promise<{ bytes: Buffer; type: string }> {
    if (format === 'svg') return { bytes: Buffer.from(fig.svg, 'utf8'), type: 'image/svg+xml' };
    if (format === 'pdf')
      return { bytes: await svgToPdf(fig.svg, { title }), type: 'application/pdf' };
    return { bytes: svgToPng(fig.svg, dpi), type: 'image/png' };
  }
}
