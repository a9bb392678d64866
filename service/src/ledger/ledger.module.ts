import { Module } from '@nestjs/common';
import { AnalysesModule } from '../analyses/analyses.module.js';
import { ModelsModule } from '../models/models.module.js';
import { LedgerController } from './ledger.controller.js';
import { LedgerService } from './ledger.service.js';

@Module({
  imports: [ModelsModule, AnalysesModule],
  controllers: [LedgerController],
  providers: [LedgerService],
})
export class LedgerModule {}
