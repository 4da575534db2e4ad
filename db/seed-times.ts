/**
 * The demo's activity at believable times. The app stamps what it writes with the transaction's
 * now(), so the seed, which does a whole season's work in seconds, moves those stamps afterwards:
 * each moment is one transaction's now() (every row that transaction wrote carries it exactly)
 * and the working hour in the valley it stands for. Seed-only: no app path takes a time from outside.
 */
import { type SQL, sql } from "drizzle-orm";
import type { NodePgDatabase } from "drizzle-orm/node-postgres";
import type * as schema from "./schema";

/** The invented valley's zone: the hours below are its wall-clock hours. */
export const demoTimeZone = "America/Vancouver";

/** The day in the valley (YYYY-MM-DD) at an instant. */
export function demoDay(instant: Date): string {
  return new Intl.DateTimeFormat("en-CA", { timeZone: demoTimeZone, year: "numeric", month: "2-digit", day: "2-digit" }).format(instant);
}

/** How far the valley's clock is ahead of UTC at an instant, in milliseconds (negative: behind). */
function zoneOffset(instant: number): number {
  const parts = new Intl.DateTimeFormat("en-US", {
    timeZone: demoTimeZone,
    hourCycle: "h23",
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    minute: "2-digit",
    second: "2-digit",
  }).formatToParts(new Date(instant));
  const part = (type: string) => Number(parts.find((candidate) => candidate.type === type)!.value);
  return Date.UTC(part("year"), part("month") - 1, part("day"), part("hour"), part("minute"), part("second")) - instant;
}

/** The instant a valley clock shows `minutes` after midnight of `day` (working hours never fall in a clock change). */
export function inTheValley(day: string, minutes: number): Date {
  const wall = Date.parse(`${day}T00:00:00Z`) + minutes * 60_000;
  const first = wall - zoneOffset(wall);
  return new Date(wall - zoneOffset(first));
}

/** One transaction's now(), found by a query the seed knows (an upload's committed_at, say), and when it stands for. */
export interface Moment {
  original: SQL;
  at: Date;
}

/** The stamps a moment moves: every column the app fills with now() in the demo's transactions. */
const stamped: Record<string, string[]> = {
  uploads: ["uploaded_at", "committed_at"],
  audit_events: ["occurred_at"],
  blocks: ["created_at", "updated_at"],
  harvests: ["created_at", "updated_at"],
  value_changes: ["changed_at"],
  farm_import_preferences: ["updated_at"],
  fruiting_rooms: ["created_at"],
  room_regimes: ["created_at"],
  block_room_moves: ["created_at"],
};

/**
 * Moves every stamp of each moment to its time, in one transaction as the owner. The owner
 * owns these tables, but they are forced under row-level security even for it; it lifts the
 * force for this transaction alone (DDL is transactional: no other session ever sees it lifted)
 * and puts it back before committing. A replaced row's copy kept for an undo is moved too, so an
 * undo still finds each row as its commit left it.
 */
export async function settleDemoTimes(owner: NodePgDatabase<typeof schema>, moments: readonly Moment[]): Promise<void> {
  if (moments.length === 0) return;
  await owner.transaction(async (tx) => {
    const forced = await tx.execute<{ name: string }>(sql`
      select relname as name from pg_class
      where relnamespace = 'public'::regnamespace and relforcerowsecurity and relname in (${sql.join(
        [...Object.keys(stamped), "season_log_replaced_rows"].map((table) => sql`${table}`),
        sql`, `,
      )})`);
    const tables = forced.rows.map((row) => row.name);
    for (const table of tables) await tx.execute(sql.raw(`alter table ${table} no force row level security`));
    await tx.execute(sql`create temporary table seed_moments (original timestamptz primary key, at timestamptz not null) on commit drop`);
    await tx.execute(
      sql`insert into seed_moments (original, at) select original, at from (values ${sql.join(
        moments.map((moment) => sql`((${moment.original}), ${moment.at.toISOString()}::timestamptz)`),
        sql`, `,
      )}) as m (original, at) where original is not null`,
    );
    for (const key of ["created_at", "updated_at"]) {
      await tx.execute(
        sql.raw(`update season_log_replaced_rows r set before = jsonb_set(r.before, '{${key}}', to_jsonb(m.at))
          from seed_moments m where (r.before->>'${key}')::timestamptz = m.original`),
      );
    }
    for (const [table, columns] of Object.entries(stamped)) {
      for (const column of columns) {
        await tx.execute(sql.raw(`update ${table} t set ${column} = m.at from seed_moments m where t.${column} = m.original`));
      }
    }
    for (const table of tables) await tx.execute(sql.raw(`alter table ${table} force row level security`));
  });
}
