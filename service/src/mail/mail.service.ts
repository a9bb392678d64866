import { Inject, Injectable, ServiceUnavailableException } from '@nestjs/common';
import { createTransport, type Transporter } from 'nodemailer';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { escapeHtml } from '../common/html.js';
import { SmtpSinkService } from './smtp-sink.service.js';

export interface OutgoingMail {
  to: string;
  subject: string;
  /** Paragraphs of plain text; `link` is appended on its own line / as a button. */
  paragraphs: string[];
  link: { label: string; url: string };
}

/** Sends the service's e-mails over SMTP (to the local sink started with the service). */
@Injectable()
export class MailService {
  private transport: Transporter | null = null;
  private transportPort = 0;

  constructor(
    @Inject(APP_CONFIG) private readonly cfg: AppConfig,
    private readonly sink: SmtpSinkService,
  ) {}

  private getTransport(): Transporter {
    const port = this.sink.port || this.cfg.smtpPort;
    if (!this.transport || this.transportPort !== port) {
      this.transport = createTransport({
        host: '127.0.0.1',
        port,
        secure: false,
        ignoreTLS: true,
      });
      this.transportPort = port;
    }
    return this.transport;
  }

  async send(mail: OutgoingMail): Promise<void> {
    const text = [...mail.paragraphs, `${mail.link.label}: ${mail.link.url}`, '— Foldfolio'].join(
      '\n\n',
    );
    // Every piece of user text (titles, names) is escaped: the HTML part must never carry markup
    // someone typed into a manuscript title.
    const html = [
      '<div style="font-family: Georgia, serif; color: #1F2A44; max-width: 36em">',
      ...mail.paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`),
      `<p><a href="${escapeHtml(mail.link.url)}">${escapeHtml(mail.link.label)}</a></p>`,
      '<p>— Foldfolio</p></div>',
    ].join('\n');
    try {
      await this.getTransport().sendMail({
        from: 'Foldfolio <no-reply@foldfolio.invalid>',
        to: mail.to,
        subject: mail.subject,
        text,
        html,
      });
    } catch (err) {
      throw new ServiceUnavailableException(
        `The e-mail to ${mail.to} could not be sent (${(err as Error).message}). Try again in a minute; if it keeps failing, ask an admin to check that the service's mail sink is running.`,
      );
    }
  }
}
