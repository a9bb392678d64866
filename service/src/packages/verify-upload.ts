import busboy from 'busboy';
import type { Request } from 'express';

export class VerifyUploadError extends Error {}

/** Reads `package` (the zip) and an optional `model` from a multipart request into memory. */
export function receiveVerifyUpload(
  req: Request,
  maxBytes: number,
): Promise<{ pkg: Buffer; model?: { filename: string; bytes: Buffer } }> {
  return new Promise((resolve, reject) => {
    let bb: busboy.Busboy;
    try {
      bb = busboy({
        headers: req.headers,
        limits: { files: 2, fields: 0, parts: 2, fileSize: maxBytes },
      });
    } catch {
      reject(
        new VerifyUploadError(
          'Send the package as multipart/form-data with a "package" field (and optionally "model").',
        ),
      );
      return;
    }
    const files = new Map<string, { filename: string; bytes: Buffer }>();
    let failure: Error | null = null;
    bb.on('file', (field, stream, info) => {
      if (field !== 'package' && field !== 'model') {
        stream.resume();
        return;
      }
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('limit', () => {
        failure = new VerifyUploadError(
          `The ${field} file is larger than this server accepts for checking.`,
        );
      });
      stream.on('end', () =>
        files.set(field, { filename: info.filename, bytes: Buffer.concat(chunks) }),
      );
    });
    bb.on('error', (e: Error) => {
      failure ??= new VerifyUploadError(
        `The upload was cut off or malformed (${e.message}); try again.`,
      );
      req.unpipe(bb);
      req.resume();
      reject(failure);
    });
    bb.on('close', () => {
      if (failure) return reject(failure);
      const pkg = files.get('package');
      if (!pkg || pkg.bytes.length === 0)
        return reject(
          new VerifyUploadError(
            'Choose the package .zip to check (the "package" field was empty).',
          ),
        );
      const model = files.get('model');
      resolve({ pkg: pkg.bytes, model: model && model.bytes.length ? model : undefined });
    });
    req.pipe(bb);
  });
}
