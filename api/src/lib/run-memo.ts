/**
 * What a run stored never changes, so what is read of it may be kept in memory: the last
 * `capacity` answers, by key (a run id and what was asked of it), newest kept. A promise is kept,
 * so concurrent readers of the same key share one read; a failed read is forgotten. Written by
 * hand: a map in insertion order is an LRU in a dozen lines, no package needed.
 */
export class RunMemo<T> {
  private readonly entries = new Map<string, Promise<T>>();

  constructor(private readonly capacity = 64) {}

  get(key: string, read: () => Promise<T>): Promise<T> {
    const found = this.entries.get(key);
    if (found) {
      this.entries.delete(key);
      this.entries.set(key, found);
      return found;
    }
    const reading = read();
    this.entries.set(key, reading);
    reading.catch(() => this.entries.delete(key));
    while (this.entries.size > this.capacity) this.entries.delete(this.entries.keys().next().value!);
    return reading;
  }
}
