import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { Manuscript } from './manuscript.entity.js';
import { ManuscriptRoleGuard } from './manuscript-roles.js';
import { ManuscriptsController } from './manuscripts.controller.js';
import { ManuscriptsService } from './manuscripts.service.js';
import { MembersController } from './members.controller.js';
import { Membership } from './membership.entity.js';

@Module({
  imports: [TypeOrmModule.forFeature([Manuscript, Membership])],
  controllers: [ManuscriptsController, MembersController],
  providers: [ManuscriptsService, ManuscriptRoleGuard],
  exports: [ManuscriptsService, ManuscriptRoleGuard, TypeOrmModule],
})
export class ManuscriptsModule {}
