/**
 * The phone's key for each quick-form entry, against the real database. Before: an entry the
 * phone sent again (its offline queue retrying, or an answer lost because the server was killed
 * after it committed) was either stored twice or refused as a duplicate flush. Now the same key
 * stores exactly one harvest, sent twice in turn or at once, and the second sending answers with
 * the harvest the first one stored.
 */
import { randomUUID } from "node:crypto";
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase } from "@/db/client";
import { demoSignIns } from "@/db/seed";
import { recordHarvest } from "@/lib/data/blocks";
import type { Member } from "@/lib/data/members";
import { commitUpload, createUpload, getImportSetup, parseStored } from "@/lib/data/season-logs";
import { runQueuedJobs, stopJobWorkers } from "@/lib/jobs/worker";
import { memberOf, superuserPool } from "./support/database";

let inspector: Pool;
let asGrower: Member;
let asOtherFarm: Member;
let farmId: string;

const today = "2026-05-02";
const sheet = [
  "block_id,strain,substrate,inoculated_on,block_wet_weight,substrate_moisture,fruiting_method,flush,harvested_on,fresh_weight,contaminated",
  "CK-A,PO-01,HWB-20,2026-03-01,5 lb,58 %,SLIT-ACROSS,,,,no",
  "CK-B,PO-01,HWB-20,2026-03-01,5 lb,58 %,SLIT-ACROSS,,,,no",
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
  const asManager = await memberOf(managers.find((manager) => manager.farmId === farmId)!.id);
  asOtherFarm = await memberOf(managers.find((manager) => manager.farmId !== farmId)!.id);
  const content = new TextEncoder().encode(sheet);
  const view = await createUpload(asManager, {
    fileName: "client-keys.csv",
    content,
    result: await parseStored(content, await getImportSetup(asManager), {}),
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

const entry = (code: string, flush: number, clientKey: string) => ({
  blockCode: code,
  flush,
  weight: "640",
  unit: "g" as const,
  harvestedOn: "2026-05-01",
  acceptWarnings: [],
  clientKey,
});

async function storedWithKey(clientKey: string) {
  const { rows } = await inspector.query<{ farmId: string; flush: number; grams: number }>(
    `select farm_id as "farmId", flush, fresh_mass_g::float8 as grams from harvests where client_key = $1`,
    [clientKey],
  );
  return rows;
}

describe("an entry's key stores it once", () => {
  it("a retry after the server answered (or was killed after it committed, so the phone never heard) stores nothing new", async () => {
    const key = randomUUID();
    const first = await recordHarvest(asGrower, entry("CK-A", 1, key), today);
    // The phone sends the same entry again, as it does when the first answer never reached it.
    const again = await recordHarvest(asGrower, entry("CK-A", 1, key), today);
    expect(first).toMatchObject({ status: "saved", blockCode: "CK-A", flush: 1, freshGrams: 640, again: false });
    // Without the key this second sending would be refused as a duplicate flush: it answers "saved" with the stored harvest.
    expect(again).toMatchObject({ status: "saved", blockCode: "CK-A", flush: 1, freshGrams: 640, asWritten: "640 g", again: true });
    expect(await storedWithKey(key)).toEqual([{ farmId, flush: 1, grams: 640 }]);
  });

  it("the same key sent five times at once stores one harvest, and every sending answers saved", async () => {
    const key = randomUUID();
    const answers = await Promise.all(Array.from({ length: 5 }, () => recordHarvest(asGrower, entry("CK-B", 1, key), today)));
    expect(answers.every((answer) => answer.status === "saved" && answer.flush === 1)).toBe(true);
    expect(answers.filter((answer) => answer.status === "saved" && !answer.again)).toHaveLength(1);
    expect(await storedWithKey(key)).toHaveLength(1);
  });

  it("different keys are different entries: the next flush with a new key is stored beside the first", async () => {
    const answer = await recordHarvest(asGrower, entry("CK-A", 2, randomUUID()), today);
    expect(answer).toMatchObject({ status: "saved", flush: 2, again: false });
    const { rows } = await inspector.query<{ n: number }>(
      `select count(*)::int as n from harvests h join blocks b on b.id = h.block_id where b.farm_id = $1 and b.code = 'CK-A'`,
      [farmId],
    );
    expect(rows[0].n).toBe(2);
  });

  it("another farm's member sending a key of this farm finds nothing of it (the key is looked up in the sender's farm only)", async () => {
    const key = randomUUID();
    expect(await recordHarvest(asGrower, entry("CK-A", 3, key), today)).toMatchObject({ status: "saved" });
    // The other farm has no block CK-A: the entry is refused as an unknown block, not answered with this farm's harvest.
    await expect(recordHarvest(asOtherFarm, entry("CK-A", 3, key), today)).rejects.toMatchObject({ code: "invalid_input" });
    expect(await storedWithKey(key)).toEqual([{ farmId, flush: 3, grams: 640 }]);
  });

  it("the database refuses a second harvest with the same key in one farm even past the data layer", async () => {
    const key = randomUUID();
    expect(await recordHarvest(asGrower, entry("CK-B", 2, key), today)).toMatchObject({ status: "saved" });
    await expect(
      inspector.query(
        `insert into harvests (farm_id, block_id, flush, fresh_mass_g, client_key)
         select farm_id, block_id, 5, 100, client_key from harvests where client_key = $1`,
        [key],
      ),
    ).rejects.toMatchObject({ code: "23505" });
  });
});
