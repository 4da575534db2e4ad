import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase } from "@/db/client";
import { loadMember, type Member } from "@/lib/data/members";
import { getCloseReview, getTrial, moveTrial } from "@/lib/data/trials";
import { superuserPool } from "../support/database";
import { CoopFixture, fixtureEfficiency, mean, type FixtureBlock } from "./support/co-op-fixtures";

// A member, the coordinator or an observer reading a published trial report and trying to find
// one farm in it.

let inspector: Pool;
let fixture: CoopFixture;
let observer: Member;
let coordinator: Member;

async function memberByEmail(email: string): Promise<Member> {
  const { rows } = await inspector.query<{ id: string }>("select id from users where email = $1", [email]);
  return (await loadMember(rows[0].id))!;
}

async function setPerFarmEstimates(on: boolean) {
  await inspector.query("update cooperative_settings set show_per_farm_estimates = $1", [on]);
}

/** Every number anywhere in a value, except those under the keys named. */
function numbersIn(value: unknown, skip: Set<string>): number[] {
  if (typeof value === "number") return [value];
  if (Array.isArray(value)) return value.flatMap((item) => numbersIn(item, skip));
  if (value && typeof value === "object")
    return Object.entries(value).flatMap(([key, item]) => (skip.has(key) ? [] : numbersIn(item, skip)));
  return [];
}

/** Blocks for one farm and arm whose BE over flushes 1–2 is about `be` (1 000 g dry substrate). */
const armBlocks = (armId: string, be: number, spread: number[]): FixtureBlock[] =>
  spread.map((offset) => ({ trialArmId: armId, flushes: [(be + offset) * 7, (be + offset) * 3] }));

let species: { id: string; strainIds: string[] };
let farms: { id: string; manager: Member }[];

beforeAll(async () => {
  inspector = superuserPool();
  fixture = new CoopFixture(inspector);
  observer = await memberByEmail("observer@extension.example");
  coordinator = await memberByEmail("coordinator@aldervalley.example");
  species = await fixture.species("Trial oyster", ["Arm strain A", "Arm strain B"]);
  farms = await Promise.all([1, 2, 3, 4].map((n) => fixture.farm(`Trial farm ${n}`)));
});

afterAll(async () => {
  await setPerFarmEstimates(false);
  await fixture.dispose();
  await inspector.end();
  await closeDatabase();
});

/** A running trial on the fixture farms, each farm's gain of arm B over arm A set by `gains`; closed, analysed and published. */
async function analysedTrial(farmList: { id: string }[], gains: number[]) {
  const arms = [
    { label: "A", strainId: species.strainIds[0], reference: true },
    { label: "B", strainId: species.strainIds[1] },
  ];
  const trial = await fixture.runningTrial(
    species.id,
    arms,
    farmList.map((farm) => farm.id),
  );
  for (const [index, farm] of farmList.entries()) {
    // Offsets average 0 in arm A and 1 in arm B; not whole numbers, so no summary figure equals a block's BE by chance.
    await fixture.blocks(farm.id, species.strainIds[0], armBlocks(trial.armIds[0], 80, [-3.13, -1.07, 1.21, 2.99]));
    await fixture.blocks(farm.id, species.strainIds[1], [
      ...armBlocks(trial.armIds[1], 80 + gains[index], [-2.17, 0.11, 1.93, 4.13]),
      { trialArmId: trial.armIds[1], contaminated: true },
    ]);
  }
  await moveTrial(coordinator, trial.id, "collecting", { reviewed: (await getCloseReview(coordinator, trial.id)).fingerprint });
  // Members and observers read published versions only.
  await moveTrial(coordinator, trial.id, "published");
  return trial;
}

