import { createHash, randomBytes } from 'node:crypto';
import { createReadStream, createWriteStream } from 'node:fs';
import { access, mkdir, readdir, readFile, rename, rm } from 'node:fs/promises';
import { join } from 'node:path';
import { Readable, Transform, type TransformCallback } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import {
  type BlobStore,
  type PutOptions,
  type StoredBlob,
  UploadTooLargeError,
} from './blob-store.js';

const SHA256_HEX = /^[0-9a-f]{64}$/;

/**
 * Hashes and counts bytes as they pass, stops the stream the moment the limit is crossed, and
 * hands the first bytes to the caller's inspector before anything past them is written.
 */
class HashingLimiter extends Transform {
  readonly hash = createHash('sha256');
  size = 0;
  private head: Buffer[] = [];
  private headSize = 0;
  private inspected = false;

  constructor(private readonly opts: PutOptions) {
    super();
  }

  private inspect(): void {
    if (this.inspected) return;
    this.inspected = true;
    const head = Buffer.concat(this.head);
    this.head = [];
    this.opts.inspectHead?.(head);
  }

  override _transform(chunk: Buffer, _enc: BufferEncoding, done: TransformCallback): void {
    this.size += chunk.length;
    if (this.size > this.opts.maxBytes) {
      done(new UploadTooLargeError(this.opts.maxBytes));
      return;
    }
    this.hash.update(chunk);
    try {
      if (!this.inspected) {
        this.head.push(chunk);
        this.headSize += chunk.length;
        if (this.headSize >= (this.opts.headBytes ?? 65536)) this.inspect();
      }
    } catch (err) {
      done(err as Error);
      return;
    }
    done(null, chunk);
  }

  override _flush(done: TransformCallback): void {
    try {
      this.inspect();
      done();
    } catch (err) {
      done(err as Error);
    }
  }
}

/** Blobs at <root>/sha256/ab/cd/<hash>; uploads in progress at <root>/tmp/<random>. */
export class FsBlobStore implements BlobStore {
  constructor(private readonly root: string) {}

  private pathOf(sha256: string): string {
    if (!SHA256_HEX.test(sha256)) throw new Error(`not a SHA-256 digest: ${sha256}`);
    return join(this.root, 'sha256', sha256.slice(0, 2), sha256.slice(2, 4), sha256);
  }

  private get tmpDir(): string {
    return join(this.root, 'tmp');
  }

  async put(source: Readable, options: PutOptions): Promise<StoredBlob> {
    await mkdir(this.tmpDir, { recursive: true });
    const tmp = join(this.tmpDir, `${Date.now()}-${randomBytes(8).toString('hex')}.part`);
    const limiter = new HashingLimiter(options);
    // The source is piped, not part of the pipeline, so a refusal does not destroy it: the rest
    // of the request is drained and the client still receives our answer.
    const written = pipeline(limiter, createWriteStream(tmp, { flags: 'wx', mode: 0o640 }));
    const onSourceError = (err: Error) => limiter.destroy(err);
    source.once('error', onSourceError);
    source.pipe(limiter);
    try {
      await written;
    } catch (err) {
      source.unpipe(limiter);
      source.resume();
      // A partial file is never left behind, whatever stopped the stream.
      await rm(tmp, { force: true });
      throw err;
    } finally {
      source.off('error', onSourceError);
    }
    const sha256 = limiter.hash.digest('hex');
    const target = this.pathOf(sha256);
    const created = !(await this.has(sha256));
    if (created) {
      await mkdir(join(target, '..'), { recursive: true });
      // rename is atomic on one file system: readers see the whole blob or none.
      await rename(tmp, target);
    } else {
      await rm(tmp, { force: true });
    }
    return { sha256, sizeBytes: limiter.size, created };
  }

  async has(sha256: string): Promise<boolean> {
    try {
      await access(this.pathOf(sha256));
      return true;
    } catch {
      return false;
    }
  }

  read(sha256: string): Promise<Buffer> {
    return readFile(this.pathOf(sha256));
  }

  open(sha256: string): Readable {
    return createReadStream(this.pathOf(sha256));
  }

  async pendingTemporaryFiles(): Promise<string[]> {
    try {
      return (await readdir(this.tmpDir)).sort();
    } catch {
      return [];
    }
  }
}
