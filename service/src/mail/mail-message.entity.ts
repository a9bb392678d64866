import { Column, Entity, PrimaryColumn } from 'typeorm';

/** A message received by the local SMTP sink (nothing leaves the machine). */
@Entity('mail_messages')
export class MailMessage {
  @PrimaryColumn({ type: 'char', length: 36 })
  id: string;

  @Column({ name: 'from_addr', type: 'varchar', length: 320 })
  from: string;

  /** Comma-separated recipients, lower-cased. */
  @Column({ name: 'to_addrs', type: 'text' })
  to: string;

  @Column({ type: 'varchar', length: 500 })
  subject: string;

  @Column({ name: 'text_body', type: 'mediumtext' })
  text: string;

  @Column({ name: 'html_body', type: 'mediumtext', nullable: true })
  html: string | null;

  @Column({ name: 'received_at', type: 'datetime', precision: 3 })
  receivedAt: Date;
}
