import { ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectDataSource, InjectRepository } from '@nestjs/typeorm';
import { DataSource, EntityManager, Repository } from 'typeorm';
import type { ManuscriptDto, MemberDto, MembershipRole } from '@foldfolio/shared';
import { newId } from '../common/tokens.js';
import { User } from '../users/user.entity.js';
import { Manuscript } from './manuscript.entity.js';
import { Membership } from './membership.entity.js';

interface ManuscriptRow {
  id: string;
  title: string;
  status: 'active' | 'archived';
  role: MembershipRole;
  created_at: Date;
  last_activity_at: Date;
  member_count: string | number;
}

function toDto(r: ManuscriptRow): ManuscriptDto {
  return {
    id: r.id,
    title: r.title,
    status: r.status,
    role: r.role,
    memberCount: Number(r.member_count),
    createdAt: new Date(r.created_at).toISOString(),
    lastActivityAt: new Date(r.last_activity_at).toISOString(),
  };
}

const LAST_OWNER =
  'A manuscript needs at least one owner. Make another member an owner first, then try again.';

@Injectable()
export class ManuscriptsService {
  constructor(
    @InjectRepository(Manuscript) private readonly manuscripts: Repository<Manuscript>,
    @InjectRepository(Membership) private readonly memberships: Repository<Membership>,
    @InjectDataSource() private readonly db: DataSource,
  ) {}

  async create(user: User, title: string): Promise<ManuscriptDto> {
    const id = newId();
    const now = new Date();
    await this.db.transaction(async (m) => {
      await m.insert(Manuscript, {
        id,
        title,
        status: 'active',
        createdBy: user.id,
        lastActivityAt: now,
      });
      await m.insert(Membership, { id: newId(), manuscriptId: id, userId: user.id, role: 'owner' });
    });
    return this.getForUser(id, user.id);
  }

  /** The caller's manuscripts with their role, newest activity first. */
  async listForUser(userId: string, includeArchived: boolean): Promise<ManuscriptDto[]> {
    const rows: ManuscriptRow[] = await this.db.query(
      `SELECT ms.id, ms.title, ms.status, m.role, ms.created_at, ms.last_activity_at,
              (SELECT COUNT(*) FROM memberships x WHERE x.manuscript_id = ms.id) AS member_count
       FROM memberships m JOIN manuscripts ms ON ms.id = m.manuscript_id
       WHERE m.user_id = ? ${includeArchived ? '' : "AND ms.status = 'active'"}
       ORDER BY ms.last_activity_at DESC, ms.id`,
      [userId],
    );
    return rows.map(toDto);
  }

  async getForUser(manuscriptId: string, userId: string): Promise<ManuscriptDto> {
    const rows: ManuscriptRow[] = await this.db.query(
      `SELECT ms.id, ms.title, ms.status, m.role, ms.created_at, ms.last_activity_at,
              (SELECT COUNT(*) FROM memberships x WHERE x.manuscript_id = ms.id) AS member_count
       FROM memberships m JOIN manuscripts ms ON ms.id = m.manuscript_id
       WHERE m.user_id = ? AND ms.id = ?`,
      [userId, manuscriptId],
    );
    if (rows.length === 0) {
      throw new NotFoundException('No manuscript with this address is shared with you.');
    }
    return toDto(rows[0]);
  }

  async rename(manuscriptId: string, userId: string, title: string): Promise<ManuscriptDto> {
    const ms = await this.manuscripts.findOneByOrFail({ id: manuscriptId });
    if (ms.status === 'archived') {
      throw new ConflictException('This manuscript is archived. Restore it first, then rename it.');
    }
    await this.manuscripts.update({ id: manuscriptId }, { title, lastActivityAt: new Date() });
    return this.getForUser(manuscriptId, userId);
  }

  async setStatus(
    manuscriptId: string,
    userId: string,
    status: 'active' | 'archived',
  ): Promise<ManuscriptDto> {
    await this.manuscripts.update({ id: manuscriptId }, { status, lastActivityAt: new Date() });
    return this.getForUser(manuscriptId, userId);
  }

  async touch(manuscriptId: string, m: EntityManager = this.db.manager): Promise<void> {
    await m.update(Manuscript, { id: manuscriptId }, { lastActivityAt: new Date() });
  }

  async members(manuscriptId: string): Promise<MemberDto[]> {
    const rows = await this.memberships.find({
      where: { manuscriptId },
      relations: { user: true },
      order: { createdAt: 'ASC' },
    });
    return rows.map((r) => ({
      userId: r.userId,
      email: r.user?.email ?? '',
      displayName: r.user?.displayName ?? '',
      role: r.role,
      joinedAt: r.createdAt.toISOString(),
    }));
  }

  /** Adds a member, or keeps the better of the two roles if they are one already. */
  async addMember(
    m: EntityManager,
    manuscriptId: string,
    userId: string,
    role: MembershipRole,
  ): Promise<MembershipRole> {
    const existing = await m.findOneBy(Membership, { manuscriptId, userId });
    if (existing) return existing.role;
    await m.insert(Membership, { id: newId(), manuscriptId, userId, role });
    await this.touch(manuscriptId, m);
    return role;
  }

  async changeRole(manuscriptId: string, userId: string, role: MembershipRole): Promise<MemberDto> {
    await this.db.transaction(async (m) => {
      const target = await this.lockMember(m, manuscriptId, userId);
      if (target.role === 'owner' && role !== 'owner') await this.ensureOtherOwner(m, manuscriptId);
      await m.update(Membership, { id: target.id }, { role });
      await this.touch(manuscriptId, m);
    });
    const members = await this.members(manuscriptId);
    return members.find((x) => x.userId === userId) as MemberDto;
  }

  async removeMember(manuscriptId: string, userId: string): Promise<void> {
    await this.db.transaction(async (m) => {
      const target = await this.lockMember(m, manuscriptId, userId);
      if (target.role === 'owner') await this.ensureOtherOwner(m, manuscriptId);
      await m.delete(Membership, { id: target.id });
      await this.touch(manuscriptId, m);
    });
  }

  private async lockMember(m: EntityManager, manuscriptId: string, userId: string) {
    // Lock the manuscript's memberships so two owners demoting each other cannot leave none.
    const rows = await m
      .getRepository(Membership)
      .createQueryBuilder('m')
      .setLock('pessimistic_write')
      .where('m.manuscript_id = :manuscriptId', { manuscriptId })
      .getMany();
    const target = rows.find((r) => r.userId === userId);
    if (!target) {
      throw new NotFoundException(
        'This person is not a member of the manuscript. Reload the list.',
      );
    }
    return target;
  }

  private async ensureOtherOwner(m: EntityManager, manuscriptId: string): Promise<void> {
    const owners = await m.countBy(Membership, { manuscriptId, role: 'owner' });
    if (owners <= 1) throw new ConflictException(LAST_OWNER);
  }
}
