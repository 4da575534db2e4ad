/**
 * A budget of bytes shared by work that holds that many bytes in memory while it runs: work
 * starts when its bytes fit (or when nothing else runs, so one piece larger than the budget
 * still runs alone), in the order it asked. Waiting holds nothing but a promise.
 */
export function byteBudget(budget: number) {
  let inUse = 0;
  let running = 0;
  const waiting: { bytes: number; start: () => void }[] = [];

  function admit() {
    while (waiting.length > 0 && (running === 0 || inUse + waiting[0].bytes <= budget)) {
      const next = waiting.shift()!;
      inUse += next.bytes;
      running++;
      next.start();
    }
  }

  return {
    async use<T>(bytes: number, work: () => Promise<T>): Promise<T> {
      await new Promise<void>((start) => {
        waiting.push({ bytes, start });
        admit();
      });
      try {
        return await work();
      } finally {
        inUse -= bytes;
        running--;
        admit();
      }
    },
    /** Bytes of work running now, and pieces waiting: for tests. */
    state: () => ({ inUse, running, waiting: waiting.length }),
  };
}
