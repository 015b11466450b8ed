/**
 * Memoisation of pure functions of small integers (a count, a count and a total) and a confidence
 * level: the exact and mid-p limits depend on nothing else, and a run asks for the same ones
 * thousands of times. A plain Map emptied when full keeps it bounded (an LRU package would add a
 * dependency to the browser bundle for no measurable gain on these hit rates).
 * Callers get a copy, so a cached answer cannot be changed through a result.
 */
export function memoLimits<A extends number[]>(
  fn: (...args: A) => { lower: number; upper: number },
  maxEntries = 20_000,
): (...args: A) => { lower: number; upper: number } {
  const cache = new Map<string, { lower: number; upper: number }>();
  return (...args: A) => {
    const key = args.join('|');
    let hit = cache.get(key);
    if (!hit) {
      hit = fn(...args);
      if (cache.size >= maxEntries) cache.clear();
      cache.set(key, hit);
    }
    return { lower: hit.lower, upper: hit.upper };
  };
}
