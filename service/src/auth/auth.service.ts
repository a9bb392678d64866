import {
  ConflictException,
  Inject,
  Injectable,
  UnauthorizedException,
  BadRequestException,
} from '@nestjs/common';
import { JwtService } from '@nestjs/jwt';
import { InjectDataSource, InjectRepository } from '@nestjs/typeorm';
import { DataSource, IsNull, Repository } from 'typeorm';
import type { SessionDto } from '@foldfolio/shared';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { hashToken, newId, newToken } from '../common/tokens.js';
import { MailService } from '../mail/mail.service.js';
import { toUserDto, User } from '../users/user.entity.js';
import { UsersService } from '../users/users.service.js';
import { RegisterDto, SignInDto } from './dto/auth.dto.js';
import { hashPassword, verifyPassword } from './password.js';
import { PasswordReset } from './password-reset.entity.js';
import { RefreshToken } from './refresh-token.entity.js';

/** Claims inside an access token. */
export interface AccessClaims {
  sub: string;
  /** The user's token version when it was issued. */
  tv: number;
}

export interface IssuedSession {
  session: SessionDto;
  /** Cookie value: `<token id>.<secret>`. */
  refreshCookie: string;
  refreshExpires: Date;
}

const INVALID_SIGN_IN =
  'That e-mail address and password do not match an account. Check both, or reset your password.';
const SESSION_ENDED = 'Your session has ended. Sign in again.';
const SESSION_RACE = 'Your session was just renewed in another tab. Reload the page.';

@Injectable()
export class AuthService {
  // A fixed bcrypt hash to compare against when the e-mail is unknown, so a wrong address takes
  // as long as a wrong password and does not reveal which accounts exist.
  private dummyHash: Promise<string>;

  constructor(
    @Inject(APP_CONFIG) private readonly cfg: AppConfig,
    private readonly users: UsersService,
    private readonly jwt: JwtService,
    private readonly mail: MailService,
    @InjectRepository(RefreshToken) private readonly refreshTokens: Repository<RefreshToken>,
    @InjectRepository(PasswordReset) private readonly resets: Repository<PasswordReset>,
    @InjectDataSource() private readonly db: DataSource,
  ) {
    this.dummyHash = hashPassword(newToken(), cfg.bcryptCost);
  }

  async register(dto: RegisterDto): Promise<IssuedSession> {
    if (await this.users.findByEmail(dto.email)) {
      throw new ConflictException(
        'An account with this e-mail address already exists. Sign in, or reset its password.',
      );
    }
    const user = await this.users.create(
      dto.email,
      dto.displayName,
      await hashPassword(dto.password, this.cfg.bcryptCost),
    );
    return this.issue(user, newId());
  }

  async signIn(dto: SignInDto): Promise<IssuedSession> {
    const user = await this.users.findByEmail(dto.email);
    const ok = await verifyPassword(dto.password, user?.passwordHash ?? (await this.dummyHash));
    if (!user || !ok) throw new UnauthorizedException(INVALID_SIGN_IN);
    return this.issue(user, newId());
  }

  /** Rotates the refresh token: the presented one is revoked and a new one issued. */
  async refresh(cookie: string | undefined): Promise<IssuedSession> {
    const found = await this.findRefresh(cookie);
    if (!found) throw new UnauthorizedException(SESSION_ENDED);
    const now = new Date();
    if (found.revokedAt) {
      // Two tabs of one browser may refresh at the same moment with the same cookie; the loser
      // is told to retry (its browser already holds the new cookie) instead of ending sessions.
      const recent =
        now.getTime() - found.revokedAt.getTime() < this.cfg.refreshReuseGraceSec * 1000;
      // (a family without a live token was ended by sign-out or a password reset: no race)
      if (
        recent &&
        (await this.refreshTokens.countBy({ familyId: found.familyId, revokedAt: IsNull() })) > 0
      ) {
        throw new UnauthorizedException(SESSION_RACE);
      }
      // A revoked token came back later: someone holds a copy. End every session of this family.
      await this.refreshTokens.update(
        { familyId: found.familyId, revokedAt: IsNull() },
        { revokedAt: now },
      );
      throw new UnauthorizedException(SESSION_ENDED);
    }
    if (found.expiresAt <= now) throw new UnauthorizedException(SESSION_ENDED);
    // Revoke only if nobody else revoked it in the meantime (two tabs refreshing at once).
    const res = await this.refreshTokens.update(
      { id: found.id, revokedAt: IsNull() },
      { revokedAt: now },
    );
    if (!res.affected) throw new UnauthorizedException(SESSION_ENDED);
    const user = await this.users.findById(found.userId);
    if (!user) throw new UnauthorizedException(SESSION_ENDED);
    return this.issue(user, found.familyId);
  }

