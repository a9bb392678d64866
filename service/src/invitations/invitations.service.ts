import {
  ConflictException,
  ForbiddenException,
  GoneException,
  Inject,
  Injectable,
  NotFoundException,
} from '@nestjs/common';
import { InjectDataSource, InjectRepository } from '@nestjs/typeorm';
import { DataSource, IsNull, Repository } from 'typeorm';
import type {
  AcceptInvitationResult,
  InvitationDto,
  InvitationPreviewDto,
  MembershipRole,
} from '@foldfolio/shared';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { hashToken, newId, newToken } from '../common/tokens.js';
import { MailService } from '../mail/mail.service.js';
import { Manuscript } from '../manuscripts/manuscript.entity.js';
import { Membership } from '../manuscripts/membership.entity.js';
import { ManuscriptsService } from '../manuscripts/manuscripts.service.js';
import { User } from '../users/user.entity.js';
import { Invitation } from './invitation.entity.js';

const ROLE_WORDS: Record<MembershipRole, string> = {
  owner: 'an owner (manages members and everything else)',
  editor: 'an editor (uploads models, edits figures and tables)',
  commenter: 'a commenter (reads everything and comments)',
  reviewer: 'a reviewer (reads and comments)',
};

const NOT_VALID =
  'This invitation link is not valid. Open the link from the e-mail again, or ask the manuscript owner for a new invitation.';

@Injectable()
export class InvitationsService {
  constructor(
    @Inject(APP_CONFIG) private readonly cfg: AppConfig,
    @InjectRepository(Invitation) private readonly invitations: Repository<Invitation>,
    @InjectRepository(Manuscript) private readonly manuscripts: Repository<Manuscript>,
    @InjectDataSource() private readonly db: DataSource,
    private readonly manuscriptsService: ManuscriptsService,
    private readonly mail: MailService,
  ) {}

  async invite(
    manuscriptId: string,
    inviter: User,
    email: string,
    role: MembershipRole,
  ): Promise<InvitationDto> {
    const ms = await this.manuscripts.findOneByOrFail({ id: manuscriptId });
    const already: Array<{ n: string | number }> = await this.db.query(
      `SELECT COUNT(*) AS n FROM memberships m JOIN users u ON u.id = m.user_id
       WHERE m.manuscript_id = ? AND u.email = ?`,
      [manuscriptId, email],
    );
    if (Number(already[0].n) > 0) {
      throw new ConflictException(
        `${email} is already a member of this manuscript. Change their role in the member list instead.`,
      );
    }
    // Inviting the same address again replaces its open invitation: only the newest link works.
    await this.invitations.update(
      { manuscriptId, email, acceptedAt: IsNull(), revokedAt: IsNull() },
      { revokedAt: new Date() },
    );
    const token = newToken();
    const inv: Invitation = {
      id: newId(),
      manuscriptId,
      email,
      role,
      tokenHash: hashToken(token),
      invitedBy: inviter.id,
      expiresAt: new Date(Date.now() + this.cfg.invitationTtlDays * 86_400_000),
      acceptedAt: null,
      acceptedBy: null,
      revokedAt: null,
      createdAt: new Date(),
    };
    await this.invitations.insert(inv);
    await this.manuscriptsService.touch(manuscriptId);
    await this.mail.send({
      to: email,
      subject: `${inviter.displayName} invites you to a manuscript on Foldfolio`,
      paragraphs: [
        'Hello,',
        `${inviter.displayName} (${inviter.email}) invites you to join the manuscript “${ms.title}” as ${ROLE_WORDS[role]}.`,
        `The link works once and expires in ${this.cfg.invitationTtlDays} days. Sign in or create an account with this e-mail address (${email}) to accept.`,
      ],
      link: {
        label: 'Open the invitation',
        url: `${this.cfg.publicUrl}/invitations/${encodeURIComponent(token)}`,
      },
    });
    return this.toDto(inv, inviter.displayName);
  }

