import { Inject, Injectable, UnauthorizedException } from '@nestjs/common';
import { PassportStrategy } from '@nestjs/passport';
import { ExtractJwt, Strategy } from 'passport-jwt';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { User } from '../users/user.entity.js';
import { UsersService } from '../users/users.service.js';
import type { AccessClaims } from './auth.service.js';

export const JWT_ISSUER = 'foldfolio';

/** Reads `Authorization: Bearer <access token>`; the user must still exist and match. */
@Injectable()
export class JwtStrategy extends PassportStrategy(Strategy, 'jwt') {
  constructor(
    @Inject(APP_CONFIG) cfg: AppConfig,
    private readonly users: UsersService,
  ) {
    super({
      jwtFromRequest: ExtractJwt.fromAuthHeaderAsBearerToken(),
      secretOrKey: cfg.jwtSecret,
      algorithms: ['HS256'],
      issuer: JWT_ISSUER,
      ignoreExpiration: false,
    });
  }

  async validate(claims: AccessClaims): Promise<User> {
    const user = typeof claims.sub === 'string' ? await this.users.findById(claims.sub) : null;
    // A deleted account, or a password changed since the token was issued, ends the session.
    if (!user || user.tokenVersion !== claims.tv) {
      throw new UnauthorizedException('Your session has ended. Sign in again.');
    }
    return user;
  }
}
