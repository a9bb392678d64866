/** Review packages (issue 7): what the API sends the UI and the reviewer page. */

export type PackageStatusName = 'queued' | 'building' | 'done' | 'failed';

export interface ReviewLinkDto {
  id: string;
  label: string;
  expiresAt: string;
  revokedAt: string | null;
  createdAt: string;
  /** 'active' | 'expired' | 'revoked', computed when sent */
  state: 'active' | 'expired' | 'revoked';
}

export interface ReviewPackageDto {
  id: string;
  status: PackageStatusName;
  progress: number;
  step: string | null;
  error: string | null;
  modelVersions: { id: string; n: number }[];
  includeModel: boolean;
  anonymised: boolean;
  zipSha256: string | null;
  sizeBytes: number | null;
  createdAt: string;
  finishedAt: string | null;
  links: ReviewLinkDto[];
}

export interface CreatePackageBody {
  modelVersionIds: string[];
  includeModel: boolean;
  anonymise: boolean;
}

export interface CreateReviewLinkBody {
  label?: string;
  /** 1 to 90 days */
  expiresInDays: number;
}

/** Sent once, when the link is made: the token is never stored and cannot be shown again. */
export interface CreatedReviewLinkDto {
  link: ReviewLinkDto;
  token: string;
  url: string;
}

export interface PackageAuditEventDto {
  id: string;
  action: string;
  packageId: string | null;
  linkId: string | null;
  /** the member's display name for member actions; null for reviewer-link events */
  userName: string | null;
  detail: string;
  ip: string | null;
  createdAt: string;
}

export interface ReviewerFileDto {
  path: string;
  kind: string;
  sizeBytes: number;
  description: string;
}

export interface ReviewerPackageDto {
  title: string;
  anonymised: boolean;
  expiresAt: string;
  zipSha256: string;
  sizeBytes: number;
  files: ReviewerFileDto[];
}

export type VerifyFileStatus =
  'identical' | 'different' | 'missing' | 'unexpected' | 'not-recomputed';

export interface VerifyResultDto {
  ok: boolean;
  title: string;
  inputNotes: string[];
  files: { path: string; status: VerifyFileStatus; detail?: string; changedInputs?: string[] }[];
  counts: Record<VerifyFileStatus, number>;
}