describe("a published trial report", () => {
  it("shows no farm's own estimate when the co-op's setting for per-farm estimates is off", async () => {
    await setPerFarmEstimates(false);
    const trial = await analysedTrial(farms, [4, 9, 14, 19]);
    for (const viewer of [observer, coordinator]) {
      const report = (await getTrial(viewer, trial.id)).results!;
      expect(report.analysis.farmPooling.flatMap((pooling) => pooling.farms)).toEqual([]);
    }
  });

  it("names farms by pseudonyms drawn at random per trial, not in the order of their ids", async () => {
    await setPerFarmEstimates(true);
    const gains = [4, 9, 14, 19];
    // Farm k's estimate is its own gain (arm B's offsets average 1, arm A's 0), so the test can tell which farm a row is.
    const byId = [...farms].sort((a, b) => a.id.localeCompare(b.id));
    const orders = new Set<string>();
    for (let attempt = 0; attempt < 6; attempt++) {
      const trial = await analysedTrial(farms, gains);
      const rows = (await getTrial(observer, trial.id)).results!.analysis.farmPooling[0].farms;
      expect(rows).toHaveLength(4);
      const labelOf = (farmIndex: number) => rows.find((row) => Math.abs(row.estimate - (gains[farmIndex] + 1)) < 0.01)!.farm;
      orders.add(byId.map((farm) => labelOf(farms.indexOf(farm))).join(","));
    }
    // Six trials that all name the farms in id order (or any one fixed order) would mean the names are not drawn at random:
    // the chance of that with random names is (1/24)^5.
    expect(orders.size).toBeGreaterThan(1);
  });

  it("marks the reading farm's own row and nobody else's", async () => {
    await setPerFarmEstimates(true);
    const gains = [4, 9, 14, 19];
    const trial = await analysedTrial(farms, gains);
    for (const [index, farm] of farms.entries()) {
      const rows = (await getTrial(farm.manager, trial.id)).results!.analysis.farmPooling[0].farms as { estimate: number; own?: boolean }[];
      const own = rows.filter((row) => row.own);
      expect(own).toHaveLength(1);
      expect(own[0].estimate).toBeCloseTo(gains[index] + 1, 6);
    }
    for (const viewer of [observer, coordinator]) {
      const rows = (await getTrial(viewer, trial.id)).results!.analysis.farmPooling[0].farms as { own?: boolean }[];
      expect(rows.filter((row) => row.own)).toEqual([]);
    }
  });

  it("does not publish a lone farm's contamination counts or any figure of its blocks", async () => {
    const trial = await analysedTrial([farms[0]], [6]);
    const report = (await getTrial(observer, trial.id)).results!;
    for (const arm of report.analysis.arms) expect(arm.contamination).toBeNull();
    expect(JSON.stringify(report.analysis.arms)).not.toMatch(/"contaminated":1\b/);
  });

  it("draws no single block's value in any chart or table of the report", async () => {
    const trial = await analysedTrial(farms, [4, 9, 14, 19]);
    const report = (await getTrial(observer, trial.id)).results!;
    const { rows } = await inspector.query<{ fresh: number }>(
      `select coalesce(sum(h.fresh_mass_g) filter (where h.flush <= 2), 0)::float8 as fresh
       from blocks b join trial_arms a on a.id = b.trial_arm_id left join harvests h on h.block_id = b.id
       where a.trial_id = $1 and not b.contaminated group by b.id`,
      [trial.id],
    );
    const blockValues = rows.map((row) => fixtureEfficiency({ flushes: [row.fresh] }));
    const published = numbersIn(report.analysis, new Set(["n", "blocks", "contaminated", "farmsContributing", "minimumFarms", "df"]));
    const clashes = published.filter((value) => blockValues.some((block) => Math.abs(value - block) <= 1e-6));
    expect(clashes, JSON.stringify(report.analysis)).toEqual([]);
    expect(mean(blockValues)).toBeGreaterThan(0);
  });
});

describe("starting a trial", () => {
  it("is refused with fewer farms than the co-op's minimum", async () => {
    const trial = await fixture.runningTrial(
      species.id,
      [
        { label: "A", strainId: species.strainIds[0], reference: true },
        { label: "B", strainId: species.strainIds[1] },
      ],
      farms.slice(0, 2).map((farm) => farm.id),
    );
    await inspector.query("update trials set status = 'open' where id = $1", [trial.id]);
    await expect(moveTrial(coordinator, trial.id, "running")).rejects.toThrow(/at least 3 farms/);
  });
});
