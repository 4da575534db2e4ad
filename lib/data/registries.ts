import "server-only";
import { asc, eq, inArray, sql } from "drizzle-orm";
import { withAnalystAccess, type Transaction } from "@/db/client";
import { blocks, cooperativeSettings, roomRegimes, species, strains, substrateRecipes, treatments, trialArms } from "@/db/schema";
import { AppError, databaseRefusalOf } from "@/lib/errors";
import { RegisterMatcher } from "@/lib/import/registers";
import { describeProblem, parseRegistryCsv, type RegistryKind, type RegistryRow } from "@/lib/members/registry-csv";
import { suppressedMessage, type Published } from "@/lib/pooled";
import { actor, recordAudit } from "./audit";
import { type Member } from "./members";
import { latestRelease, releaseContents } from "./pooled-releases";
import { asMember } from "./context";
import { count } from "@/lib/words";

const tables = { species, strains, substrate_recipes: substrateRecipes, treatments } as const;
type Status = "proposed" | "active" | "retired";

/**
 * Which registry entries records use, live, as a yes or no per entry: a used entry can be retired
 * but not deleted, so the page offers Delete only where it can succeed. Blocks and room regimes are read by the
 * analyst role (the coordinator cannot see farms' rows), trial arms and strains as the coordinator.
 */
async function entriesInUse(tx: Transaction): Promise<Record<RegistryKind, Set<string>>> {
  const used = await withAnalystAccess((analyst) =>
    analyst
      .selectDistinct({ strainId: blocks.strainId, recipeId: blocks.substrateRecipeId, methodId: blocks.fruitingMethodId })
      .from(blocks),
  );
  // A climate regime kind named by a farm's room regime, read the same way (room_regimes.regime_kind_id, 0041).
  const regimeKinds = await withAnalystAccess((analyst) => analyst.selectDistinct({ kindId: roomRegimes.regimeKindId }).from(roomRegimes));
  const arms = await tx.select({ strainId: trialArms.strainId, treatmentId: trialArms.treatmentId }).from(trialArms);
  const strainSpecies = await tx.selectDistinct({ speciesId: strains.speciesId }).from(strains);
  const ids = (values: (string | null)[]) => new Set(values.filter((value): value is string => value !== null));
  return {
    species: ids(strainSpecies.map((row) => row.speciesId)),
    strains: ids([...used.map((row) => row.strainId), ...arms.map((arm) => arm.strainId)]),
    substrate_recipes: ids(used.map((row) => row.recipeId)),
    treatments: ids([...used.map((row) => row.methodId), ...arms.map((arm) => arm.treatmentId), ...regimeKinds.map((row) => row.kindId)]),
  };
}

/**
 * Whether records use this one entry, asked of its own register only: a species by its strains; a
 * strain by blocks (through the analyst role, as above) or trial arms; a recipe by blocks; a
 * fruiting method or treatment by blocks or trial arms. One "exists" each, never every register.
 */
async function entryInUse(tx: Transaction, kind: RegistryKind, id: string): Promise<boolean> {
  const anyRow = async (query: Promise<unknown[]>) => (await query).length > 0;
  const byBlocks = (column: typeof blocks.strainId | typeof blocks.substrateRecipeId | typeof blocks.fruitingMethodId) =>
    withAnalystAccess((analyst) =>
      anyRow(
        analyst
          .select({ one: sql`1` })
          .from(blocks)
          .where(eq(column, id))
          .limit(1),
      ),
    );
  switch (kind) {
    case "species":
      return anyRow(
        tx
          .select({ one: sql`1` })
          .from(strains)
          .where(eq(strains.speciesId, id))
          .limit(1),
      );
    case "strains":
      return (
        (await anyRow(
          tx
            .select({ one: sql`1` })
            .from(trialArms)
            .where(eq(trialArms.strainId, id))
            .limit(1),
        )) || byBlocks(blocks.strainId)
      );
    case "substrate_recipes":
      return byBlocks(blocks.substrateRecipeId);
    case "treatments":
      return (
        (await anyRow(
          tx
            .select({ one: sql`1` })
            .from(trialArms)
            .where(eq(trialArms.treatmentId, id))
            .limit(1),
        )) || byBlocks(blocks.fruitingMethodId)
      );
  }
}

/**
 * How many blocks of each strain the newest release counts, published only where at least the
 * co-op's minimum number of farms have blocks of it, like every other count: a strain grown on
 * one farm would otherwise show that farm's block count to everyone.
 */
