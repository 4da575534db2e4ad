import { describe, expect, it } from "vitest";
import { blockCodePrefix, matchTrialBlock, permutedBlockList } from "./randomisation";

const arms = ["arm-a", "arm-b", "arm-c"];

describe("permuted-block randomisation", () => {
  it("holds every arm exactly once in each run of consecutive codes", () => {
    const list = permutedBlockList({ seed: "T-2026-03/farm-1/4f2a", armIds: arms, blocksPerArm: 8, codePrefix: "T-2026-03-FB" });
    expect(list).toHaveLength(24);
    for (let run = 1; run <= 8; run++) {
      const inRun = list.filter((entry) => entry.permutedBlock === run);
      expect(inRun.map((entry) => entry.sequence)).toEqual([1, 2, 3].map((offset) => (run - 1) * 3 + offset));
      expect([...inRun.map((entry) => entry.armId)].sort()).toEqual(arms);
    }
    expect(new Set(list.map((entry) => entry.blockCode)).size).toBe(24);
    expect(list[0].blockCode).toBe("T-2026-03-FB-01");
  });

  it("gives the same list from the same seed and a different one from another seed", () => {
    const options = { armIds: arms, blocksPerArm: 10, codePrefix: "X" };
    const first = permutedBlockList({ ...options, seed: "seed-one" });
    expect(permutedBlockList({ ...options, seed: "seed-one" })).toEqual(first);
    const other = permutedBlockList({ ...options, seed: "seed-two" });
    expect(other.map((entry) => entry.armId)).not.toEqual(first.map((entry) => entry.armId));
  });

  it("is not always the same order within runs (the shuffle really shuffles)", () => {
    const list = permutedBlockList({ seed: "mix", armIds: arms, blocksPerArm: 30, codePrefix: "X" });
    const orders = new Set<string>();
    for (let run = 1; run <= 30; run++)
      orders.add(
        list
          .filter((entry) => entry.permutedBlock === run)
          .map((entry) => entry.armId)
          .join(","),
      );
    // 3 arms have 6 orders; 30 runs should show most of them.
    expect(orders.size).toBeGreaterThanOrEqual(5);
  });

  it("refuses a trial with one arm or a blocks-per-arm that is not a whole number", () => {
    expect(() => permutedBlockList({ seed: "s", armIds: ["only"], blocksPerArm: 3, codePrefix: "X" })).toThrow(/at least 2 arms/);
    expect(() => permutedBlockList({ seed: "s", armIds: arms, blocksPerArm: 0, codePrefix: "X" })).toThrow(/whole number/);
    expect(() => permutedBlockList({ seed: "s", armIds: arms, blocksPerArm: 2.5, codePrefix: "X" })).toThrow(/whole number/);
  });

  it("builds code prefixes from the farm's initials", () => {
    expect(blockCodePrefix("T-2026-03", "Fernbrook Mushrooms")).toBe("T-2026-03-FM");
    expect(blockCodePrefix("T-2026-03", "")).toBe("T-2026-03");
  });

  it("attaches a listed block only when it was grown with its arm's strain", () => {
    const assignment = { armId: "arm-b", armLabel: "B", strainId: "strain-2", strainCode: "PO-02" };
    expect(matchTrialBlock(assignment, { code: "T-01", strainId: "strain-2" })).toEqual({ armId: "arm-b", problem: null });
    expect(matchTrialBlock(assignment, { code: "T-01", strainId: "strain-1" }).problem).toMatch(/arm "B", which uses strain PO-02/);
    expect(matchTrialBlock(undefined, { code: "OWN-1", strainId: "strain-1" })).toEqual({ armId: null, problem: null });
  });
});

describe("reminder opt-out links", async () => {
  const { signOptOutToken, verifyOptOutToken } = await import("./reminder-opt-out");
  const id = "0b5a3f4e-6a1c-4c7e-9f1d-2a3b4c5d6e7f";

  it("verify only with the secret that signed them", () => {
    const token = signOptOutToken(id, "secret-1");
    expect(verifyOptOutToken(token, "secret-1")).toBe(id);
    expect(verifyOptOutToken(token, "secret-2")).toBeNull();
    expect(verifyOptOutToken(`${"1".repeat(8)}-6a1c-4c7e-9f1d-2a3b4c5d6e7f.${token.split(".")[1]}`, "secret-1")).toBeNull();
    expect(verifyOptOutToken("nonsense", "secret-1")).toBeNull();
  });
});
