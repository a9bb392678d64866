import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { ModelVersion } from '../models/model-version.entity.js';
import { StorageModule } from '../storage/storage.module.js';
import { User } from '../users/user.entity.js';
import { PackageAuditEvent, ReviewLink, ReviewPackage } from './package.entities.js';
import { PackagesController, ReviewerController, VerifyController } from './packages.controller.js';
import { PackagesService } from './packages.service.js';

@Module({
  imports: [
    TypeOrmModule.forFeature([ReviewPackage, ReviewLink, PackageAuditEvent, ModelVersion, User]),
    StorageModule,
  ],
  controllers: [PackagesController, ReviewerController, VerifyController],
  providers: [PackagesService],
})
export class PackagesModule {}
