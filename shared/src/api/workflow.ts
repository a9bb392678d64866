// JSON shapes of the manuscript-workflow routes: model versions, analyses, the version ledger,
// anchored comments and notification settings (issue 6). Dates travel as ISO 8601 strings.
import type { InputFormat, ResidueFlag } from '../report/types';

export type AnalysisStatus = 'queued' | 'running' | 'done' | 'failed';
/** Stages a run reports, in order (issue 6). */
export type AnalysisStage = 'parse' | 'geometry' | 'overlaps' | 'figures' | 'store';
export const ANALYSIS_STAGES: readonly AnalysisStage[] = [
  'parse',
  'geometry',
  'overlaps',
  'figures',
  'store',
];

/** The summary columns kept beside each stored report (null where not computed). */
export interface AnalysisSummaryDto {
  atoms: number | null;
  proteinResidues: number | null;
  ramaFavored: number | null;
  ramaAllowed: number | null;
  ramaOutliers: number | null;
  ramaTotal: number | null;
  rotamerOutliers: number | null;
  rotamerTotal: number | null;
  bondRmsd: number | null;
  bondRmsz: number | null;
  angleRmsd: number | null;
  angleRmsz: number | null;
  overlapsPer1000: number | null;
  cisPeptides: number | null;
  twistedPeptides: number | null;
  cbOutliers: number | null;
  dResidues: number | null;
}

export interface AnalysisDto {
  status: AnalysisStatus;
  stage: AnalysisStage | null;
  /** 0–100 */
  progress: number;
  attempts: number;
  /** the engine's reason when status is 'failed' */
  error: string | null;
  engineVersion: string | null;
  queuedAt: string;
  startedAt: string | null;
  finishedAt: string | null;
  summary: AnalysisSummaryDto | null;
  reportSha256: string | null;
}

export interface ModelVersionDto {
  id: string;
  manuscriptId: string;
  n: number;
  sha256: string;
  format: InputFormat;
  gzip: boolean;
  filename: string;
  sizeBytes: number;
  note: string;
  uploadedBy: { id: string; displayName: string } | null;
  createdAt: string;
  analysis: AnalysisDto | null;
}

/** Body of the 409 answer to an upload whose bytes match an existing version. */
export interface DuplicateUploadError {
  statusCode: 409;
  message: string;
  duplicateOf: { id: string; n: number };
}

export interface LedgerResidueChange {
  chain: string;
  seq: number;
  icode: string;
  name: string;
  /** verdict-bearing flags in the older and newer version */
  before: ResidueFlag[];
  after: ResidueFlag[];
  /** flags that appeared / disappeared */
  added: ResidueFlag[];
  removed: ResidueFlag[];
}

export interface LedgerDto {
  from: { id: string; n: number };
  to: { id: string; n: number };
  /** CA atoms matched by chain + seq + icode (first model, first conformer) */
  matchedCa: number;
  /** RMSD after Kabsch superposition of the matched CA, Å; null when fewer than 3 matched */
  caRmsdA: number | null;
  residuesOnlyInFrom: number;
  residuesOnlyInTo: number;
  newOutliers: LedgerResidueChange[];
  fixedOutliers: LedgerResidueChange[];
  /** summary value before and after, for each summary column */
  deltas: { key: keyof AnalysisSummaryDto; from: number | null; to: number | null }[];
}

export type CommentAnchorType = 'version' | 'residue' | 'figure' | 'table-cell';

export interface CommentAnchor {
  type: CommentAnchorType;
  /** model version the comment is about (required for 'version' and 'residue') */
  modelVersionId?: string | null;
  /** residue: chain, seq, icode */
  chain?: string;
  seq?: number;
  icode?: string;
  /** figure: figure id; table-cell: table id + row + column */
  figureId?: string;
  tableId?: string;
  row?: string;
  column?: string;
}

export interface CommentDto {
  id: string;
  threadId: string | null;
  anchor: CommentAnchor;
  /** stable key of the anchor, e.g. 'residue:<version>:A:42:' */
  anchorKey: string;
  author: { id: string; displayName: string } | null;
  bodyMarkdown: string;
  /** sanitised HTML rendered from the Markdown */
  bodyHtml: string;
  mentions: string[];
  resolvedAt: string | null;
  createdAt: string;
}

export interface CommentThreadDto extends CommentDto {
  replies: CommentDto[];
}

export interface CreateCommentBody {
  anchor: CommentAnchor;
  body: string;
}
export interface ReplyBody {
  body: string;
}

export interface NotificationSettingsDto {
  muted: boolean;
}
