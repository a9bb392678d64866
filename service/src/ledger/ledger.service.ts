import { BadRequestException, Injectable } from '@nestjs/common';
import { readStructure, type LedgerDto } from '@foldfolio/shared';
import { AnalysesService, analysisDto } from '../analyses/analyses.service.js';
import { ModelsService } from '../models/models.service.js';
import type { ModelVersion } from '../models/model-version.entity.js';
import { compareVersions, type LedgerSide } from './ledger.js';

@Injectable()
export class LedgerService {
  constructor(
    private readonly models: ModelsService,
    private readonly analyses: AnalysesService,
  ) {}

  private async side(v: ModelVersion): Promise<LedgerSide> {
    const a = analysisDto(await this.analyses.get(v.id));
    if (!a || a.status !== 'done' || !a.summary) {
      throw new BadRequestException(
        `Version ${v.n} has no finished analysis yet; compare it once its analysis is done.`,
      );
    }
    const [bytes, report] = await Promise.all([
      this.models.readBytes(v),
      this.analyses.report(v.id),
    ]);
    const structure = await readStructure(bytes, v.filename);
    return { id: v.id, n: v.n, structure, report, summary: a.summary };
  }

  /** `to` against `from`, or against the version just before `to` when `from` is not given. */
  async compare(manuscriptId: string, toId: string, fromId?: string): Promise<LedgerDto | null> {
    const to = await this.models.findVersion(manuscriptId, toId);
    const from = fromId
      ? await this.models.findVersion(manuscriptId, fromId)
      : await this.models.previous(manuscriptId, to.n);
    if (!from) return null; // the first version has nothing to compare with
    if (from.id === to.id) {
      throw new BadRequestException('Choose two different versions to compare.');
    }
    return compareVersions(await this.side(from), await this.side(to));
  }
}
