/**
 * Downloads in the upload format, against the real database: the farm's blocks export and its
 * trial list go back in as they stand, and an unchanged export changes nothing. Trial blocks must
 * agree with the randomised list, and a row naming another farm's listed block is refused in the
 * words used for a code nobody lists (before, a trial column was accepted silently).
 */
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase } from "@/db/client";
import { loadMember, type Member } from "@/lib/data/members";
import { commitUpload, createUpload, getImportSetup, getSeasonLogExport, parseStored, type UploadView } from "@/lib/data/season-logs";
import { getTrialListSeasonLog } from "@/lib/data/trials";
import { runQueuedJobs, stopJobWorkers } from "@/lib/jobs/worker";
import { superuserPool, memberOf } from "./support/database";

let inspector: Pool;
let manager: Member;
let asFarm: Member;
let trialId: string;
/** A block code on another farm's list, with that list's trial and arm. */
let theirs: { blockCode: string; trialCode: string; armLabel: string; strainCode: string };

beforeAll(async () => {
  inspector = superuserPool();
  // Two farms in the demo trial: the farm under test and another one.
  const { rows } = await inspector.query<{ farmId: string; managerId: string; trialId: string }>(
    `select a.farm_id as "farmId", u.id as "managerId", a.trial_id as "trialId"
     from trial_block_assignments a join trials t on t.id = a.trial_id join users u on u.farm_id = a.farm_id and u.role = 'farm_manager'
     where t.code = 'T-2026-01' group by a.farm_id, u.id, a.trial_id order by a.farm_id limit 1`,
  );
  manager = (await loadMember(rows[0].managerId))!;
  asFarm = await memberOf(manager.id);
  trialId = rows[0].trialId;
  const other = await inspector.query<typeof theirs>(
    `select a.block_code as "blockCode", t.code as "trialCode", arm.label as "armLabel", s.code as "strainCode"
     from trial_block_assignments a join trials t on t.id = a.trial_id join trial_arms arm on arm.id = a.arm_id
     join strains s on s.id = arm.strain_id where a.farm_id <> $1 order by a.sequence limit 1`,
    [asFarm.farmId],
  );
  theirs = other.rows[0];
  // Not on this farm's own list under any trial.
  const own = await inspector.query(`select 1 from trial_block_assignments where farm_id = $1 and block_code = $2`, [
    asFarm.farmId,
    theirs.blockCode,
  ]);
  expect(own.rows).toEqual([]);
});

afterAll(async () => {
  await runQueuedJobs(["pooled-refresh"]);
  await stopJobWorkers();
  await inspector.end();
  await closeDatabase();
});

async function upload(text: string, fileName: string): Promise<UploadView> {
  const content = new TextEncoder().encode(text);
  const setup = await getImportSetup(asFarm);
  return createUpload(asFarm, { fileName, content, result: await parseStored(content, setup, {}), choices: {} });
}

/** Everything the farm has stored that a commit could change. */
async function farmState() {
  const blocks = await inspector.query(`select * from blocks where farm_id = $1 order by code`, [asFarm.farmId]);
  const harvests = await inspector.query(`select * from harvests where farm_id = $1 order by block_id, flush`, [asFarm.farmId]);
  const changes = await inspector.query<{ n: number }>(`select count(*)::int as n from value_changes where farm_id = $1`, [asFarm.farmId]);
  return { blocks: blocks.rows as { trial_arm_id: string | null }[], harvests: harvests.rows, changes: changes.rows[0].n };
}

const errors = (view: UploadView) => view.report.issues.filter((issue) => issue.severity === "error");

describe("season-log downloads", () => {
  it("takes the farm's blocks export back unchanged: export, upload, commit, nothing changed", async () => {
    const before = await farmState();
    expect(before.blocks.length).toBeGreaterThan(10);
    expect(before.blocks.some((block) => block.trial_arm_id !== null)).toBe(true);
    const { csv } = await getSeasonLogExport(asFarm);
    expect(csv.split("\r\n")[0]).toContain("block_wet_weight (g),substrate_moisture (%)");

    const view = await upload(csv, "season-log-export.csv");
    expect(errors(view)).toEqual([]);
    expect(view.canCommit).toBe(true);
    expect(view.report.preview.counts).toMatchObject({ newBlocks: 0, changedBlocks: 0, newHarvests: 0, changedHarvests: 0 });
    expect(view.report.preview.counts.untouchedBlocks).toBe(before.blocks.length);
    expect(view.report.preview.counts.untouchedHarvests).toBe(before.harvests.length);

    const receipt = await commitUpload(asFarm, view.upload.id, {});
    expect(receipt.changedValues).toBe(0);
    expect(await farmState()).toEqual(before);
  });

  it("gives the trial list as a season log that uploads as it stands", async () => {
    const { csv, fileName } = await getTrialListSeasonLog(manager, trialId);
    expect(fileName).toMatch(/-block-list\.csv$/);
    const view = await upload(csv, fileName);
    expect(errors(view)).toEqual([]);
    // The demo farm has made every listed block already: the list agrees with them.
    expect(view.report.preview.counts.changedBlocks).toBe(0);
  });

  it("refuses a listed block fruited another way than its arm, saying what the list expects", async () => {
    const { rows } = await inspector.query<{ code: string; arm: string; trial: string; strain: string; method: string }>(
      `select b.code, arm.label as arm, t.code as trial, s.code as strain, m.name as method
       from blocks b join trial_arms arm on arm.id = b.trial_arm_id join trials t on t.id = arm.trial_id
       join strains s on s.id = arm.strain_id join treatments m on m.id = arm.treatment_id
       where b.farm_id = $1 and m.kind = 'fruiting_method' order by b.code limit 1`,
      [asFarm.farmId],
    );
    const block = rows[0];
    const other = await inspector.query<{ name: string }>(
      `select name from treatments where kind = 'fruiting_method' and status = 'active' and name <> $1 order by code limit 1`,
      [block.method],
    );
    const text = `block_id,strain,trial,arm,fruiting_method\r\n${block.code},${block.strain},${block.trial},${block.arm},${other.rows[0].name.toLowerCase()}\r\n`;
    const view = await upload(text, "wrong-method.csv");
    expect(errors(view).map((issue) => issue.code)).toEqual(["trial_fruiting_method_differs"]);
    expect(errors(view)[0].message).toContain(
      `block ${block.code} is in arm ${block.arm} of trial ${block.trial}, which fruits with "${block.method}"`,
    );
    expect(view.canCommit).toBe(false);
  });

  it("refuses a row naming another farm's trial block as unknown, revealing nothing about it", async () => {
    const header = "block_id,strain,trial,arm";
    const foreign = await upload(
      `${header}\r\n${theirs.blockCode},${theirs.strainCode},${theirs.trialCode},${theirs.armLabel}\r\n`,
      "theirs.csv",
    );
    const madeUp = await upload(`${header}\r\nZZ-404,${theirs.strainCode},${theirs.trialCode},${theirs.armLabel}\r\n`, "made-up.csv");
    expect(errors(foreign).map((issue) => issue.code)).toEqual(["trial_block_not_listed"]);
    expect(foreign.canCommit).toBe(false);
    // The same words as for a code no farm lists, apart from the code itself.
    expect(errors(foreign)[0].message.replaceAll(theirs.blockCode, "X")).toBe(errors(madeUp)[0].message.replaceAll("ZZ-404", "X"));
    const stored = await inspector.query(`select 1 from blocks where farm_id = $1 and code = $2`, [asFarm.farmId, theirs.blockCode]);
    expect(stored.rows).toEqual([]);
  });
});
