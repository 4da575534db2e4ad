/**
 * Runs work for one key at a time within this process, in the order it was asked for, while
 * work for other keys goes on. A caller waiting its turn holds nothing but a promise (no
 * database connection), which is the point: a burst for one key queues here, not in the pool.
 */
export function keyedTurns() {
  const tails = new Map<string, Promise<unknown>>();
  return async function inTurn<T>(key: string, work: () => Promise<T>): Promise<T> {
    const before = tails.get(key) ?? Promise.resolve();
    const mine = before.then(work, work);
    const tail = mine.catch(() => undefined);
    tails.set(key, tail);
    try {
      return await mine;
    } finally {
      if (tails.get(key) === tail) tails.delete(key);
    }
  };
}
