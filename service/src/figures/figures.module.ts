import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { AnalysesModule } from '../analyses/analyses.module.js';
import { ModelsModule } from '../models/models.module.js';
import { TablesService } from '../tables/tables.service.js';
import { MethodsFormEntry } from '../templates/template.entities.js';
import { TemplatesModule } from '../templates/templates.module.js';
import { FiguresController } from './figures.controller.js';
import { FiguresService } from './figures.service.js';

/** Figure and methods-table endpoints (rendering itself lives in figures/render.ts, tables/render.ts). */
@Module({
  imports: [
    TypeOrmModule.forFeature([MethodsFormEntry]),
    ModelsModule,
    AnalysesModule,
    TemplatesModule,
  ],
  controllers: [FiguresController],
  providers: [FiguresService, TablesService],
})
export class FiguresModule {}
