/**
 * The quick harvest form's data, as a grower, against the real database. Before: a 50 lb flush
 * on a 5 lb block, a harvest dated next month, one before the block's inoculation, flush 3 with
 * no flushes 1–2, 0 oz and a flush on a contaminated block were all saved with "Saved". Now each
 * is refused or needs "Save anyway", by the import's own rules; a warning saved anyway is kept
 * with the harvest; another farm's block code is refused exactly as an unknown code is.
 */
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase } from "@/db/client";
import type { Member } from "@/lib/data/members";
import { demoSignIns } from "@/db/seed";
import { getBlock, listBlocks, recordHarvest, type RecordHarvestResult } from "@/lib/data/blocks";
import { commitUpload, createUpload, getImportSetup, parseStored } from "@/lib/data/season-logs";
import { AppError, isAppError } from "@/lib/errors";
import { runQueuedJobs, stopJobWorkers } from "@/lib/jobs/worker";
import { superuserPool, memberOf } from "./support/database";

let inspector: Pool;
let asGrower: Member;
let asOtherFarm: Member;
let farmId: string;

const today = "2026-05-02";
const header =
  "block_id,strain,substrate,inoculated_on,block_wet_weight,substrate_moisture,fruiting_method,flush,harvested_on,fresh_weight,contaminated";
// QH-A: a 5 lb block at 58 % moisture (952.56 g of dry substrate) with flush 1 of 400 g; QH-NEW: no harvest yet; QH-LOST: contaminated.
const sheet = [
  header,
  "QH-A,PO-01,HWB-20,2026-03-01,5 lb,58 %,SLIT-ACROSS,1,2026-04-10,400 g,no",
  "QH-NEW,PO-01,HWB-20,2026-03-01,5 lb,58 %,SLIT-ACROSS,,,,no",
  "QH-LOST,PO-01,HWB-20,2026-03-01,5 lb,58 %,SLIT-ACROSS,,,,yes",
].join("\n");

beforeAll(async () => {
  inspector = superuserPool();
  const { rows: growers } = await inspector.query<{ id: string; farmId: string }>(
    `select id, farm_id as "farmId" from users where email = $1 and role = 'grower'`,
    [demoSignIns.find((member) => member.role === "grower")!.email],
  );
  farmId = growers[0].farmId;
  asGrower = await memberOf(growers[0].id);
  const { rows: managers } = await inspector.query<{ id: string; farmId: string }>(
    `select id, farm_id as "farmId" from users where role = 'farm_manager' order by email`,
  );
  const own = managers.find((manager) => manager.farmId === farmId)!;
  const other = managers.find((manager) => manager.farmId !== farmId)!;
  asOtherFarm = await memberOf(other.id);
  const asManager: Member = await memberOf(own.id);
  const content = new TextEncoder().encode(sheet);
  const setup = await getImportSetup(asManager);
  const view = await createUpload(asManager, {
    fileName: "quick-harvest.csv",
    content,
    result: await parseStored(content, setup, {}),
    choices: {},
  });
  await commitUpload(asManager, view.upload.id, {});
});

afterAll(async () => {
  await runQueuedJobs(["pooled-refresh"]);
  await stopJobWorkers();
  await inspector.end();
  await closeDatabase();
});

type Entry = {
  blockCode: string;
  flush: number;
  weight: string;
  unit: "g" | "kg" | "lb" | "oz";
  harvestedOn: string;
  acceptWarnings?: string[];
};
const good: Entry = { blockCode: "QH-A", flush: 2, weight: "640", unit: "g", harvestedOn: "2026-05-01" };

function record(context: Member, entry: Entry): Promise<RecordHarvestResult> {
  return recordHarvest(context, { acceptWarnings: [], ...entry }, today);
}

async function refused(work: Promise<unknown>): Promise<AppError> {
  try {
    await work;
  } catch (error) {
    if (isAppError(error)) return error;
    throw error;
  }
  throw new Error("the harvest was saved where it should have been refused");
}

async function harvestsOf(code: string) {
  const { rows } = await inspector.query<{ flush: number; grams: number; written: string; unit: string; accepted: string | null }>(
    `select h.flush, h.fresh_mass_g::float8 as grams, h.fresh_mass_as_written as written, h.fresh_mass_unit as unit, h.accepted_warnings as accepted
     from harvests h join blocks b on b.id = h.block_id where b.farm_id = $1 and b.code = $2 order by h.flush`,
    [farmId, code],
  );
  return rows;
}

const problemCodes = (error: AppError) => error.fieldProblems.map((problem) => problem.field);

