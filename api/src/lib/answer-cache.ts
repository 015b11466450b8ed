import { promisify } from 'node:util';
import { gzip as gzipCallback } from 'node:zlib';

const gzip = promisify(gzipCallback);

/** One answer as it goes on the wire: the JSON text and its gzip, each made once. */
export interface StoredAnswer {
  json: Buffer;
  gzip: Buffer;
}

/**
 * Answers that never change for their key (a run's figures as one reader sees them), kept in
 * memory ready to send: serialised and compressed once, so a page loaded by fifty readers costs
 * one read and one gzip, not fifty. Concurrent askers of a key share one promise; a failed read
 * is forgotten. Entries are dropped oldest first once their bytes pass `budgetBytes`. Written by
 * hand: a byte-budgeted LRU of promises is a few lines over a Map, and the LRU packages count
 * entries, not bytes, or keep values rather than shared promises.
 */
export class AnswerCache {
  private readonly entries = new Map<string, { answer: Promise<StoredAnswer>; bytes: number }>();
  private bytes = 0;

  constructor(private readonly budgetBytes: number) {}

  get(key: string, read: () => Promise<unknown>): Promise<StoredAnswer> {
    const found = this.entries.get(key);
    if (found) {
      this.entries.delete(key);
      this.entries.set(key, found);
      return found.answer;
    }
    const entry = { answer: encode(read), bytes: 0 };
    this.entries.set(key, entry);
    entry.answer.then(
      (a) => {
        if (this.entries.get(key) !== entry) return;
        entry.bytes = a.json.length + a.gzip.length;
        this.bytes += entry.bytes;
        this.trim();
      },
      () => {
        if (this.entries.get(key) === entry) this.entries.delete(key);
      },
    );
    return entry.answer;
  }

  /** Bytes held by settled answers (for tests and the health figures). */
  get heldBytes(): number {
    return this.bytes;
  }

  private trim(): void {
    for (const [key, entry] of this.entries) {
      if (this.bytes <= this.budgetBytes) return;
      this.entries.delete(key);
      this.bytes -= entry.bytes;
    }
  }
}

async function encode(read: () => Promise<unknown>): Promise<StoredAnswer> {
  const json = Buffer.from(JSON.stringify(await read()));
  return { json, gzip: await gzip(json) };
}
