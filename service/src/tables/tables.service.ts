/**
 * The methods table of a model version through the API: experimental values read from the
 * stored file, the saved form on top, computed values from the report, rendered from the
 * manuscript's pinned template version by helper-6's sandboxed renderer.
 */
import { BadRequestException, Injectable, UnprocessableEntityException } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { Repository } from 'typeorm';
import { EXPERIMENT_FIELDS, type ExperimentalStats } from '@foldfolio/shared';
import { AnalysesService } from '../analyses/analyses.service.js';
import { ModelsService } from '../models/models.service.js';
import { MethodsFormEntry } from '../templates/template.entities.js';
import { TemplatesService, type ResolvedTemplate } from '../templates/templates.service.js';
import type { User } from '../users/user.entity.js';
import { experimentFromBytes } from './cli.js';
import {
  defaultTableFor,
  renderTableHtml,
  toCsv,
  toDocx,
  toHtmlDocument,
  toLatex,
  toMarkdown,
  type RenderedTable,
} from './render.js';
import { TemplateError } from './sandbox.js';
import { collectValues, type MethodsForm, type TableValue } from './values.js';

export type TableFormat = 'html' | 'md' | 'tex' | 'csv' | 'docx';

export interface MethodsTableDto {
  key: string;
  template: { templateId: string; n: number };
  method: string;
  html: string;
  /** every value the table can show, with its origin and source */
  values: TableValue[];
  /** keys of the values the table shows */
  used: string[];
  form: MethodsForm;
  /** the experimental fields the form offers for the table's method, in table order */
  fields: { key: string; label: string; kind: 'number' | 'string' }[];
}

/** The experimental method a table slot is written for. */
function tableMethod(slot: string): 'x-ray' | 'electron-microscopy' | 'nmr' {
  return slot === 'methods-em' ? 'electron-microscopy' : slot === 'methods-nmr' ? 'nmr' : 'x-ray';
}

@Injectable()
export class TablesService {
  constructor(
    private readonly models: ModelsService,
    private readonly analyses: AnalysesService,
    private readonly templates: TemplatesService,
    @InjectRepository(MethodsFormEntry) private readonly forms: Repository<MethodsFormEntry>,
  ) {}

  async form(manuscriptId: string, versionId: string): Promise<MethodsForm> {
    await this.models.findVersion(manuscriptId, versionId);
    const row = await this.forms.findOneBy({ modelVersionId: versionId });
    return row ? (JSON.parse(row.valuesJson) as MethodsForm) : {};
  }

  private async inputs(manuscriptId: string, versionId: string) {
    const v = await this.models.findVersion(manuscriptId, versionId);
    const report = await this.analyses.report(v.id);
    const experiment: ExperimentalStats = await experimentFromBytes(
      new Uint8Array(await this.models.readBytes(v)),
    );
    return { report, experiment };
  }

  async saveForm(
    manuscriptId: string,
    versionId: string,
    user: User,
    values: MethodsForm,
  ): Promise<MethodsForm> {
    const { report, experiment } = await this.inputs(manuscriptId, versionId);
    try {
      collectValues(experiment, report, values);
    } catch (e) {
      throw new BadRequestException((e as Error).message);
    }
    // sorted keys: the same entries always store (and hash) the same text
    const sorted = Object.fromEntries(
      Object.entries(values).sort(([a], [b]) => a.localeCompare(b)),
    );
    await this.forms.save({
      modelVersionId: versionId,
      manuscriptId,
      valuesJson: JSON.stringify(sorted),
      updatedBy: user.id,
      updatedAt: new Date(),
    });
    return sorted;
  }

  async render(
    manuscriptId: string,
    versionId: string,
    key?: string,
    draft?: ResolvedTemplate,
  ): Promise<{ dto: MethodsTableDto; table: RenderedTable }> {
    const { report, experiment } = await this.inputs(manuscriptId, versionId);
    const form = await this.form(manuscriptId, versionId);
    const slot = draft?.key ?? key ?? defaultTableFor(report.method ?? experiment.method);
    const tpl = draft ?? (await this.templates.resolve(manuscriptId, slot));
    if (tpl.kind !== 'table' || !tpl.table)
      throw new BadRequestException(`"${slot}" is a figure template; open it in the Figures tab.`);
    let table: RenderedTable;
    try {
      table = renderTableHtml({ report, experiment, form, template: tpl.table });
    } catch (e) {
      if (e instanceof TemplateError)
        throw new UnprocessableEntityException({
          statusCode: 422,
          message: e.message,
          line: e.line,
        });
      throw new BadRequestException((e as Error).message);
    }
    const values = [...collectValues(experiment, report, form).values()].sort((a, b) =>
      a.key.localeCompare(b.key),
    );
    return {
      table,
      dto: {
        key: slot,
        template: tpl.ref,
        method: report.method ?? experiment.method,
        html: table.html,
        values,
        used: table.used.map((u) => u.key),
        form,
        fields: EXPERIMENT_FIELDS.filter(
          (f) => !f.methods || f.methods.includes(tableMethod(slot)),
        ).map((f) => ({ key: f.key, label: f.label, kind: f.kind })),
      },
    };
  }

  async exportBytes(
    table: RenderedTable,
    format: TableFormat,
  ): Promise<{ bytes: Buffer; type: string; ext: string }> {
    switch (format) {
      case 'html':
        return {
          bytes: Buffer.from(toHtmlDocument(table)),
          type: 'text/html; charset=utf-8',
          ext: 'html',
        };
      case 'md':
        return {
          bytes: Buffer.from(toMarkdown(table.model)),
          type: 'text/markdown; charset=utf-8',
          ext: 'md',
        };
      case 'tex':
        return {
          bytes: Buffer.from(toLatex(table.model)),
          type: 'application/x-tex; charset=utf-8',
          ext: 'tex',
        };
      case 'csv':
        return {
          bytes: Buffer.from(toCsv(table.model)),
          type: 'text/csv; charset=utf-8',
          ext: 'csv',
        };
      case 'docx':
        return {
          bytes: await toDocx(table.model),
          type: 'application/vnd.openxmlformats-officedocument.wordprocessingml.document',
          ext: 'docx',
        };
    }
  }
}
