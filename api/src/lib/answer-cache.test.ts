import { gunzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { AnswerCache } from './answer-cache';

describe('AnswerCache', () => {
  it('reads a key once for concurrent askers and gives the JSON with its gzip', async () => {
    const cache = new AnswerCache(1024 ** 2);
    let reads = 0;
    const read = async () => {
      reads++;
      return { rows: [1, 2, 3] };
    };
    const [a, b] = await Promise.all([cache.get('k', read), cache.get('k', read)]);
    expect(reads).toBe(1);
    expect(a).toBe(b);
    expect(JSON.parse(a.json.toString())).toEqual({ rows: [1, 2, 3] });
    expect(gunzipSync(a.gzip).equals(a.json)).toBe(true);
  });

  it('forgets a failed read, so the next asker reads again', async () => {
    const cache = new AnswerCache(1024 ** 2);
    await expect(cache.get('k', async () => Promise.reject(new Error('no')))).rejects.toThrow('no');
    const ok = await cache.get('k', async () => 'yes');
    expect(ok.json.toString()).toBe('"yes"');
  });

  it('drops the least recently used answers once their bytes pass the budget', async () => {
    const big = 'x'.repeat(600);
    const cache = new AnswerCache(1500);
    let reads = 0;
    const read = (v: string) => async () => {
      reads++;
      return v;
    };
    await cache.get('a', read(big + 'a'));
    await cache.get('b', read(big + 'b'));
    await cache.get('a', read(big + 'a')); // a is now the most recent
    expect(reads).toBe(2);
    await cache.get('c', read(big + 'c')); // over budget: b goes
    expect(cache.heldBytes).toBeLessThanOrEqual(1500);
    await cache.get('a', read(big + 'a'));
    expect(reads).toBe(3);
    await cache.get('b', read(big + 'b'));
    expect(reads).toBe(4);
  });
});
