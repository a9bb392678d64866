import { ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectDataSource, InjectRepository } from '@nestjs/typeorm';
import { DataSource, Repository } from 'typeorm';
import type { AdminUserDto, SiteRole } from '@foldfolio/shared';
import { newId } from '../common/tokens.js';
import { toUserDto, User } from './user.entity.js';

@Injectable()
export class UsersService {
  constructor(
    @InjectRepository(User) private readonly users: Repository<User>,
    @InjectDataSource() private readonly db: DataSource,
  ) {}

  findByEmail(email: string): Promise<User | null> {
    return this.users.findOneBy({ email: email.trim().toLowerCase() });
  }

  findById(id: string): Promise<User | null> {
    return this.users.findOneBy({ id });
  }

  /** The first account of a fresh install becomes its admin, so someone can see the Outbox. */
  async create(email: string, displayName: string, passwordHash: string): Promise<User> {
    const id = newId();
    try {
      await this.db.transaction(async (m) => {
        const admins = await m.query(
          "SELECT COUNT(*) AS n FROM users WHERE site_role = 'admin' FOR UPDATE",
        );
        const siteRole: SiteRole = Number(admins[0].n) === 0 ? 'admin' : 'user';
        await m.insert(User, {
          id,
          email: email.trim().toLowerCase(),
          displayName,
          passwordHash,
          siteRole,
          tokenVersion: 0,
        });
      });
    } catch (err) {
      if ((err as { code?: string }).code === 'ER_DUP_ENTRY') {
        throw new ConflictException(
          'An account with this e-mail address already exists. Sign in, or reset its password.',
        );
      }
      throw err;
    }
    return (await this.findById(id)) as User;
  }

  async listForAdmin(): Promise<AdminUserDto[]> {
    const rows: Array<{ id: string; n: string | number }> = await this.db.query(
      'SELECT u.id, COUNT(m.id) AS n FROM users u LEFT JOIN memberships m ON m.user_id = u.id GROUP BY u.id',
    );
    const counts = new Map(rows.map((r) => [r.id, Number(r.n)]));
    const users = await this.users.find({ order: { createdAt: 'ASC', email: 'ASC' } });
    return users.map((u) => ({ ...toUserDto(u), manuscriptCount: counts.get(u.id) ?? 0 }));
  }

  async setSiteRole(actor: User, userId: string, siteRole: SiteRole): Promise<AdminUserDto> {
    const user = await this.mustFind(userId);
    if (user.siteRole === 'admin' && siteRole !== 'admin') await this.ensureAnotherAdmin(user);
    await this.users.update({ id: user.id }, { siteRole });
    const list = await this.listForAdmin();
    return list.find((u) => u.id === user.id) as AdminUserDto;
  }

  /** Deletes an account; refused while it is the only owner of a manuscript or the last admin. */
  async delete(userId: string): Promise<void> {
    const user = await this.mustFind(userId);
    if (user.siteRole === 'admin') await this.ensureAnotherAdmin(user);
    const sole: Array<{ title: string }> = await this.db.query(
      `SELECT ms.title FROM memberships m JOIN manuscripts ms ON ms.id = m.manuscript_id
       WHERE m.user_id = ? AND m.role = 'owner'
         AND (SELECT COUNT(*) FROM memberships o WHERE o.manuscript_id = m.manuscript_id AND o.role = 'owner') = 1`,
      [user.id],
    );
    if (sole.length > 0) {
      throw new ConflictException(
        `${user.displayName} is the only owner of ${sole.length} manuscript(s) (first: "${sole[0].title}"). Make another member an owner first, then delete the account.`,
      );
    }
    await this.users.delete({ id: user.id });
  }

  private async mustFind(userId: string): Promise<User> {
    const user = await this.findById(userId);
    if (!user) throw new NotFoundException('No account has this id. Reload the user list.');
    return user;
  }

  private async ensureAnotherAdmin(user: User): Promise<void> {
    const admins = await this.users.countBy({ siteRole: 'admin' });
    if (admins <= 1) {
      throw new ConflictException(
        `${user.displayName} is the last admin. Make someone else an admin first.`,
      );
    }
  }
}
