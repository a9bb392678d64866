import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { MailMessage } from './mail-message.entity.js';
import { MailService } from './mail.service.js';
import { OutboxService } from './outbox.service.js';
import { SmtpSinkService } from './smtp-sink.service.js';

@Module({
  imports: [TypeOrmModule.forFeature([MailMessage])],
  providers: [MailService, SmtpSinkService, OutboxService],
  exports: [MailService, SmtpSinkService, OutboxService, TypeOrmModule],
})
export class MailModule {}
