/**
 * The demo co-op as the seed leaves it (db/seed.ts): its farms' blocks and harvests came through
 * season logs the farms uploaded and committed, or the phone form, so Season logs and the
 * activity logs tell where each figure came from; and every stamp of that history is at a working
 * hour in the valley, in the order things happened. Read as the superuser, past row-level security.
 * Working hours (07:00 to 19:00 on a mushroom farm, picking from early morning) are common practice.
 */
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { demoSignIns } from "@/db/seed";
import { superuserPool } from "./support/database";

const valley = "America/Vancouver";
// The demo's own rows: its block codes and its people; rows other test files make are left out.
const demoBlock = String.raw`^(FE|HO|MI|ST|WR)-\d{3}$|^T01-\d-\d{2}$`;
const demoFarms = ["Fernbrook Farm", "Hollow Oak Mushrooms", "Mill Creek Fungi", "Stonebank Growers", "Wrenfield Farm"];

let inspector: Pool;
let demoPeople: string[];
let valleyMidnight: Date;

/** The valley's wall clock at an instant, read with the platform's time zone data: "2026-07-25 15:27". */
function wallClock(instant: Date): { day: string; hour: number } {
  const parts = new Intl.DateTimeFormat("en-CA", {
    timeZone: valley,
    hourCycle: "h23",
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
  }).formatToParts(instant);
  const part = (type: string) => parts.find((candidate) => candidate.type === type)!.value;
  return { day: `${part("year")}-${part("month")}-${part("day")}`, hour: Number(part("hour")) };
}

beforeAll(async () => {
  inspector = superuserPool();
  const { rows } = await inspector.query<{ id: string }>(
    `select id from users where email = any($1) or email in (select contact_email from farms where name = any($2))`,
    [demoSignIns.map((person) => person.email), demoFarms],
  );
  demoPeople = rows.map((row) => row.id);
  // The seed's last day is yesterday in the valley: all the demo did is before today there.
  const today = wallClock(new Date()).day;
  valleyMidnight = new Date(
    (await inspector.query<{ at: Date }>(`select ($1::date::timestamp at time zone $2) as at`, [today, valley])).rows[0].at,
  );
});

afterAll(async () => {
  await inspector?.end();
});

describe("where the demo's figures came from", () => {
  it("has every demo block brought by a committed season log of its farm whose file lists it", async () => {
    const { rows } = await inspector.query<{
      code: string;
      committed: boolean;
      sameFarm: boolean;
      listed: boolean;
      createdByAnUpload: boolean;
    }>(
      `select b.code,
              coalesce(u.outcome = 'committed', false) as committed,
              coalesce(u.farm_id = b.farm_id, false) as "sameFarm",
              coalesce(convert_from(u.content, 'UTF8') ~ ('(^|\n)' || b.code || ','), false) as listed,
              exists (select 1 from uploads first where first.farm_id = b.farm_id and first.committed_at = b.created_at
                        and convert_from(first.content, 'UTF8') ~ ('(^|\n)' || b.code || ',')) as "createdByAnUpload"
         from blocks b left join uploads u on u.id = b.last_upload_id
        where b.code ~ $1`,
      [demoBlock],
    );
    expect(rows.length).toBeGreaterThan(400);
    expect(rows.filter((row) => !(row.committed && row.sameFarm && row.listed && row.createdByAnUpload))).toEqual([]);
  });

  it("gives each farm several season logs, and a weight one file mistyped put right by the next", async () => {
    const { rows } = await inspector.query<{ name: string; committed: number; corrected: number }>(
      `select f.name,
              (select count(*)::int from uploads u where u.farm_id = f.id and u.outcome = 'committed') as committed,
              (select count(*)::int from value_changes v where v.farm_id = f.id and v.field = 'fresh_weight' and v.upload_id is not null
                 and v.changed_at < $1) as corrected
         from farms f where f.name = any($2) order by f.name`,
      [valleyMidnight, demoFarms],
    );
    expect(rows).toHaveLength(5);
    for (const row of rows) {
      expect(row.committed, row.name).toBeGreaterThanOrEqual(3);
      expect(row.corrected, row.name).toBeGreaterThanOrEqual(1);
    }
    const { rows: rejected } = await inspector.query(`select 1 from uploads where outcome = 'rejected' and uploaded_at < $1`, [
      valleyMidnight,
    ]);
    expect(rejected.length).toBeGreaterThanOrEqual(1);
  });

  it("has every demo harvest from a committed file that lists its flush, or typed into the phone form on its day", async () => {
    const { rows } = await inspector.query<{
      code: string;
      flush: number;
      harvestedOn: string;
      createdAt: Date;
      fromFile: boolean | null;
      recordedAt: Date | null;
    }>(
      `select b.code, h.flush, h.harvested_on::text as "harvestedOn", h.created_at as "createdAt",
              case when h.upload_id is null then null
                   else coalesce(u.outcome = 'committed' and convert_from(u.content, 'UTF8') ~ ('(^|\n)' || b.code || ',[^\n]*,' || h.flush || ',' || h.harvested_on || ','), false)
              end as "fromFile",
              (select a.occurred_at from audit_events a where a.action = 'harvest.recorded' and a.details->>'blockId' = b.id::text
                  and (a.details->>'flush')::int = h.flush) as "recordedAt"
         from harvests h join blocks b on b.id = h.block_id left join uploads u on u.id = h.upload_id
        where b.code ~ $1`,
      [demoBlock],
    );
    expect(rows.length).toBeGreaterThan(1000);
    expect(rows.filter((row) => row.fromFile === false)).toEqual([]);
    const phoned = rows.filter((row) => row.fromFile === null);
    expect(phoned.length).toBeGreaterThan(0);
    for (const row of phoned) {
      expect(row.recordedAt, `${row.code} flush ${row.flush}`).not.toBeNull();
      expect(row.createdAt.getTime()).toBe(row.recordedAt!.getTime());
      expect(wallClock(row.createdAt).day, `${row.code} flush ${row.flush}`).toBe(row.harvestedOn);
    }
  });
});

