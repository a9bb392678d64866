import busboy from 'busboy';
import type { Request } from 'express';
import type { BlobStore, StoredBlob } from '../storage/blob-store.js';
import { type SniffedFormat, sanitizeFilename, sniffFormat } from '../storage/sniff.js';

export interface ParsedUpload {
  blob: StoredBlob;
  sniffed: SniffedFormat;
  filename: string;
  fields: Record<string, string>;
}

/** The request is not a usable upload; the message says what to do. */
export class UploadFormError extends Error {}

/**
 * Streams the one file of a multipart request into the store (hashing and counting as it
 * goes), sniffing its format from the first bytes. Resolves once the whole request is read.
 */
export function receiveUpload(
  req: Request,
  store: BlobStore,
  maxBytes: number,
): Promise<ParsedUpload> {
  return new Promise((resolve, reject) => {
    let bb: busboy.Busboy;
    try {
      bb = busboy({
        headers: req.headers,
        limits: { files: 1, fields: 8, fieldSize: 4000, parts: 12 },
      });
    } catch {
      reject(new UploadFormError('Send the model as multipart/form-data with a "file" field.'));
      return;
    }
    const fields: Record<string, string> = {};
    let pending: Promise<ParsedUpload | null> | null = null;
    let failure: Error | null = null;
    bb.on('field', (name, value) => {
      fields[name] = value;
    });
    bb.on('file', (field, stream, info) => {
      if (field !== 'file' || pending) {
        stream.resume();
        return;
      }
      const filename = sanitizeFilename(info.filename);
      let sniffed: SniffedFormat | null = null;
      pending = store
        .put(stream, { maxBytes, inspectHead: (head) => (sniffed = sniffFormat(head, filename)) })
        .then((blob) => {
          if (!sniffed) throw new UploadFormError('The upload could not be read. Try again.');
          return { blob, sniffed, filename, fields };
        })
        .catch((err: Error) => {
          failure = err;
          return null;
        });
    });
    let finished = false;
    const finish = () => {
      if (finished) return;
      finished = true;
      void (async () => {
        const result = pending ? await pending : null;
        if (failure) return reject(failure);
        if (!result) {
          return reject(
            new UploadFormError('Choose a coordinate file to upload (the "file" field was empty).'),
          );
        }
        resolve(result);
      })();
    };
    bb.on('error', (err: Error) => {
      failure ??= new UploadFormError(
        `The upload was cut off or malformed (${err.message}). Try again; if it keeps failing, check your connection.`,
      );
      req.unpipe(bb);
      req.resume();
      finish();
    });
    bb.on('close', finish);
    req.pipe(bb);
  });
}
