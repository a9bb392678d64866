import { Inject, Injectable, Logger, type OnModuleInit } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import type { MembershipRole } from '@foldfolio/shared';
import { AnalysesService, type AnalysisOutcome } from '../analyses/analyses.service.js';
import { CommentsService, type MentionEvent } from '../comments/comments.service.js';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { MailService, type OutgoingMail } from '../mail/mail.service.js';
import { ModelsService, type VersionCreated } from '../models/models.service.js';

interface Recipient {
  user_id: string;
  email: string;
  display_name: string;
  role: MembershipRole;
}

/**
 * E-mails members about what happens on their manuscripts: a new model version, a finished or
 * failed analysis, and being @mentioned. A member who muted the manuscript gets none of these
 * (invitations are sent by the invitations module to people who are not members yet).
 */
@Injectable()
export class NotificationsService implements OnModuleInit {
  private readonly log = new Logger('Notifications');
  /** sends in flight, so tests and shutdown can wait for them */
  private pending = new Set<Promise<void>>();

  constructor(
    @Inject(APP_CONFIG) private readonly cfg: AppConfig,
    @InjectDataSource() private readonly db: DataSource,
    private readonly mail: MailService,
    private readonly models: ModelsService,
    private readonly analyses: AnalysesService,
    private readonly comments: CommentsService,
  ) {}

  onModuleInit(): void {
    this.models.created.on('created', (e: VersionCreated) => this.track(this.onVersion(e)));
    this.analyses.finished.on('finished', (e: AnalysisOutcome) => this.track(this.onAnalysis(e)));
    this.comments.events.on('mentioned', (e: MentionEvent) => this.track(this.onMention(e)));
  }

  private track(p: Promise<void>): void {
    const q = p.catch((err: Error) => this.log.warn(`notification not sent: ${err.message}`));
    this.pending.add(q);
    void q.finally(() => this.pending.delete(q));
  }

  /** Resolves when every notification started so far has been handed to the mail sink. */
  async idle(): Promise<void> {
    while (this.pending.size > 0) await Promise.all([...this.pending]);
  }

  async isMuted(manuscriptId: string, userId: string): Promise<boolean> {
    const rows: unknown[] = await this.db.query(
      'SELECT 1 FROM notification_mutes WHERE manuscript_id = ? AND user_id = ?',
      [manuscriptId, userId],
    );
    return rows.length > 0;
  }

  async setMuted(manuscriptId: string, userId: string, muted: boolean): Promise<void> {
    if (muted) {
      await this.db.query(
        'INSERT IGNORE INTO notification_mutes (manuscript_id, user_id) VALUES (?, ?)',
        [manuscriptId, userId],
      );
    } else {
      await this.db.query(
        'DELETE FROM notification_mutes WHERE manuscript_id = ? AND user_id = ?',
        [manuscriptId, userId],
      );
    }
  }

  /** Members with one of `roles`, minus those who muted the manuscript. */
  private async recipients(
    manuscriptId: string,
    roles: MembershipRole[],
    userIds?: string[],
  ): Promise<Recipient[]> {
    const params: unknown[] = [manuscriptId, ...roles];
    let extra = '';
    if (userIds) {
      if (userIds.length === 0) return [];
      extra = ` AND m.user_id IN (${userIds.map(() => '?').join(',')})`;
      params.push(...userIds);
    }
    return this.db.query(
      `SELECT m.user_id, u.email, u.display_name, m.role FROM memberships m
         JOIN users u ON u.id = m.user_id
         LEFT JOIN notification_mutes n ON n.manuscript_id = m.manuscript_id AND n.user_id = m.user_id
       WHERE m.manuscript_id = ? AND m.role IN (${roles.map(() => '?').join(',')}) AND n.user_id IS NULL${extra}
       ORDER BY u.email`,
      params,
    );
  }

