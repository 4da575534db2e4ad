import { Client, type Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase } from "@/db/client";
import { refreshPooledStatistics } from "@/lib/data/pooled-refresh";
import { superuserPool, twoDemoFarms, type DemoFarm } from "../support/database";

/**
 * The pooled-analysis role as an attacker who holds its password would use it: it reads across
 * farms, so it must see only what pooled figures are made of, and it must not be able to plant
 * or erase a farm's statistics except by running the refresh over the farm's real rows.
 */

let inspector: Pool;
let farm: DemoFarm;

beforeAll(async () => {
  inspector = superuserPool();
  [farm] = await twoDemoFarms(inspector);
});

afterAll(async () => {
  await inspector.end();
  await closeDatabase();
});

async function asAnalyst<T>(work: (client: Client) => Promise<T>): Promise<T> {
  const client = new Client({ connectionString: process.env.ANALYST_DATABASE_URL });
  await client.connect();
  try {
    return await work(client);
  } finally {
    await client.end();
  }
}

async function refusal(statement: string, values: unknown[] = []): Promise<string> {
  return asAnalyst(async (client) => {
    try {
      await client.query(statement, values);
    } catch (error) {
      return (error as Error).message;
    }
    throw new Error(`the analyst role was allowed: ${statement}`);
  });
}

