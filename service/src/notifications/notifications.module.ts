import { Module } from '@nestjs/common';
import { AnalysesModule } from '../analyses/analyses.module.js';
import { CommentsModule } from '../comments/comments.module.js';
import { MailModule } from '../mail/mail.module.js';
import { ModelsModule } from '../models/models.module.js';
import { NotificationsController } from './notifications.controller.js';
import { NotificationsService } from './notifications.service.js';

@Module({
  imports: [MailModule, ModelsModule, AnalysesModule, CommentsModule],
  controllers: [NotificationsController],
  providers: [NotificationsService],
  exports: [NotificationsService],
})
export class NotificationsModule {}
