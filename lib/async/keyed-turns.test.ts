import { describe, expect, it } from "vitest";
import { keyedTurns } from "./keyed-turns";

describe("turns per key", () => {
  it("runs one piece of work per key at a time, in order, and other keys alongside", async () => {
    const inTurn = keyedTurns();
    const log: string[] = [];
    let releaseFirst!: () => void;
    const first = inTurn("a", async () => {
      log.push("a1 start");
      await new Promise<void>((resolve) => (releaseFirst = resolve));
      log.push("a1 end");
    });
    const second = inTurn("a", () => {
      log.push("a2");
      return Promise.resolve();
    });
    const other = inTurn("b", () => {
      log.push("b1");
      return Promise.resolve();
    });
    await other;
    expect(log).toEqual(["a1 start", "b1"]);
    releaseFirst();
    await Promise.all([first, second]);
    expect(log).toEqual(["a1 start", "b1", "a1 end", "a2"]);
  });

  it("goes on with the next turn after a failure, and passes the failure to its caller", async () => {
    const inTurn = keyedTurns();
    const failed = inTurn("a", () => Promise.reject(new Error("no")));
    const next = inTurn("a", () => Promise.resolve(2));
    await expect(failed).rejects.toThrow("no");
    expect(await next).toBe(2);
  });
});
