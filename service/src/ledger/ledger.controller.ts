import { Controller, Get, Param, ParseUUIDPipe, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiTags } from '@nestjs/swagger';
import type { LedgerDto } from '@foldfolio/shared';
import { AnyMember } from '../manuscripts/manuscript-roles.js';
import { LedgerService } from './ledger.service.js';
import { LedgerQuery } from './ledger.dto.js';

@ApiTags('models')
@ApiBearerAuth()
@Controller('manuscripts/:manuscriptId/models/:versionId/ledger')
export class LedgerController {
  constructor(private readonly ledger: LedgerService) {}

  /**
   * What changed in this version: against `?against=<version id>`, or by default against the
   * previous version (null for the first version).
   */
  @AnyMember()
  @Get()
  async compare(
    @Param('manuscriptId') manuscriptId: string,
    @Param('versionId', ParseUUIDPipe) versionId: string,
    @Query() q: LedgerQuery,
  ): Promise<{ ledger: LedgerDto | null }> {
    return { ledger: await this.ledger.compare(manuscriptId, versionId, q.against) };
  }
}