describe("when the demo's activity happened", () => {
  it("puts every activity entry of the demo's people at a working hour in the valley, before now", async () => {
    const { rows } = await inspector.query<{ action: string; subject: string; occurredAt: Date }>(
      `select action, subject, occurred_at as "occurredAt" from audit_events where actor_user_id = any($1) and occurred_at < $2`,
      [demoPeople, valleyMidnight],
    );
    expect(rows.length).toBeGreaterThan(30);
    const offHours = rows.filter((row) => {
      const { hour } = wallClock(row.occurredAt);
      return hour < 7 || hour >= 19;
    });
    expect(offHours).toEqual([]);
    // Spread over the season, not one afternoon.
    expect(new Set(rows.map((row) => wallClock(row.occurredAt).day)).size).toBeGreaterThan(15);
  });

  it("leaves nothing of the demo stamped at set-up time", async () => {
    const { rows } = await inspector.query<{ what: string; count: number }>(
      `select 'uploads' as what, count(*)::int as count from uploads u join users p on p.id = u.uploaded_by
        where p.id = any($1) and (u.uploaded_at >= $2 or u.committed_at >= $2) and u.file_name like '%-season-log-%'
       union all
       select 'blocks', count(*)::int from blocks where code ~ $3 and (created_at >= $2 or updated_at >= $2)
       union all
       select 'farms and people', count(*)::int from users where id = any($1) and created_at >= $2`,
      [demoPeople, valleyMidnight, demoBlock],
    );
    expect(rows).toEqual([
      { what: "uploads", count: 0 },
      { what: "blocks", count: 0 },
      { what: "farms and people", count: 0 },
    ]);
  });

  it("has each upload checked before it is committed, the activity log saying so at the same moments, and each farm's files in turn", async () => {
    const { rows } = await inspector.query<{
      farmId: string;
      fileName: string;
      uploadedAt: Date;
      committedAt: Date | null;
      uploadedEntry: Date | null;
      committedEntry: Date | null;
      changedAt: Date[] | null;
    }>(
      `select u.farm_id as "farmId", u.file_name as "fileName", u.uploaded_at as "uploadedAt", u.committed_at as "committedAt",
              (select occurred_at from audit_events a where a.action = 'season-log.uploaded' and a.details->>'uploadId' = u.id::text) as "uploadedEntry",
              (select occurred_at from audit_events a where a.action = 'season-log.committed' and a.details->>'uploadId' = u.id::text) as "committedEntry",
              (select array_agg(distinct changed_at) from value_changes v where v.upload_id = u.id) as "changedAt"
         from uploads u where u.uploaded_at < $1 order by u.farm_id, u.uploaded_at`,
      [valleyMidnight],
    );
    expect(rows.length).toBeGreaterThanOrEqual(15);
    let previous: (typeof rows)[number] | null = null;
    for (const upload of rows) {
      expect(upload.uploadedEntry?.getTime(), upload.fileName).toBe(upload.uploadedAt.getTime());
      if (upload.committedAt) {
        expect(upload.committedAt.getTime(), upload.fileName).toBeGreaterThan(upload.uploadedAt.getTime());
        expect(upload.committedEntry?.getTime(), upload.fileName).toBe(upload.committedAt.getTime());
        for (const changed of upload.changedAt ?? []) expect(changed.getTime(), upload.fileName).toBe(upload.committedAt.getTime());
      }
      if (previous?.farmId === upload.farmId)
        expect(upload.uploadedAt.getTime(), upload.fileName).toBeGreaterThan((previous.committedAt ?? previous.uploadedAt).getTime());
      previous = upload;
    }
  });

  it("keeps each commit's rows at its commit's time, so its undo finds them as it left them", async () => {
    const { rows } = await inspector.query<{ fileName: string; moved: number }>(
      `select u.file_name as "fileName",
              (select count(*)::int from blocks b where b.last_upload_id = u.id and b.updated_at <> u.committed_at)
            + (select count(*)::int from harvests h where h.upload_id = u.id and h.updated_at <> u.committed_at)
            + (select count(*)::int from season_log_replaced_rows r join uploads later on later.id = r.upload_id
                where r.upload_id = u.id and (r.before->>'updated_at')::timestamptz >= later.committed_at) as moved
         from uploads u where u.outcome = 'committed' and u.committed_at < $1`,
      [valleyMidnight],
    );
    expect(rows.length).toBeGreaterThanOrEqual(15);
    expect(rows.filter((row) => row.moved > 0)).toEqual([]);
  });
});
