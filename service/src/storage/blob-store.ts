import type { Readable } from 'node:stream';

/** What a store reports after keeping one upload. */
export interface StoredBlob {
  sha256: string;
  sizeBytes: number;
  /** false when identical bytes were already stored (content addressing keeps one copy) */
  created: boolean;
}

export interface PutOptions {
  /** Refuse (and delete what was written) as soon as more bytes than this arrive. */
  maxBytes: number;
  /**
   * Called once with the first bytes (up to `headBytes`, or all of a shorter input) before the
   * upload is accepted; throwing aborts the upload and nothing is kept.
   */
  inspectHead?: (head: Buffer) => void;
  headBytes?: number;
}

/**
 * Content-addressed storage of uploaded files. The file-system implementation keeps blobs under
 * var/storage; an S3-compatible store can implement the same interface later (put = multipart
 * upload to a temporary key + copy to the hash key; open = GetObject stream).
 */
export interface BlobStore {
  put(source: Readable, options: PutOptions): Promise<StoredBlob>;
  has(sha256: string): Promise<boolean>;
  read(sha256: string): Promise<Buffer>;
  open(sha256: string): Readable;
  /** Names of temporary files still present (none after any finished or failed put). */
  pendingTemporaryFiles(): Promise<string[]>;
}

export const BLOB_STORE = Symbol('BLOB_STORE');

/** The upload is larger than the configured limit. */
export class UploadTooLargeError extends Error {
  constructor(readonly limitBytes: number) {
    super(
      `The file is larger than this server accepts (${formatBytes(limitBytes)}). Compress it with gzip, or ask an admin to raise FOLDFOLIO_UPLOAD_LIMIT_BYTES.`,
    );
    this.name = 'UploadTooLargeError';
  }
}

export function formatBytes(n: number): string {
  if (n >= 1024 * 1024 * 1024) return `${(n / 1024 / 1024 / 1024).toFixed(1)} GB`;
  if (n >= 1024 * 1024) return `${(n / 1024 / 1024).toFixed(1)} MB`;
  if (n >= 1024) return `${(n / 1024).toFixed(1)} kB`;
  return `${n} bytes`;
}
