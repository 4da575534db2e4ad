import { describe, expect, it } from "vitest";
import { byteBudget } from "./byte-budget";

function gate() {
  let open!: () => void;
  const opened = new Promise<void>((resolve) => (open = resolve));
  return { opened, open };
}

describe("a budget of bytes", () => {
  it("runs work side by side while it fits, and makes the rest wait its turn", async () => {
    const budget = byteBudget(100);
    const first = gate();
    const second = gate();
    const started: string[] = [];
    const a = budget.use(45, async () => {
      started.push("a");
      await first.opened;
    });
    const b = budget.use(45, async () => {
      started.push("b");
      await second.opened;
    });
    const c = budget.use(45, () => {
      started.push("c");
      return Promise.resolve();
    });
    await Promise.resolve();
    expect(started).toEqual(["a", "b"]);
    expect(budget.state()).toEqual({ inUse: 90, running: 2, waiting: 1 });
    first.open();
    await a;
    await c;
    expect(started).toEqual(["a", "b", "c"]);
    second.open();
    await b;
    expect(budget.state()).toEqual({ inUse: 0, running: 0, waiting: 0 });
  });

  it("still runs one piece larger than the whole budget, alone", async () => {
    const budget = byteBudget(10);
    expect(await budget.use(50, () => Promise.resolve("ran"))).toBe("ran");
  });

  it("gives the bytes back when the work fails", async () => {
    const budget = byteBudget(10);
    await expect(budget.use(5, () => Promise.reject(new Error("broken file")))).rejects.toThrow("broken file");
    expect(budget.state()).toEqual({ inUse: 0, running: 0, waiting: 0 });
  });
});
