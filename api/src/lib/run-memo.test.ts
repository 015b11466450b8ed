import { describe, expect, it } from 'vitest';
import { RunMemo } from './run-memo';

describe('RunMemo', () => {
  it('reads a key once, shares the read, and keeps the newest entries only', async () => {
    const memo = new RunMemo<number>(2);
    let reads = 0;
    const read = (v: number) => async () => {
      reads++;
      return v;
    };
    const [a, b] = await Promise.all([memo.get('a', read(1)), memo.get('a', read(99))]);
    expect([a, b, reads]).toEqual([1, 1, 1]);
    await memo.get('b', read(2));
    await memo.get('a', read(99)); // a is now the newest
    await memo.get('c', read(3)); // b, the oldest, goes
    expect(await memo.get('a', read(99))).toBe(1);
    expect(await memo.get('b', read(22))).toBe(22);
    expect(reads).toBe(4);
  });

  it('forgets a failed read', async () => {
    const memo = new RunMemo<number>();
    await expect(memo.get('x', () => Promise.reject(new Error('down')))).rejects.toThrow('down');
    expect(await memo.get('x', async () => 7)).toBe(7);
  });
});
