import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { Analysis } from './analysis.entity.js';
import { AnalysesService } from './analyses.service.js';

@Module({
  imports: [TypeOrmModule.forFeature([Analysis])],
  providers: [AnalysesService],
  exports: [AnalysesService],
})
export class AnalysesModule {}