describe("the pooled-analysis role", () => {
  it("reads no block code, note, mass as written, unit or upload of any farm", async () => {
    for (const column of ["code", "notes", "wet_mass_as_written", "wet_mass_unit", "last_upload_id", "updated_at"]) {
      expect(await refusal(`select ${column} from blocks limit 1`), column).toMatch(/permission denied for table blocks/);
    }
    for (const column of [
      "fresh_mass_as_written",
      "fresh_mass_unit",
      "accepted_warnings",
      "dry_mass_as_written",
      "dry_mass_unit",
      "upload_id",
      "created_at",
    ]) {
      expect(await refusal(`select ${column} from harvests limit 1`), column).toMatch(/permission denied for table harvests/);
    }
    expect(await refusal("select * from blocks limit 1")).toMatch(/permission denied/);
    // Rooms (0041): never a room's name, a note, who recorded it or which upload said so.
    for (const column of ["name", "notes", "created_at"]) {
      expect(await refusal(`select ${column} from fruiting_rooms limit 1`), column).toMatch(/permission denied for table fruiting_rooms/);
    }
    for (const column of ["notes", "created_by", "created_at"]) {
      expect(await refusal(`select ${column} from room_regimes limit 1`), column).toMatch(/permission denied for table room_regimes/);
    }
    for (const column of ["upload_id", "created_by", "created_at"]) {
      expect(await refusal(`select ${column} from block_room_moves limit 1`), column).toMatch(
        /permission denied for table block_room_moves/,
      );
    }
    for (const table of ["uploads", "value_changes", "audit_events", "users", "access_tokens", "farm_import_preferences"]) {
      expect(await refusal(`select count(*) from ${table}`), table).toMatch(/permission denied/);
    }
  });

  it("reads no note or free text of the registers or trials, and nothing of farms or enrolments", async () => {
    // Before 0048 it read every column of the registers and trials: a strain's notes and proposer, a trial's protocol notes.
    const denied: [string, string][] = [
      ["strains", "notes"],
      ["strains", "proposed_by"],
      ["strains", "code"],
      ["species", "scientific_name"],
      ["substrate_recipes", "base"],
      ["substrate_recipes", "supplement"],
      ["treatments", "description"],
      ["trials", "protocol_notes"],
      ["trials", "question"],
      ["trial_arms", "label"],
      ["trial_enrolments", "farm_id"],
      ["farms", "id"],
      ["farms", "status"],
    ];
    for (const [table, column] of denied) {
      expect(await refusal(`select ${column} from ${table} limit 1`), `${table}.${column}`).toMatch(/permission denied/);
    }
    // What the pooled pages name stays readable.
    const { rows } = await asAnalyst((client) =>
      client.query<{ n: number }>(
        `select (select count(*)::int from species where common_name <> '') + (select count(*)::int from strains where name <> '' and species_id is not null)
              + (select count(*)::int from substrate_recipes where name <> '') + (select count(*)::int from treatments where kind = 'fruiting_method') as n`,
      ),
    );
    expect(rows[0].n).toBeGreaterThan(4);
  });

  it("still reads what pooled figures are made of", async () => {
    const { rows } = await asAnalyst((client) =>
      client.query<{ blocks: number; harvests: number }>(
        `select (select count(*)::int from blocks where wet_mass_g > 0 and moisture is not null) as blocks,
                (select count(*)::int from harvests where fresh_mass_g > 0) as harvests`,
      ),
    );
    expect(rows[0].blocks).toBeGreaterThan(0);
    expect(rows[0].harvests).toBeGreaterThan(0);
    // 0047: the drying ratio needs a harvest's dry mass, and a block that never fruited is placed in
    // its room on the day it was found contaminated; both are numbers or dates, never words as written.
    await asAnalyst((client) => client.query("select dry_mass_g from harvests limit 1"));
    await asAnalyst((client) => client.query("select contaminated_on from blocks limit 1"));
  });

  it("cannot plant, change or erase a farm's statistics directly", async () => {
    const insert = `insert into farm_strain_statistics (farm_id, species_id, strain_id, flush_window, blocks, blocks_contaminated,
      efficiency_blocks, efficiency_sum, efficiency_squares, efficiency_bins, first_harvest_blocks, first_harvest_days_sum)
      select farm_id, species_id, strain_id, flush_window, 99, 0, 99, 9900, 990000, '{}'::jsonb, 0, 0 from farm_strain_statistics limit 1`;
    expect(await refusal(insert)).toMatch(/permission denied for table farm_strain_statistics/);
    expect(await refusal("update farm_strain_statistics set efficiency_sum = 0")).toMatch(/permission denied/);
    expect(await refusal("delete from farm_strain_statistics where farm_id = $1", [farm.id])).toMatch(/permission denied/);
    expect(await refusal("delete from farm_flush_statistics where farm_id = $1", [farm.id])).toMatch(/permission denied/);
    expect(await refusal("truncate farm_flush_statistics")).toMatch(/permission denied/);
  });

  it("changes statistics through the refresh, which recomputes them from the farm's real rows", async () => {
    const statistics = async () =>
      (
        await inspector.query<{ sum: number }>(
          "select coalesce(sum(efficiency_sum), 0)::float8 as sum from farm_strain_statistics where farm_id = $1 and flush_window = 'all'",
          [farm.id],
        )
      ).rows[0].sum;
    // Settled first: a file run before this one may have changed the farm's rows and left its refresh queued.
    await refreshPooledStatistics(farm.id);
    const before = await statistics();
    // A stale row planted by someone with the owner's rights is replaced by what the rows say.
    await inspector.query("update farm_strain_statistics set efficiency_sum = efficiency_sum + 1000 where farm_id = $1", [farm.id]);
    expect(await statistics()).toBeGreaterThan(before + 999);
    await asAnalyst((client) => client.query("select pooled_refresh_farm($1)", [farm.id]));
    expect(await statistics()).toBeCloseTo(before, 6);
    await refreshPooledStatistics(farm.id);
    expect(await statistics()).toBeCloseTo(before, 6);
  });

  it("runs the refresh as a role of its own whose reading policies serve no one else", async () => {
    const { rows } = await inspector.query<{ owner: string; definer: boolean; config: string[] }>(
      `select pg_get_userbyid(proowner) as owner, prosecdef as definer, proconfig as config from pg_proc where oid = 'pooled_refresh(uuid[])'::regprocedure`,
    );
    expect(rows[0]).toMatchObject({ owner: "rhizo_statistics", definer: true });
    expect(rows[0].config).toContain("search_path=pg_catalog, public, pg_temp");
    const { rows: login } = await inspector.query<{ rolcanlogin: boolean }>(
      "select rolcanlogin from pg_roles where rolname = 'rhizo_statistics'",
    );
    expect(login[0].rolcanlogin).toBe(false);
    // The owner is a member of rhizo_statistics, yet sees no farm's blocks through its policy.
    const owner = new Client({ connectionString: process.env.OWNER_DATABASE_URL });
    await owner.connect();
    try {
      const { rows: seen } = await owner.query<{ blocks: number }>("select count(*)::int as blocks from blocks");
      expect(seen[0].blocks).toBe(0);
    } finally {
      await owner.end();
    }
  });
});
