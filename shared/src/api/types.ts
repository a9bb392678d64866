// The JSON shapes of the Foldfolio REST API (`/api`), shared by the service and the UI's typed
// client. Dates travel as ISO 8601 strings. The service's OpenAPI document at `/api/docs`
// describes the same routes.

export type SiteRole = 'admin' | 'user';
export type MembershipRole = 'owner' | 'editor' | 'commenter' | 'reviewer';
export const MEMBERSHIP_ROLES: readonly MembershipRole[] = [
  'owner',
  'editor',
  'commenter',
  'reviewer',
];
export type ManuscriptStatus = 'active' | 'archived';

/** Every error body: `message` is a sentence saying what to do next. */
export interface ApiError {
  statusCode: number;
  message: string;
  /** Validation failures per field (only on 400). */
  fields?: Record<string, string[]>;
}

export interface UserDto {
  id: string;
  email: string;
  displayName: string;
  siteRole: SiteRole;
  createdAt: string;
}

/** Returned by register, sign-in and refresh; the refresh token travels in an httpOnly cookie. */
export interface SessionDto {
  user: UserDto;
  accessToken: string;
  /** Seconds until the access token expires. */
  expiresIn: number;
}

export interface RegisterBody {
  email: string;
  displayName: string;
  password: string;
}
export interface SignInBody {
  email: string;
  password: string;
}
export interface PasswordResetRequestBody {
  email: string;
}
export interface PasswordResetConfirmBody {
  token: string;
  password: string;
}

export interface ManuscriptDto {
  id: string;
  title: string;
  status: ManuscriptStatus;
  /** The caller's role on this manuscript. */
  role: MembershipRole;
  memberCount: number;
  createdAt: string;
  lastActivityAt: string;
}
export interface CreateManuscriptBody {
  title: string;
}
export interface RenameManuscriptBody {
  title: string;
}

export interface MemberDto {
  userId: string;
  email: string;
  displayName: string;
  role: MembershipRole;
  joinedAt: string;
}
export interface ChangeRoleBody {
  role: MembershipRole;
}

export interface InvitationDto {
  id: string;
  email: string;
  role: MembershipRole;
  invitedBy: string;
  createdAt: string;
  expiresAt: string;
  state: 'pending' | 'accepted' | 'expired' | 'revoked';
}
export interface InviteBody {
  email: string;
  role: MembershipRole;
}
/** What the accept-invitation page shows before the invitee accepts (`GET /api/invitations/:token`). */
export interface InvitationPreviewDto {
  manuscriptTitle: string;
  email: string;
  role: MembershipRole;
  invitedBy: string;
  expiresAt: string;
}
export interface AcceptInvitationResult {
  manuscriptId: string;
  role: MembershipRole;
}

export interface AdminUserDto extends UserDto {
  manuscriptCount: number;
}
export interface ChangeSiteRoleBody {
  siteRole: SiteRole;
}

export interface MailMessageSummaryDto {
  id: string;
  to: string;
  subject: string;
  receivedAt: string;
}
export interface MailMessageDto extends MailMessageSummaryDto {
  from: string;
  text: string;
  /** Every http(s) link in the message, in order of appearance. */
  links: string[];
}

export interface HealthDto {
  status: 'ok' | 'degraded';
  database: boolean;
  redis: boolean;
}

// Outlier flags travel with the API contract so the UI can import the value without the engine.
export { OUTLIER_FLAGS } from '../report/flags';
export { TABLE_HTML_TAGS } from '../report/table-html';
