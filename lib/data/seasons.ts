import "server-only";
import { and, desc, eq, isNotNull, sql } from "drizzle-orm";
import type { Transaction } from "@/db/client";
import { blocks, cooperativeSettings } from "@/db/schema";
import { recordAudit } from "@/lib/data/audit";
import { type Member } from "@/lib/data/members";
import { AppError } from "@/lib/errors";
import { calendarYear, type SeasonStart } from "@/lib/seasons";
import { asMember, farmOf } from "./context";

/** The co-op's season start, read inside a caller's transaction. */
export async function seasonStartIn(tx: Transaction): Promise<SeasonStart> {
  const [row] = await tx
    .select({ month: cooperativeSettings.seasonStartMonth, day: cooperativeSettings.seasonStartDay })
    .from(cooperativeSettings);
  return row ?? calendarYear;
}

export async function getSeasonStart(member: Member): Promise<SeasonStart> {
  return asMember(member, seasonStartIn);
}

/** The coordinator moves the day the season starts; every block's season follows at once (migration 0039). Audited. */
export async function updateSeasonStart(member: Member, start: SeasonStart): Promise<void> {
  await asMember(member, async (tx) => {
    const before = await seasonStartIn(tx);
    const updated = await tx
      .update(cooperativeSettings)
      .set({ seasonStartMonth: start.month, seasonStartDay: start.day, updatedAt: sql`now()` })
      .where(eq(cooperativeSettings.id, 1))
      .returning({ id: cooperativeSettings.id });
    if (updated.length === 0) throw new AppError("forbidden", "Only the co-op coordinator may change the season start.");
    await recordAudit(tx, {
      action: "cooperative-settings.updated",
      subject: "Season start",
      farmId: null,
      actorUserId: member.id,
      actorLabel: member.name,
      details: { before: { seasonStart: before }, after: { seasonStart: start } },
    });
  });
}

/** A block's season in SQL: the one its season log named, else its inoculation date's (migration 0039). */
export const blockSeasonYear = sql<number | null>`block_season_year(${blocks.inoculatedOn}, ${blocks.seasonYear})`;

/** The seasons the member's farm has blocks in, newest first, with the co-op's season start to name them by. */
export async function listFarmSeasons(member: Member): Promise<{ start: SeasonStart; seasons: number[] }> {
  const farm = farmOf(member, "see its seasons");
  return asMember(member, async (tx) => {
    const start = await seasonStartIn(tx);
    const rows = await tx
      .selectDistinct({ season: blockSeasonYear })
      .from(blocks)
      .where(and(eq(blocks.farmId, farm.farmId), isNotNull(blockSeasonYear)))
      .orderBy(desc(blockSeasonYear));
    return { start, seasons: rows.map((row) => Number(row.season)) };
  });
}
