import {
  type CanActivate,
  type ExecutionContext,
  ForbiddenException,
  Injectable,
  UnauthorizedException,
  UseGuards,
  applyDecorators,
} from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import { AuthGuard } from '@nestjs/passport';
import { type AuthedRequest, IS_PUBLIC } from '../common/request-user.js';
import { isDatabaseOutage } from '../common/database-unavailable.filter.js';

/** Global: every route needs a valid access token unless it is marked @Public(). */
@Injectable()
export class JwtAuthGuard extends AuthGuard('jwt') {
  constructor(private readonly reflector: Reflector) {
    super();
  }

  override canActivate(ctx: ExecutionContext) {
    const isPublic = this.reflector.getAllAndOverride<boolean>(IS_PUBLIC, [
      ctx.getHandler(),
      ctx.getClass(),
    ]);
    if (isPublic) return true;
    return super.canActivate(ctx);
  }

  override handleRequest<TUser>(err: unknown, user: TUser | false): TUser {
    if (err instanceof UnauthorizedException) throw err;
    // the database being down is not a bad session: let it surface as 503, not sign the user out
    if (isDatabaseOutage(err)) throw err;
    if (err || !user) {
      throw new UnauthorizedException(
        'Sign in to continue: your session is missing, has expired or is not valid.',
      );
    }
    return user;
  }
}

@Injectable()
export class AdminGuard implements CanActivate {
  canActivate(ctx: ExecutionContext): boolean {
    const req = ctx.switchToHttp().getRequest<AuthedRequest>();
    if (req.user?.siteRole !== 'admin') {
      throw new ForbiddenException('Only site admins can do this. Ask an admin for help.');
    }
    return true;
  }
}

/** The route is for site admins only. */
export const AdminOnly = () => applyDecorators(UseGuards(AdminGuard));
