import type { Readable } from 'node:stream';
import busboy from 'busboy';
import type { Request } from 'express';
import { AppError } from '../../lib/app-error';

export interface UploadedFile {
  fileName: string;
  stream: Readable;
  /** Resolves once the whole request body has been read (or thrown away). */
  done: Promise<void>;
}

/**
 * The first file of a multipart request, as a stream: busboy hands it over as the bytes arrive,
 * nothing is written to disk or kept in memory. Later files and all fields are ignored.
 */
export function firstFile(req: Request, maxBytes: number): Promise<UploadedFile> {
  if (!req.is('multipart/form-data')) {
    return Promise.reject(new AppError('bad_request', 'send the file as multipart/form-data with one file field'));
  }
  return new Promise((resolve, reject) => {
    let bb: busboy.Busboy;
    try {
      // One byte over the limit lets the intake's own meter name the limit in its message.
      bb = busboy({ headers: req.headers, limits: { files: 1, fileSize: maxBytes + 1, fields: 20, parts: 40 }, defParamCharset: 'utf8' });
    } catch {
      reject(new AppError('bad_request', 'the multipart request has no boundary'));
      return;
    }
    let got: Readable | null = null;
    const done = new Promise<void>((res) => {
      bb.on('close', res);
      bb.on('error', () => res());
    });
    bb.on('file', (_field, stream, info) => {
      if (got) {
        stream.resume();
        return;
      }
      got = stream;
      resolve({ fileName: (info.filename || 'upload.csv').slice(0, 255), stream, done });
    });
    bb.on('error', (err) => {
      const e = new AppError('bad_request', `the upload broke off: ${err instanceof Error ? err.message : String(err)}`);
      if (got) got.destroy(e);
      else reject(e);
    });
    bb.on('close', () => {
      if (!got) reject(new AppError('bad_request', 'the request holds no file; attach the CSV as a file field'));
    });
    // A client that hangs up mid-upload ends the intake (its transaction rolls back).
    req.on('aborted', () => got?.destroy(new AppError('bad_request', 'the upload was interrupted')));
    req.pipe(bb);
  });
}
