import { createHash } from 'node:crypto';
import { Transform, type TransformCallback } from 'node:stream';
import { AppError } from './app-error';

/**
 * Passes the upload's bytes through unchanged while computing its SHA-256 and size, and stops the
 * stream with a 413 problem once it grows past the limit. Holds nothing but the hash state.
 */
export class ByteMeter extends Transform {
  private readonly hash = createHash('sha256');
  bytes = 0;

  constructor(private readonly maxBytes: number) {
    super();
  }

  override _transform(chunk: Buffer, _enc: BufferEncoding, done: TransformCallback): void {
    this.bytes += chunk.length;
    if (this.bytes > this.maxBytes) {
      done(tooLarge(this.maxBytes));
      return;
    }
    this.hash.update(chunk);
    done(null, chunk);
  }

  private hex: string | null = null;

  /** The SHA-256 of every byte seen so far; final once the stream has ended. */
  digest(): string {
    this.hex ??= this.hash.digest('hex');
    return this.hex;
  }
}

export function tooLarge(maxBytes: number): AppError {
  return new AppError('payload_too_large', `the file is larger than the limit of ${formatBytes(maxBytes)}; split it by site or by year and upload the parts`);
}

export function formatBytes(n: number): string {
  return n >= 1024 ** 3 ? `${(n / 1024 ** 3).toFixed(1)} GiB` : n >= 1024 ** 2 ? `${Math.round(n / 1024 ** 2)} MiB` : `${Math.round(n / 1024)} KiB`;
}
