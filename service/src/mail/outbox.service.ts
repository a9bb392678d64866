import { Injectable, NotFoundException } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { Repository } from 'typeorm';
import type { MailMessageDto, MailMessageSummaryDto } from '@foldfolio/shared';
import { MailMessage } from './mail-message.entity.js';

/** http(s) URLs up to the first space, angle bracket or quote. */
const LINK = /https?:\/\/[^\s<>"']+/g;

export function extractLinks(text: string): string[] {
  return [...new Set(text.match(LINK) ?? [])];
}

/** What the admin Outbox page reads: messages received by the local mail sink. */
@Injectable()
export class OutboxService {
  constructor(@InjectRepository(MailMessage) private readonly messages: Repository<MailMessage>) {}

  async list(limit = 200): Promise<MailMessageSummaryDto[]> {
    const rows = await this.messages.find({
      select: { id: true, to: true, subject: true, receivedAt: true },
      order: { receivedAt: 'DESC', id: 'ASC' },
      take: limit,
    });
    return rows.map((r) => ({
      id: r.id,
      to: r.to,
      subject: r.subject,
      receivedAt: r.receivedAt.toISOString(),
    }));
  }

  async get(id: string): Promise<MailMessageDto> {
    const r = await this.messages.findOneBy({ id });
    if (!r) throw new NotFoundException('No message with this id in the Outbox. Reload the list.');
    return {
      id: r.id,
      from: r.from,
      to: r.to,
      subject: r.subject,
      receivedAt: r.receivedAt.toISOString(),
      text: r.text,
      links: extractLinks(r.text),
    };
  }
}
