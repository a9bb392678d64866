import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { AnalysesModule } from '../analyses/analyses.module.js';
import { StorageModule } from '../storage/storage.module.js';
import { ModelVersion } from './model-version.entity.js';
import { ModelsController } from './models.controller.js';
import { ModelsService } from './models.service.js';

@Module({
  imports: [TypeOrmModule.forFeature([ModelVersion]), StorageModule, AnalysesModule],
  controllers: [ModelsController],
  providers: [ModelsService],
  exports: [ModelsService],
})
export class ModelsModule {}