describe("the quick harvest form refuses or questions what the importer would", () => {
  it("refuses 50 lb on a 5 lb block (BE 2 423 %) under the weight", async () => {
    const error = await refused(record(asGrower, { ...good, weight: "50", unit: "lb" }));
    expect(error.code).toBe("invalid_input");
    expect(error.fieldProblems).toEqual([expect.objectContaining({ field: "weight" })]);
    expect(error.fieldProblems[0].message).toContain("2423 %");
    expect(await harvestsOf("QH-A")).toHaveLength(1);
  });

  it("refuses a harvest before the block's inoculation, even with every warning code 'accepted' in a forged form", async () => {
    const error = await refused(
      record(asGrower, {
        ...good,
        harvestedOn: "2026-02-20",
        acceptWarnings: ["harvest_before_inoculation", "date_in_future", "flush_gap"],
      }),
    );
    expect(problemCodes(error)).toEqual(["harvestedOn"]);
    expect(error.fieldProblems[0].message).toContain("2026-03-01");
    expect(await harvestsOf("QH-A")).toHaveLength(1);
  });

  it("refuses 0 oz", async () => {
    const error = await refused(record(asGrower, { ...good, weight: "0", unit: "oz" }));
    expect(problemCodes(error)).toEqual(["weight"]);
    expect(await harvestsOf("QH-A")).toHaveLength(1);
  });

  it("asks before saving a harvest dated next month, and saves nothing meanwhile", async () => {
    const result = await record(asGrower, { ...good, harvestedOn: "2026-06-02" });
    expect(result).toMatchObject({ status: "warnings", warnings: [{ code: "date_in_future", field: "harvestedOn" }] });
    expect(await harvestsOf("QH-A")).toHaveLength(1);
  });

  it("asks before saving a flush on a contaminated block", async () => {
    const result = await record(asGrower, { ...good, blockCode: "QH-LOST", flush: 1 });
    expect(result).toMatchObject({ status: "warnings", warnings: [{ code: "harvest_on_contaminated_block", field: "blockCode" }] });
    expect(await harvestsOf("QH-LOST")).toEqual([]);
  });

  it("shows a block with no harvest yet without a biological efficiency", async () => {
    const row = (await listBlocks(asGrower)).find((block) => block.code === "QH-NEW")!;
    expect(row).toMatchObject({ flushes: 0, biologicalEfficiency: null });
    // The strain's name comes with its code, as the register has it.
    const { rows } = await inspector.query<{ name: string }>("select name from strains where code = $1", [row.strainCode]);
    expect(row.strainName).toBe(rows[0].name);
  });

  it("asks before flush 3 with no flushes 1–2; saved anyway, the warning is kept with the harvest", async () => {
    const asked = await record(asGrower, { ...good, blockCode: "QH-NEW", flush: 3 });
    expect(asked).toMatchObject({ status: "warnings", warnings: [{ code: "flush_gap", field: "flush" }] });
    // Accepting another warning than the one given is not accepting it.
    expect(await record(asGrower, { ...good, blockCode: "QH-NEW", flush: 3, acceptWarnings: ["date_in_future"] })).toMatchObject({
      status: "warnings",
    });
    expect(await harvestsOf("QH-NEW")).toEqual([]);

    const saved = await record(asGrower, { ...good, blockCode: "QH-NEW", flush: 3, acceptWarnings: ["flush_gap"] });
    expect(saved).toMatchObject({ status: "saved", blockCode: "QH-NEW", flush: 3 });
    const [stored] = await harvestsOf("QH-NEW");
    expect(stored.accepted).toBe((asked as { warnings: { message: string }[] }).warnings[0].message);
    const block = await getBlock(asGrower, (saved as { blockId: string }).blockId);
    expect(block.harvests[0].acceptedWarnings).toContain("no flush 1, 2");
  });

  it("saves a good flush typed in other capitals and another unit, keeping the block's code and the weight as written", async () => {
    const saved = await record(asGrower, { ...good, blockCode: "qh-a", weight: "12 oz", unit: "g" });
    expect(saved).toMatchObject({ status: "saved", blockCode: "QH-A", flush: 2, asWritten: "12 oz" });
    const stored = await harvestsOf("QH-A");
    expect(stored).toHaveLength(2);
    // 12 oz × 28.349523125 g (NIST Handbook 44: 1 oz = 1/16 of 453.592 37 g).
    expect(stored[1]).toMatchObject({ flush: 2, written: "12 oz", unit: "oz", accepted: null });
    expect(stored[1].grams).toBeCloseTo(340.194, 3);
    const { rows } = await inspector.query<{ n: number }>(`select count(*)::int as n from blocks where farm_id = $1 and code = 'qh-a'`, [
      farmId,
    ]);
    expect(rows[0].n).toBe(0);
  });

  it("keeps a bare number's unit with it as written", async () => {
    await record(asGrower, { ...good, flush: 3, weight: "10", unit: "oz" });
    expect((await harvestsOf("QH-A"))[2]).toMatchObject({ flush: 3, written: "10 oz", unit: "oz" });
  });
});

describe("another farm's block", () => {
  it("is refused exactly as a code that does not exist, and nothing is written to it", async () => {
    const before = await harvestsOf("QH-A");
    const theirs = await refused(record(asOtherFarm, { ...good, flush: 4 }));
    const unknown = await refused(record(asOtherFarm, { ...good, blockCode: "QH-NONE", flush: 4 }));
    expect(theirs.code).toBe("invalid_input");
    expect(theirs.fieldProblems.map((problem) => ({ ...problem, message: problem.message.replace("QH-A", "QH-NONE") }))).toEqual(
      unknown.fieldProblems,
    );
    expect(theirs.message).toBe(unknown.message);
    expect(await harvestsOf("QH-A")).toEqual(before);
  });
});