  private async title(manuscriptId: string): Promise<string> {
    const rows: { title: string }[] = await this.db.query(
      'SELECT title FROM manuscripts WHERE id = ?',
      [manuscriptId],
    );
    return rows[0]?.title ?? 'a manuscript';
  }

  private link(manuscriptId: string, tab: string): string {
    return `${this.cfg.publicUrl}/manuscripts/${manuscriptId}/${tab}`;
  }

  private async sendAll(to: Recipient[], build: (r: Recipient) => OutgoingMail): Promise<void> {
    for (const r of to) await this.mail.send(build(r));
  }

  private async onVersion(e: VersionCreated): Promise<void> {
    const title = await this.title(e.manuscriptId);
    const to = (await this.recipients(e.manuscriptId, ['owner', 'editor', 'commenter'])).filter(
      (r) => r.user_id !== e.uploader.id,
    );
    const v = e.version;
    await this.sendAll(to, (r) => ({
      to: r.email,
      subject: `New model version ${v.n} of “${title}”`,
      paragraphs: [
        `Hello ${r.display_name},`,
        `${e.uploader.displayName} uploaded version ${v.n} (${v.filename}) of the model for “${title}”.${v.note ? ` Their note: ${v.note}` : ''}`,
        'Foldfolio is analysing it now; the Quality tab shows the results and what changed since the previous version.',
        'To stop these e-mails for this manuscript, turn notifications off in its Models tab.',
      ],
      link: { label: 'Open the Models tab', url: this.link(e.manuscriptId, 'models') },
    }));
  }

  private async onAnalysis(e: AnalysisOutcome): Promise<void> {
    const rows: {
      manuscript_id: string;
      n: number;
      filename: string;
      uploaded_by: string | null;
    }[] = await this.db.query(
      'SELECT manuscript_id, n, filename, uploaded_by FROM model_versions WHERE id = ?',
      [e.modelVersionId],
    );
    if (rows.length === 0) return;
    const v = rows[0];
    const title = await this.title(v.manuscript_id);
    // the uploader and everyone who can act on the result
    const to = (await this.recipients(v.manuscript_id, ['owner', 'editor'])).concat(
      v.uploaded_by ? await this.recipients(v.manuscript_id, ['commenter'], [v.uploaded_by]) : [],
    );
    const ok = e.status === 'done';
    await this.sendAll(to, (r) => ({
      to: r.email,
      subject: ok
        ? `Analysis of version ${v.n} of “${title}” is ready`
        : `Analysis of version ${v.n} of “${title}” failed`,
      paragraphs: ok
        ? [
            `Hello ${r.display_name},`,
            `The validation statistics of version ${v.n} (${v.filename}) are ready.`,
            'They support, and do not replace, your own judgement and the journal’s and archive’s requirements.',
          ]
        : [
            `Hello ${r.display_name},`,
            `Foldfolio could not analyse version ${v.n} (${v.filename}). The reason: ${e.error ?? 'unknown'}`,
            'Fix the file and upload it as a new version.',
          ],
      link: {
        label: ok ? 'Open the Quality tab' : 'Open the Models tab',
        url: this.link(v.manuscript_id, ok ? 'quality' : 'models'),
      },
    }));
  }

  private async onMention(e: MentionEvent): Promise<void> {
    const title = await this.title(e.manuscriptId);
    const to = await this.recipients(
      e.manuscriptId,
      ['owner', 'editor', 'commenter'],
      e.mentionedUserIds,
    );
    await this.sendAll(to, (r) => ({
      to: r.email,
      subject: `${e.author.displayName} mentioned you on “${title}”`,
      paragraphs: [
        `Hello ${r.display_name},`,
        `${e.author.displayName} mentioned you in a comment:`,
        e.comment.bodyMarkdown.length > 1000
          ? `${e.comment.bodyMarkdown.slice(0, 1000)}…`
          : e.comment.bodyMarkdown,
      ],
      link: { label: 'Open the discussion', url: this.link(e.manuscriptId, 'discussion') },
    }));
  }
}