  async list(manuscriptId: string): Promise<InvitationDto[]> {
    const rows: Array<Invitation & { inviterName: string | null }> = await this.invitations
      .createQueryBuilder('i')
      .leftJoin(User, 'u', 'u.id = i.invited_by')
      .addSelect('u.display_name', 'inviterName')
      .where('i.manuscript_id = :manuscriptId', { manuscriptId })
      .orderBy('i.created_at', 'DESC')
      .getRawAndEntities()
      .then(({ raw, entities }) =>
        entities.map((e, k) => ({
          ...e,
          inviterName: (raw[k] as { inviterName: string | null }).inviterName,
        })),
      );
    return rows.map((r) => this.toDto(r, r.inviterName ?? ''));
  }

  async revoke(manuscriptId: string, invitationId: string): Promise<void> {
    const res = await this.invitations.update(
      { id: invitationId, manuscriptId, acceptedAt: IsNull(), revokedAt: IsNull() },
      { revokedAt: new Date() },
    );
    if (!res.affected) {
      throw new NotFoundException(
        'No open invitation with this id on this manuscript. Reload the invitation list.',
      );
    }
  }

  async preview(token: string): Promise<InvitationPreviewDto> {
    const inv = await this.findUsable(token);
    const ms = await this.manuscripts.findOneByOrFail({ id: inv.manuscriptId });
    const inviter = inv.invitedBy
      ? await this.db.manager.findOneBy(User, { id: inv.invitedBy })
      : null;
    return {
      manuscriptTitle: ms.title,
      email: inv.email,
      role: inv.role,
      invitedBy: inviter?.displayName ?? '',
      expiresAt: inv.expiresAt.toISOString(),
    };
  }

  /** Accepting creates the membership; the token is spent in the same transaction. */
  async accept(token: string, user: User): Promise<AcceptInvitationResult> {
    const inv = await this.findUsable(token);
    if (inv.email !== user.email) {
      throw new ForbiddenException(
        `This invitation is for ${inv.email}, but you are signed in as ${user.email}. Sign in with the invited address, or ask the owner to invite ${user.email}.`,
      );
    }
    return this.db.transaction(async (m) => {
      const claimed = await m.update(
        Invitation,
        { id: inv.id, acceptedAt: IsNull(), revokedAt: IsNull() },
        { acceptedAt: new Date(), acceptedBy: user.id },
      );
      if (!claimed.affected) throw new GoneException(this.spentMessage());
      const role = await this.manuscriptsService.addMember(m, inv.manuscriptId, user.id, inv.role);
      const membership = await m.findOneByOrFail(Membership, {
        manuscriptId: inv.manuscriptId,
        userId: user.id,
      });
      return { manuscriptId: inv.manuscriptId, role: membership.role ?? role };
    });
  }

  private spentMessage(): string {
    return 'This invitation was already used or withdrawn. Ask the manuscript owner for a new one.';
  }

  private async findUsable(token: string): Promise<Invitation> {
    const inv =
      token.length >= 20 && token.length <= 100
        ? await this.invitations.findOneBy({ tokenHash: hashToken(token) })
        : null;
    if (!inv) throw new NotFoundException(NOT_VALID);
    if (inv.acceptedAt || inv.revokedAt) throw new GoneException(this.spentMessage());
    if (inv.expiresAt <= new Date()) {
      throw new GoneException(
        'This invitation has expired (they last 7 days). Ask the manuscript owner to invite you again.',
      );
    }
    return inv;
  }

  private toDto(inv: Invitation, invitedBy: string): InvitationDto {
    const state: InvitationDto['state'] = inv.acceptedAt
      ? 'accepted'
      : inv.revokedAt
        ? 'revoked'
        : inv.expiresAt <= new Date()
          ? 'expired'
          : 'pending';
    return {
      id: inv.id,
      email: inv.email,
      role: inv.role,
      invitedBy,
      createdAt: inv.createdAt.toISOString(),
      expiresAt: inv.expiresAt.toISOString(),
      state,
    };
  }
}
