import {
  type CanActivate,
  type ExecutionContext,
  ForbiddenException,
  Injectable,
  Logger,
  NotFoundException,
  SetMetadata,
  UnauthorizedException,
} from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import { InjectRepository } from '@nestjs/typeorm';
import { Repository } from 'typeorm';
import { MEMBERSHIP_ROLES, type MembershipRole } from '@foldfolio/shared';
import { type AuthedRequest } from '../common/request-user.js';
import { isUuid } from '../common/tokens.js';
import { Membership } from './membership.entity.js';

export const MANUSCRIPT_ROLES = 'foldfolio:manuscript-roles';
/** The route parameter every manuscript route uses for the manuscript's id. */
export const MANUSCRIPT_PARAM = 'manuscriptId';

/** Which membership roles may call this manuscript route. */
export const ManuscriptRoles = (...roles: MembershipRole[]) => SetMetadata(MANUSCRIPT_ROLES, roles);
export const AnyMember = () => ManuscriptRoles(...MEMBERSHIP_ROLES);

const ROLE_NAMES: Record<MembershipRole, string> = {
  owner: 'owner',
  editor: 'editor',
  commenter: 'commenter',
  reviewer: 'reviewer',
};

/**
 * Global guard: every route with a `:manuscriptId` parameter needs a membership of the caller
 * with one of the roles named by @ManuscriptRoles. A route without that decorator is refused
 * (fail closed), so a new route can never be open by accident.
 */
@Injectable()
export class ManuscriptRoleGuard implements CanActivate {
  private readonly log = new Logger('ManuscriptRoleGuard');

  constructor(
    private readonly reflector: Reflector,
    @InjectRepository(Membership) private readonly memberships: Repository<Membership>,
  ) {}

  async canActivate(ctx: ExecutionContext): Promise<boolean> {
    const req = ctx.switchToHttp().getRequest<AuthedRequest>();
    const manuscriptId = (req.params as Record<string, string | undefined>)[MANUSCRIPT_PARAM];
    if (manuscriptId === undefined) return true;
    const allowed = this.reflector.getAllAndOverride<MembershipRole[] | undefined>(
      MANUSCRIPT_ROLES,
      [ctx.getHandler(), ctx.getClass()],
    );
    if (!allowed || allowed.length === 0) {
      this.log.error(`${req.method} ${req.route?.path ?? req.path} has no @ManuscriptRoles`);
      throw new ForbiddenException(
        'This action is not open to any role yet. Tell the Foldfolio developers which route you used.',
      );
    }
    if (!req.user) throw new UnauthorizedException('Sign in to continue.');
    const membership = isUuid(manuscriptId)
      ? await this.memberships.findOneBy({ manuscriptId, userId: req.user.id })
      : null;
    if (!membership) {
      // Same answer whether the manuscript exists or not: non-members learn nothing.
      throw new NotFoundException(
        'No manuscript with this address is shared with you. Check the link, or ask an owner to invite you.',
      );
    }
    if (!allowed.includes(membership.role)) {
      throw new ForbiddenException(
        `Your role on this manuscript (${ROLE_NAMES[membership.role]}) does not allow this. Ask an owner for the ${allowed.join(' or ')} role.`,
      );
    }
    req.membership = membership;
    return true;
  }
}
