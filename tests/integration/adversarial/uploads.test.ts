import { Client, type Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { closeDatabase } from "@/db/client";
import type { Member } from "@/lib/data/members";
import { createSeasonLogParser } from "@/lib/import";
import { createUpload, getUploadFile } from "@/lib/data/season-logs";
import { purgeRejectedUploadFiles, withUploadSlot } from "@/lib/data/upload-limits";
import { uploadLimits } from "@/lib/season-logs/limits";
import { superuserPool, twoDemoFarms, type DemoFarm, memberOf } from "../support/database";

/**
 * A farm (or a script with a member's password) that sends file after file: it must not fill
 * the disk or the server's memory for every other farm. Before, a farm could send any number
 * of files at once and keep any number of bytes, and rejected files were kept for ever.
 */

let inspector: Pool;
let farmA: DemoFarm;
let farmB: DemoFarm;
let asFarmA: Member;
let asFarmB: Member;
const madeNames = "limits-probe-%";

function gate() {
  let open!: () => void;
  const opened = new Promise<void>((resolve) => (open = resolve));
  return { opened, open };
}

async function refusal(work: Promise<unknown>): Promise<{ code: string; message: string }> {
  try {
    await work;
  } catch (error) {
    return error as { code: string; message: string };
  }
  throw new Error("it was allowed");
}

/** An upload row put straight into the table, as if sent `daysAgo` days ago. */
async function storedUpload(farm: DemoFarm, options: { outcome: string; daysAgo: number; sizeBytes?: number; name: string }) {
  const { rows } = await inspector.query<{ id: string }>(
    `insert into uploads (farm_id, file_name, content, sha256, size_bytes, outcome, uploaded_at, report)
     values ($1, $2, convert_to('block_id\n', 'UTF8'), md5(random()::text), $3, $4, now() - make_interval(days => $5), '{"issues":[]}')
     returning id`,
    [farm.id, options.name, options.sizeBytes ?? 9, options.outcome, options.daysAgo],
  );
  return rows[0].id;
}

beforeAll(async () => {
  inspector = superuserPool();
  [farmA, farmB] = await twoDemoFarms(inspector);
  asFarmA = await memberOf(farmA.managerId);
  asFarmB = await memberOf(farmB.managerId);
});

afterAll(async () => {
  await inspector.query("delete from uploads where file_name like $1", [madeNames]);
  await inspector.query("delete from upload_reservations where farm_id = any($1)", [[farmA.id, farmB.id]]);
  await inspector.query("update cooperative_settings set rejected_upload_retention_days = 30");
  await inspector.end();
  await closeDatabase();
});

describe("season logs sent at once", () => {
  it(`are limited to ${uploadLimits.concurrentPerFarm} per farm, with a message that says what to do; other farms go on`, async () => {
    const release = gate();
    const busy = Array.from({ length: uploadLimits.concurrentPerFarm }, () => withUploadSlot(asFarmA, 1000, () => release.opened));
    // Both have their slot once their reservations are in the table.
    await vi.waitFor(async () => {
      const { rows } = await inspector.query<{ open: number }>("select count(*)::int as open from upload_reservations where farm_id = $1", [
        farmA.id,
      ]);
      expect(rows[0].open).toBe(uploadLimits.concurrentPerFarm);
    });
    const refused = await refusal(withUploadSlot(asFarmA, 1000, () => Promise.resolve()));
    expect(refused.code).toBe("rate_limited");
    expect(refused.message).toMatch(/already sending 2 season logs\. Wait until one of them has finished/);
    expect(await withUploadSlot(asFarmB, 1000, () => Promise.resolve("farm B went on"))).toBe("farm B went on");
    release.open();
    await Promise.all(busy);
    expect(await withUploadSlot(asFarmA, 1000, () => Promise.resolve("next one"))).toBe("next one");
    const { rows } = await inspector.query("select * from upload_reservations where farm_id = $1", [farmA.id]);
    expect(rows).toEqual([]);
  });

  it("do not stay blocked by a process that died mid-upload: its reservations lapse", async () => {
    for (let slot = 0; slot < uploadLimits.concurrentPerFarm; slot++) {
      await inspector.query("insert into upload_reservations (farm_id, expires_at) values ($1, now() - interval '1 minute')", [farmA.id]);
    }
    expect(await withUploadSlot(asFarmA, 1000, () => Promise.resolve("went on"))).toBe("went on");
  });

  it("free their slot when the upload fails", async () => {
    for (let attempt = 0; attempt < uploadLimits.concurrentPerFarm + 1; attempt++) {
      await expect(withUploadSlot(asFarmA, 1000, () => Promise.reject(new Error("unreadable")))).rejects.toThrow("unreadable");
    }
    expect(await withUploadSlot(asFarmA, 1000, () => Promise.resolve("went on"))).toBe("went on");
  });
});

describe("the bytes a farm keeps", () => {
  it(`are limited to ${uploadLimits.storedBytesPerFarm / 1024 / 1024} MB per farm, before the body is read and when the file is stored`, async () => {
    const filler = await storedUpload(farmA, {
      outcome: "rejected",
      daysAgo: 1,
      sizeBytes: uploadLimits.storedBytesPerFarm - 1000,
      name: "limits-probe-filler.csv",
    });
    const early = await refusal(withUploadSlot(asFarmA, 5000, () => Promise.resolve()));
    expect(early.code).toBe("too_large");
    expect(early.message).toMatch(/would pass the co-op's limit of 500 MB per farm\. Files of rejected uploads are removed 30 days after/);

    const content = Buffer.from("block_id;strain\r\nLP-1;PO-03\r\n".repeat(100));
    const parser = createSeasonLogParser({});
    parser.write(content);
    const stored = await refusal(createUpload(asFarmA, { fileName: "limits-probe-late.csv", content, result: parser.end(), choices: {} }));
    expect(stored.code).toBe("too_large");
    // Farm B's room is its own.
    expect(await withUploadSlot(asFarmB, 5000, () => Promise.resolve("farm B went on"))).toBe("farm B went on");
    await inspector.query("delete from uploads where id = $1", [filler]);
  });
});

describe("the files of rejected uploads", () => {
  it("are removed after the co-op's retention period, keeping the record and report; nothing else is touched", async () => {
    const old = await storedUpload(farmA, { outcome: "rejected", daysAgo: 31, name: "limits-probe-old-rejected.csv" });
    const recent = await storedUpload(farmA, { outcome: "rejected", daysAgo: 29, name: "limits-probe-recent-rejected.csv" });
    const kept = await storedUpload(farmB, { outcome: "received", daysAgo: 400, name: "limits-probe-old-received.csv" });
    const first = await purgeRejectedUploadFiles();
    expect(first.files).toBeGreaterThanOrEqual(1);
    const state = async (id: string) =>
      (
        await inspector.query<{ bytes: number; purged: boolean; report: unknown }>(
          "select octet_length(content) as bytes, file_purged_at is not null as purged, report from uploads where id = $1",
          [id],
        )
      ).rows[0];
    expect(await state(old)).toEqual({ bytes: 0, purged: true, report: { issues: [] } });
    expect(await state(recent)).toMatchObject({ bytes: 9, purged: false });
    expect(await state(kept)).toMatchObject({ bytes: 9, purged: false });
    expect((await purgeRejectedUploadFiles()).files).toBe(0);

    await expect(getUploadFile(asFarmA, old)).rejects.toThrow(/rejected, and its file was removed after the co-op's retention period/);

    await inspector.query("update cooperative_settings set rejected_upload_retention_days = 20");
    expect((await purgeRejectedUploadFiles()).files).toBe(1);
    expect(await state(recent)).toMatchObject({ bytes: 0, purged: true });
  });

  it("cannot be removed by the app role for another farm by setting the purge's own switch", async () => {
    const target = await storedUpload(farmB, { outcome: "rejected", daysAgo: 1, name: "limits-probe-target.csv" });
    const client = new Client({ connectionString: process.env.DATABASE_URL });
    await client.connect();
    try {
      await client.query("begin");
      await client.query(
        "select set_config('app.user_id', $1, true), set_config('app.farm_id', $2, true), set_config('app.role', 'farm_manager', true)",
        [farmA.managerId, farmA.id],
      );
      await client.query("select set_config('app.purging_rejected_upload_files', 'on', true)");
      const { rowCount } = await client.query("update uploads set content = ''::bytea where id = $1", [target]);
      expect(rowCount).toBe(0);
      await client.query("commit");
    } finally {
      await client.end();
    }
    const { rows } = await inspector.query<{ bytes: number }>("select octet_length(content) as bytes from uploads where id = $1", [target]);
    expect(rows[0].bytes).toBe(9);
  });
});