async function publishedBlocksPerStrain(): Promise<{ minimumFarms: number; byStrain: Map<string, number> }> {
  return withAnalystAccess(async (tx) => {
    const [settings] = await tx.select({ minimumFarms: cooperativeSettings.minimumFarms }).from(cooperativeSettings);
    const minimumFarms = settings?.minimumFarms ?? 3;
    const release = await latestRelease(tx);
    if (!release) return { minimumFarms, byStrain: new Map() };
    const counts = new Map<string, { blocks: number; farms: Set<string> }>();
    for (const row of (await releaseContents(tx, release.number, { flushWindow: "all" })).strainRows) {
      if (row.blocks === 0) continue;
      const entry = counts.get(row.strainId) ?? { blocks: 0, farms: new Set<string>() };
      entry.blocks += row.blocks;
      entry.farms.add(row.farmId);
      counts.set(row.strainId, entry);
    }
    return {
      minimumFarms,
      byStrain: new Map(
        [...counts].filter(([, entry]) => entry.farms.size >= minimumFarms).map(([strainId, entry]) => [strainId, entry.blocks]),
      ),
    };
  });
}

export async function listRegistries(member: Member) {
  const published = await publishedBlocksPerStrain();
  return asMember(member, async (tx) => {
    // Whether an entry is used matters only to the coordinator, who may delete unused ones.
    const inUse = member.role === "coordinator" ? await entriesInUse(tx) : null;
    const used = (kind: RegistryKind, id: string) => inUse?.[kind].has(id) ?? false;
    const speciesRows = await tx.select().from(species).orderBy(asc(species.commonName));
    const speciesName = new Map(speciesRows.map((row) => [row.id, row.commonName]));
    const strainRows = await tx.select().from(strains).orderBy(asc(strains.code));
    const recipeRows = await tx.select().from(substrateRecipes).orderBy(asc(substrateRecipes.code));
    const treatmentRows = await tx.select().from(treatments).orderBy(asc(treatments.code));
    return {
      species: speciesRows.map((row) => ({ ...row, inUse: used("species", row.id) })),
      strains: strainRows.map((row) => {
        const count = published.byStrain.get(row.id);
        const blocks: Published<number> =
          count === undefined
            ? { status: "suppressed", message: suppressedMessage(published.minimumFarms) }
            : { status: "published", value: count };
        return { ...row, speciesName: speciesName.get(row.speciesId) ?? "", blocks, inUse: used("strains", row.id) };
      }),
      substrateRecipes: recipeRows.map((row) => ({ ...row, inUse: used("substrate_recipes", row.id) })),
      treatments: treatmentRows.map((row) => ({ ...row, inUse: used("treatments", row.id) })),
    };
  });
}

async function insertEntry(
  tx: Transaction,
  row: RegistryRow,
  status: Status,
  proposedBy: string | null,
  speciesRegister: RegisterMatcher<SpeciesEntry>,
): Promise<string> {
  switch (row.kind) {
    case "species": {
      const [created] = await tx
        .insert(species)
        .values({ scientificName: row.scientificName, commonName: row.commonName, status, proposedBy })
        .returning({ id: species.id });
      return created.id;
    }
    case "strains": {
      const speciesId = speciesRegister.find(row.species)?.id;
      if (!speciesId)
        throw new AppError("invalid_input", `Species "${row.species}" is not in the registry.${speciesRegister.suggestion(row.species)}`, [
          { field: "species", message: "Choose a species from the registry, or propose it first." },
        ]);
      const [created] = await tx
        .insert(strains)
        .values({ code: row.code, speciesId, name: row.name, source: row.source, notes: row.notes, status, proposedBy })
        .returning({ id: strains.id });
      return created.id;
    }
    case "substrate_recipes": {
      const { kind: _kind, ...values } = row;
      void _kind;
      const [created] = await tx
        .insert(substrateRecipes)
        .values({ ...values, status, proposedBy })
        .returning({ id: substrateRecipes.id });
      return created.id;
    }
    case "treatments": {
      const [created] = await tx
        .insert(treatments)
        .values({ code: row.code, name: row.name, kind: row.treatmentKind, description: row.description, status, proposedBy })
        .returning({ id: treatments.id });
      return created.id;
    }
  }
}

/** An active species by its scientific or common name (any case), or by its id, as the form sends it. */
interface SpeciesEntry {
  id: string;
  code: string;
  names: string[];
}

async function speciesLookup(tx: Transaction): Promise<RegisterMatcher<SpeciesEntry>> {
  const rows = await tx
    .select({ id: species.id, scientificName: species.scientificName, commonName: species.commonName })
    .from(species)
    .where(eq(species.status, "active"));
  return new RegisterMatcher(rows.map((row) => ({ id: row.id, code: row.scientificName, names: [row.commonName, row.id] })));
}

