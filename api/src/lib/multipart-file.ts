import { PassThrough, type Readable } from 'node:stream';
import busboy from 'busboy';
import type { Request } from 'express';
import { AppError } from './app-error';

export interface UploadedFile {
  fileName: string;
  /**
   * The file's bytes. It may already have failed when handed over (a body cut short in the same
   * chunk as the file's start): readers check `errored` before waiting for events.
   */
  stream: Readable;
}

const broken = (why: string) => new AppError('bad_request', `the upload broke off: ${why}; send the file again as multipart/form-data with one file field`);

/**
 * The first file of a multipart request, as a stream: busboy hands it over as the bytes arrive,
 * nothing is written to disk or kept in memory. Later files and all fields are ignored.
 *
 * A malformed or interrupted body must end the request, never the process: busboy fails its file
 * streams (for instance "Unexpected end of form" when the closing boundary is missing), and an
 * 'error' event with no listener would be thrown. So every file stream gets a listener the moment
 * it exists, and the one handed over is our own stream, failed with a 400 problem.
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
    let out: PassThrough | null = null;
    let settled = false;
    let fileEnded = false;
    let bodyRead = false;
    const fail = (err: AppError) => {
      if (out) {
        if (!out.destroyed) out.destroy(err);
      } else if (!settled) {
        settled = true;
        reject(err);
      }
    };
    bb.on('file', (_field, stream, info) => {
      stream.on('error', (err: Error) => fail(broken(err.message)));
      if (out) {
        stream.resume();
        return;
      }
      const file = new PassThrough();
      out = file;
      file.on('error', () => undefined);
      // The file ends for the intake only once the whole body has been read well-formed: a body
      // that breaks after the file (a cut second part, no closing boundary) fails the intake too.
      stream.pipe(file, { end: false });
      stream.on('end', () => {
        fileEnded = true;
        if (bodyRead && !file.destroyed) file.end();
      });
      settled = true;
      resolve({ fileName: (info.filename || 'upload.csv').slice(0, 255), stream: out });
    });
    bb.on('error', (err) => fail(broken(err instanceof Error ? err.message : String(err))));
    bb.on('close', () => {
      bodyRead = true;
      if (out && fileEnded && !out.destroyed) out.end();
      if (!out && !settled) {
        settled = true;
        reject(new AppError('bad_request', 'the request holds no file; attach the CSV as a file field'));
      }
    });
    // A client that hangs up mid-upload ends the intake (its transaction rolls back).
    req.on('close', () => {
      if (!req.complete) fail(new AppError('bad_request', 'the upload was interrupted'));
    });
    req.pipe(bb);
  });
}