  async signOut(cookie: string | undefined): Promise<void> {
    const found = await this.findRefresh(cookie);
    if (found) {
      await this.refreshTokens.update(
        { familyId: found.familyId, revokedAt: IsNull() },
        { revokedAt: new Date() },
      );
    }
  }

  /** Always succeeds, so the answer does not reveal whether an account exists. */
  async requestPasswordReset(email: string): Promise<void> {
    const user = await this.users.findByEmail(email);
    if (!user) return;
    const token = newToken();
    await this.resets.insert({
      id: newId(),
      userId: user.id,
      tokenHash: hashToken(token),
      expiresAt: new Date(Date.now() + this.cfg.passwordResetTtlMin * 60_000),
      usedAt: null,
    });
    await this.mail.send({
      to: user.email,
      subject: 'Reset your Foldfolio password',
      paragraphs: [
        `Hello ${user.displayName},`,
        `someone (we hope you) asked to reset the password of this Foldfolio account. The link works once, for ${this.cfg.passwordResetTtlMin} minutes. If it was not you, ignore this message; your password stays as it is.`,
      ],
      link: {
        label: 'Choose a new password',
        url: `${this.cfg.publicUrl}/reset-password/${encodeURIComponent(token)}`,
      },
    });
  }

  async confirmPasswordReset(token: string, password: string): Promise<void> {
    const reset = await this.resets.findOneBy({ tokenHash: hashToken(token) });
    if (!reset || reset.usedAt || reset.expiresAt <= new Date()) {
      throw new BadRequestException(
        'This reset link is invalid, expired or already used. Ask for a new one on the sign-in page.',
      );
    }
    const hash = await hashPassword(password, this.cfg.bcryptCost);
    await this.db.transaction(async (m) => {
      const claimed = await m.update(
        PasswordReset,
        { id: reset.id, usedAt: IsNull() },
        { usedAt: new Date() },
      );
      if (!claimed.affected) {
        throw new BadRequestException(
          'This reset link was just used. Ask for a new one on the sign-in page.',
        );
      }
      // A new password ends every existing session and outstanding access token.
      await m.update(User, { id: reset.userId }, { passwordHash: hash });
      await m.increment(User, { id: reset.userId }, 'tokenVersion', 1);
      await m.update(
        RefreshToken,
        { userId: reset.userId, revokedAt: IsNull() },
        { revokedAt: new Date() },
      );
    });
  }

  private async findRefresh(cookie: string | undefined): Promise<RefreshToken | null> {
    if (!cookie) return null;
    const dot = cookie.indexOf('.');
    if (dot !== 36) return null;
    const id = cookie.slice(0, dot);
    const row = await this.refreshTokens.findOneBy({ id });
    if (!row || row.tokenHash !== hashToken(cookie.slice(dot + 1))) return null;
    return row;
  }

  private async issue(user: User, familyId: string): Promise<IssuedSession> {
    const secret = newToken();
    const id = newId();
    const refreshExpires = new Date(Date.now() + this.cfg.refreshTokenTtlDays * 86_400_000);
    await this.refreshTokens.insert({
      id,
      userId: user.id,
      familyId,
      tokenHash: hashToken(secret),
      expiresAt: refreshExpires,
      revokedAt: null,
    });
    const claims: AccessClaims = { sub: user.id, tv: user.tokenVersion };
    const accessToken = await this.jwt.signAsync(claims);
    return {
      session: { user: toUserDto(user), accessToken, expiresIn: this.cfg.accessTokenTtlSec },
      refreshCookie: `${id}.${secret}`,
      refreshExpires,
    };
  }
}
