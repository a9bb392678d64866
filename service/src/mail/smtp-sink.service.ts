import { Inject, Injectable, Logger, type OnApplicationShutdown } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { type AddressInfo } from 'node:net';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import { Repository } from 'typeorm';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { newId } from '../common/tokens.js';
import { MailMessage } from './mail-message.entity.js';

function addresses(a: AddressObject | AddressObject[] | undefined): string {
  const list = a === undefined ? [] : Array.isArray(a) ? a : [a];
  return list
    .flatMap((o) => o.value.map((v) => (v.address ?? '').toLowerCase()))
    .filter(Boolean)
    .join(', ');
}

/**
 * The fake SMTP server started with the service: it accepts mail on 127.0.0.1 only and stores
 * each message in MariaDB, where the admin Outbox reads it. Nothing is relayed anywhere.
 */
@Injectable()
export class SmtpSinkService implements OnApplicationShutdown {
  private readonly log = new Logger('SmtpSink');
  private server: SMTPServer | null = null;
  private boundPort = 0;

  constructor(
    @Inject(APP_CONFIG) private readonly cfg: AppConfig,
    @InjectRepository(MailMessage) private readonly messages: Repository<MailMessage>,
  ) {}

  get port(): number {
    return this.boundPort;
  }

  async start(): Promise<number> {
    if (this.server) return this.boundPort;
    const server = new SMTPServer({
      authOptional: true,
      disabledCommands: ['STARTTLS', 'AUTH'],
      banner: 'Foldfolio local mail sink',
      size: 10 * 1024 * 1024,
      logger: false,
      onData: (stream, _session, callback) => {
        simpleParser(stream)
          .then((parsed) =>
            this.messages.insert({
              id: newId(),
              from: addresses(parsed.from).slice(0, 320),
              to: addresses(parsed.to),
              subject: (parsed.subject ?? '').slice(0, 500),
              text: parsed.text ?? '',
              html: typeof parsed.html === 'string' ? parsed.html : null,
              receivedAt: new Date(),
            }),
          )
          .then(() => callback())
          .catch((err: Error) => {
            this.log.error(`could not store a message: ${err.message}`);
            callback(err);
          });
      },
    });
    await new Promise<void>((resolve, reject) => {
      server.once('error', (err: Error) =>
        reject(
          new Error(
            `the mail sink cannot listen on 127.0.0.1:${this.cfg.smtpPort} (${err.message}). Stop the other program using that port, or choose another with FOLDFOLIO_SMTP_PORT.`,
          ),
        ),
      );
      server.listen(this.cfg.smtpPort, '127.0.0.1', () => resolve());
    });
    server.on('error', (err) => this.log.error(err.message));
    this.server = server;
    this.boundPort = (server.server.address() as AddressInfo).port;
    this.log.log(`mail sink listening on 127.0.0.1:${this.boundPort}`);
    return this.boundPort;
  }

  async onApplicationShutdown(): Promise<void> {
    const s = this.server;
    this.server = null;
    if (s) await new Promise<void>((resolve) => s.close(() => resolve()));
  }
}