function duplicateProblem(error: unknown): AppError | null {
  if (databaseRefusalOf(error).code === "23505")
    return new AppError("conflict", "That code or name is already in the registry.", [
      { field: "code", message: "Choose a code no other entry uses." },
    ]);
  return null;
}

/** The coordinator adds an entry directly; a farm's people propose one, which waits for approval. */
export async function createRegistryEntry(member: Member, row: RegistryRow): Promise<Status> {
  const status: Status = member.role === "coordinator" ? "active" : "proposed";
  try {
    await asMember(member, async (tx) => {
      const id = await insertEntry(tx, row, status, member.role === "coordinator" ? null : member.id, await speciesLookup(tx));
      await recordAudit(tx, {
        ...actor(member),
        action: status === "active" ? "registry.added" : "registry.proposed",
        subject: "code" in row ? row.code : row.scientificName,
        details: { registry: row.kind, id },
      });
    });
  } catch (error) {
    throw duplicateProblem(error) ?? error;
  }
  return status;
}

const registryMoves = {
  approve: "registry.approved",
  retire: "registry.retired",
  reinstate: "registry.reinstated",
  delete: "registry.deleted",
} as const;

/**
 * The coordinator approves a proposal, retires or reinstates an entry, or deletes one. A strain
 * that any block or trial uses can be retired but never deleted; the foreign keys hold that too.
 */
export async function moveRegistryEntry(
  member: Member,
  kind: RegistryKind,
  id: string,
  move: "approve" | "retire" | "reinstate" | "delete",
): Promise<void> {
  if (member.role !== "coordinator") throw new AppError("forbidden", "Only the coordinator approves, retires or deletes registry entries.");
  await asMember(member, async (tx) => {
    const table = tables[kind];
    const [entry] = await tx.select().from(table).where(eq(table.id, id));
    if (!entry) throw new AppError("not_found", "That entry is not in the registry. Reload the page.");
    const label = "code" in entry ? entry.code : entry.scientificName;
    if (move === "delete") {
      if (await entryInUse(tx, kind, id))
        throw new AppError("conflict", `${label} is used by recorded blocks or a trial: retire it instead, so past records keep it.`);
      try {
        await tx.delete(table).where(eq(table.id, id));
      } catch {
        throw new AppError("conflict", `${label} is used by other records: retire it instead.`);
      }
    } else {
      const status: Status = move === "retire" ? "retired" : "active";
      const changed = await tx.update(table).set({ status }).where(eq(table.id, id)).returning({ id: table.id });
      if (changed.length === 0) throw new AppError("forbidden", "The registry entry could not be changed from your role.");
    }
    await recordAudit(tx, {
      ...actor(member),
      action: registryMoves[move],
      subject: label,
      details: { registry: kind, id },
    });
  });
}

/** Imports a whole list in one transaction: every row goes in, or none does, with each problem's line. */
export async function importRegistryCsv(member: Member, kind: RegistryKind, text: string): Promise<number> {
  if (member.role !== "coordinator") throw new AppError("forbidden", "Only the coordinator imports registry lists.");
  const { rows, problems } = parseRegistryCsv(kind, text);
  if (problems.length) {
    throw new AppError("invalid_input", `Nothing was imported: ${count(problems.length, "problem")} to fix in the file.`, [
      { field: "file", message: problems.slice(0, 20).map(describeProblem).join(" · ") },
    ]);
  }
  return asMember(member, async (tx) => {
    const lookup = await speciesLookup(tx);
    const table = tables[kind];
    const existing =
      kind === "species"
        ? await tx
            .select({ key: species.scientificName })
            .from(species)
            .where(
              inArray(
                sql`lower(${species.scientificName})`,
                rows.map((row) => (row.kind === "species" ? row.scientificName.toLowerCase() : "")),
              ),
            )
        : await tx
            .select({ key: sql<string>`code` })
            .from(table)
            .where(
              inArray(
                sql`code`,
                rows.map((row) => ("code" in row ? row.code : "")),
              ),
            );
    if (existing.length) {
      throw new AppError("invalid_input", "Nothing was imported: some entries are already in the registry.", [
        { field: "file", message: `Already there: ${existing.map((row) => row.key).join(", ")}. Remove those lines and import again.` },
      ]);
    }
    for (const [index, row] of rows.entries()) {
      try {
        await insertEntry(tx, row, "active", null, lookup);
      } catch (error) {
        if (error instanceof AppError)
          throw new AppError("invalid_input", "Nothing was imported.", [{ field: "file", message: `Line ${index + 2}: ${error.message}` }]);
        throw error;
      }
    }
    await recordAudit(tx, {
      ...actor(member),
      action: "registry.imported",
      subject: kind,
      details: { rows: rows.length },
    });
    return rows.length;
  });
}
