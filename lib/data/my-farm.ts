import "server-only";
import { sql } from "drizzle-orm";
import { type Member } from "@/lib/data/members";
import { getCoopStrainBenchmarks } from "@/lib/data/pooled-results";
import { AppError } from "@/lib/errors";
import { ownLeftOutNotes, summariseOwnFarm, type OwnBlock, type OwnLeftOutNote, type OwnStrainSummary } from "@/lib/pooled";
import { seasonLabel } from "@/lib/seasons";
import { asMember } from "./context";
import { seasonStartIn } from "./seasons";
import type { DateStyle } from "@/lib/time/display";

export interface MyFarmPage {
  farmName: string;
  displayUnits: "metric" | "imperial";
  dateStyle: DateStyle;
  minimumFarms: number;
  seasonStartedOn: string;
  /** The season shown (its starting year), or null for the last 365 days. */
  season: number | null;
  /** How the season is named ("2025/26"), or null. */
  seasonLabel: string | null;
  strains: OwnStrainSummary[];
  /** The farm's own blocks left out of its BE and place in the co-op, and how to fix that. */
  ownLeftOut: OwnLeftOutNote[];
}

/**
 * The member's own farm beside the co-op: the blocks of one season when asked (the season their
 * season log named, else their inoculation date's), otherwise the last 365 days (and blocks with no
 * date). The co-op side is the newest release, every season together.
 */
export async function getMyFarm(member: Member, filter: { season?: number | null } = {}): Promise<MyFarmPage> {
  const season = filter.season ?? null;
  if (!member.farmId)
    throw new AppError("forbidden", "My farm is for farm managers and growers; your role belongs to the co-op as a whole.");
  const seasonStartedOn = new Date(Date.now() - 365 * 86_400_000).toISOString().slice(0, 10);
  const { blocks, start } = await asMember(member, async (tx) => {
    const start = await seasonStartIn(tx);
    const result = await tx.execute<{
      id: string;
      strain_id: string;
      strain_name: string;
      species_name: string;
      contaminated: boolean;
      wet_g: number | null;
      moisture: number | null;
      spent_g: number | null;
      harvests: { flush: number; freshG: number }[] | null;
    }>(sql`
      select b.id, b.strain_id, s.name as strain_name, sp.common_name as species_name, b.contaminated,
        b.wet_mass_g::float8 as wet_g, b.moisture::float8 as moisture, b.spent_mass_g::float8 as spent_g,
        (select json_agg(json_build_object('flush', h.flush, 'freshG', h.fresh_mass_g::float8) order by h.flush)
           from harvests h where h.block_id = b.id) as harvests
      from blocks b
      join strains s on s.id = b.strain_id
      join species sp on sp.id = s.species_id
      where ${
        season === null
          ? sql`b.inoculated_on is null or b.inoculated_on >= ${seasonStartedOn}::date`
          : sql`block_season_year(b.inoculated_on, b.season_year) = ${season}`
      }`);
    const blocks = result.rows.map<OwnBlock>((row) => ({
      id: row.id,
      strainId: row.strain_id,
      strainName: row.strain_name,
      speciesName: row.species_name,
      contaminated: row.contaminated,
      wetG: row.wet_g === null ? null : Number(row.wet_g),
      moisture: row.moisture === null ? null : Number(row.moisture),
      spentG: row.spent_g === null ? null : Number(row.spent_g),
      harvests: row.harvests ?? [],
    }));
    return { blocks, start };
  });
  const strainIds = [...new Set(blocks.map((block) => block.strainId))];
  const { minimumFarms, byStrain } = await getCoopStrainBenchmarks(strainIds);
  const strains = summariseOwnFarm(blocks, byStrain, minimumFarms);
  return {
    farmName: member.farmName ?? "Your farm",
    displayUnits: member.displayUnits,
    dateStyle: member.dateStyle,
    minimumFarms,
    seasonStartedOn,
    season,
    seasonLabel: season === null ? null : seasonLabel(season, start),
    strains,
    ownLeftOut: ownLeftOutNotes(
      strains.map((strain) => ({ strainName: strain.strainName, noDryMass: strain.withoutDryMass, noFruitingMethod: 0, noRecipe: 0 })),
      { byFruitingMethod: false, byRecipe: false },
    ),
  };
}
