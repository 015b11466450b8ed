import { describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { freshVersions, versionsWaiting, type DataVersions } from './data-versions';

/** A read the test settles by hand, numbered in the order the reads started. */
function controlledReads() {
  const started: Array<{ resolve: (v: DataVersions) => void; reject: (e: Error) => void }> = [];
  const read = () =>
    new Promise<DataVersions>((resolve, reject) => {
      started.push({ resolve, reject });
    });
  const versions = (n: number): DataVersions => ({ run: null, access: String(n), flags: '0', periods: '0', config: '0', runs: '0' });
  return { started, read, versions };
}

const tick = () => new Promise((r) => setImmediate(r));

describe('freshVersions', () => {
  it('never hands a caller a read that started before it asked; callers meanwhile share the next read', async () => {
    const ds = {} as DataSource;
    const { started, read, versions } = controlledReads();
    const first = freshVersions(ds, read);
    expect(started).toHaveLength(1);
    // Three callers ask while the first read runs: none joins it, all share one read started after it.
    const later = [freshVersions(ds, read), freshVersions(ds, read), freshVersions(ds, read)];
    expect(started).toHaveLength(1);
    // They count as waiting for the database (the overload bound counts them: database-saturation.ts).
    expect(versionsWaiting(ds)).toBe(3);
    started[0]!.resolve(versions(1));
    expect(await first).toEqual(versions(1));
    await tick();
    expect(started).toHaveLength(2);
    // A caller asking now (the second read is running) waits for a third.
    const third = freshVersions(ds, read);
    started[1]!.resolve(versions(2));
    expect(await Promise.all(later)).toEqual([versions(2), versions(2), versions(2)]);
    expect(versionsWaiting(ds)).toBe(1);
    await tick();
    expect(started).toHaveLength(3);
    started[2]!.resolve(versions(3));
    expect(await third).toEqual(versions(3));
    // Nothing running: the next caller starts its own read at once.
    await tick();
    const alone = freshVersions(ds, read);
    expect(started).toHaveLength(4);
    started[3]!.resolve(versions(4));
    expect(await alone).toEqual(versions(4));
  });

  it('a failed read fails its own callers only; the queued read still starts', async () => {
    const ds = {} as DataSource;
    const { started, read, versions } = controlledReads();
    const first = freshVersions(ds, read);
    const queued = freshVersions(ds, read);
    started[0]!.reject(new Error('connection lost'));
    await expect(first).rejects.toThrow('connection lost');
    await tick();
    expect(started).toHaveLength(2);
    started[1]!.resolve(versions(7));
    expect(await queued).toEqual(versions(7));
  });

  it('keeps the reads of two data sources apart', async () => {
    const { started, read, versions } = controlledReads();
    const a = freshVersions({} as DataSource, read);
    const b = freshVersions({} as DataSource, read);
    expect(started).toHaveLength(2);
    started[0]!.resolve(versions(1));
    started[1]!.resolve(versions(2));
    expect([await a, await b]).toEqual([versions(1), versions(2)]);
  });

  it('does not hold callers behind a read that stalls: after the patience their own read starts', async () => {
    const ds = {} as DataSource;
    const { started, read, versions } = controlledReads();
    const stalled = freshVersions(ds, read, 20);
    const waiting = freshVersions(ds, read, 20);
    expect(started).toHaveLength(1);
    await new Promise((r) => setTimeout(r, 40));
    expect(started).toHaveLength(2);
    started[1]!.resolve(versions(2));
    expect(await waiting).toEqual(versions(2));
    // The stalled read still ends for its own caller, and replaces nothing newer.
    started[0]!.resolve(versions(1));
    expect(await stalled).toEqual(versions(1));
    await tick();
    const next = freshVersions(ds, read, 20);
    expect(started).toHaveLength(3);
    started[2]!.resolve(versions(3));
    expect(await next).toEqual(versions(3));
  });
});
