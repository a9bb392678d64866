import { createParamDecorator, type ExecutionContext, SetMetadata } from '@nestjs/common';
import type { Request } from 'express';
import type { Membership } from '../manuscripts/membership.entity.js';
import type { User } from '../users/user.entity.js';

/** What the JWT strategy attaches to the request. */
export type AuthedRequest = Request & { user?: User; membership?: Membership };

export const CurrentUser = createParamDecorator((_: unknown, ctx: ExecutionContext): User => {
  const req = ctx.switchToHttp().getRequest<AuthedRequest>();
  if (!req.user) throw new Error('CurrentUser used on a route without authentication');
  return req.user;
});

/** The caller's membership, set by the manuscript role guard. */
export const CurrentMembership = createParamDecorator(
  (_: unknown, ctx: ExecutionContext): Membership => {
    const req = ctx.switchToHttp().getRequest<AuthedRequest>();
    if (!req.membership) throw new Error('CurrentMembership used on a non-manuscript route');
    return req.membership;
  },
);

export const IS_PUBLIC = 'foldfolio:public';
/** Marks a route that needs no signed-in user. */
export const Public = () => SetMetadata(IS_PUBLIC, true);
