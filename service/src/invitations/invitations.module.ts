import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { MailModule } from '../mail/mail.module.js';
import { ManuscriptsModule } from '../manuscripts/manuscripts.module.js';
import { Invitation } from './invitation.entity.js';
import {
  InvitationsController,
  ManuscriptInvitationsController,
} from './invitations.controller.js';
import { InvitationsService } from './invitations.service.js';

@Module({
  imports: [TypeOrmModule.forFeature([Invitation]), ManuscriptsModule, MailModule],
  controllers: [ManuscriptInvitationsController, InvitationsController],
  providers: [InvitationsService],
  exports: [InvitationsService],
})
export class InvitationsModule {}
