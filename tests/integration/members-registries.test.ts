import { Client, type Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase } from "@/db/client";
import { loadMember, type Member } from "@/lib/data/members";
import { createRegistryEntry, importRegistryCsv, listRegistries, moveRegistryEntry } from "@/lib/data/registries";
import { superuserPool } from "./support/database";

let inspector: Pool;
let coordinator: Member;
let grower: Member;
const run = Date.now().toString(36).toUpperCase().slice(-6);

async function memberByEmail(email: string): Promise<Member> {
  const { rows } = await inspector.query<{ id: string }>("select id from users where email = $1", [email]);
  return (await loadMember(rows[0].id))!;
}

beforeAll(async () => {
  inspector = superuserPool();
  coordinator = await memberByEmail("coordinator@aldervalley.example");
  grower = await memberByEmail("grower@fernbrook.example");
});

afterAll(async () => {
  await inspector.end();
  await closeDatabase();
});

describe("registries: proposals, approval, retirement", () => {
  it("keeps a grower's proposed strain waiting until the coordinator approves it", async () => {
    const { rows } = await inspector.query<{ id: string }>("select id from species where common_name ilike '%oyster%' limit 1");
    const code = `PO-${run}`;
    expect(
      await createRegistryEntry(grower, {
        kind: "strains",
        code,
        species: rows[0].id,
        name: "Barn Loft",
        source: "own_isolate",
        notes: "",
      }),
    ).toBe("proposed");
    const proposed = (await listRegistries(coordinator)).strains.find((strain) => strain.code === code)!;
    expect(proposed.status).toBe("proposed");
    await expect(moveRegistryEntry(grower, "strains", proposed.id, "approve")).rejects.toThrow(/Only the coordinator/);
    await moveRegistryEntry(coordinator, "strains", proposed.id, "approve");
    expect((await inspector.query<{ status: string }>("select status from strains where id = $1", [proposed.id])).rows[0].status).toBe(
      "active",
    );
    const events = await inspector.query<{ action: string }>("select action from audit_events where subject = $1 order by id", [code]);
    expect(events.rows.map((row) => row.action)).toEqual(["registry.proposed", "registry.approved"]);
  });

  it("refuses to delete a strain that has blocks, counting them across farms the coordinator cannot see, but retires it", async () => {
    const registries = await listRegistries(coordinator);
    const used = registries.strains.find((strain) => strain.code === "PO-01")!;
    const { rows } = await inspector.query<{ n: number }>("select count(*)::int as n from blocks where strain_id = $1", [used.id]);
    expect(rows[0].n).toBeGreaterThan(0);
    expect(used.inUse).toBe(true);
    // The count shown is the newest release's (grown on five farms, so published), not the live one.
    const { rows: released } = await inspector.query<{ n: number }>(
      `select sum(blocks)::int as n from pooled_release_strain_rows
       where strain_id = $1 and flush_window = 'all' and release_number = (select max(number) from pooled_releases)`,
      [used.id],
    );
    expect(used.blocks).toEqual({ status: "published", value: released[0].n });
    await expect(moveRegistryEntry(coordinator, "strains", used.id, "delete")).rejects.toThrow(/retire it instead/);
    await moveRegistryEntry(coordinator, "strains", used.id, "retire");
    expect((await inspector.query<{ status: string }>("select status from strains where id = $1", [used.id])).rows[0].status).toBe(
      "retired",
    );
    await moveRegistryEntry(coordinator, "strains", used.id, "reinstate");
  });

  it("marks every kind of entry that blocks or a trial use, so Delete is offered only where it can succeed, and refuses it anyway", async () => {
    const registries = await listRegistries(coordinator);
    const recipe = registries.substrateRecipes.find((entry) => entry.code === "HWB-20")!;
    const method = registries.treatments.find((entry) => entry.code === "SLIT-ACROSS")!;
    const oyster = registries.species.find((entry) => entry.commonName === "Oyster mushroom")!;
    for (const [table, column, id] of [
      ["blocks", "substrate_recipe_id", recipe.id],
      ["blocks", "fruiting_method_id", method.id],
      ["strains", "species_id", oyster.id],
    ]) {
      const { rows } = await inspector.query<{ n: number }>(`select count(*)::int as n from ${table} where ${column} = $1`, [id]);
      expect(rows[0].n, `${table}.${column}`).toBeGreaterThan(0);
    }
    expect([recipe.inUse, method.inUse, oyster.inUse]).toEqual([true, true, true]);
    await expect(moveRegistryEntry(coordinator, "substrate_recipes", recipe.id, "delete")).rejects.toThrow(/retire it instead/);
    // A farm person is not told which entries other farms use.
    const asFarm = await listRegistries(grower);
    expect(asFarm.substrateRecipes.every((entry) => !entry.inUse)).toBe(true);
  });

  it("asks, when an entry is deleted, only whether that entry is used, and only of its own register", async () => {
    // Before, deleting any entry read every block's strain, recipe and method, every trial arm and
    // every strain's species. Each statement sent while deleting is seen here.
    const statementsOf = async (work: () => Promise<unknown>) => {
      const seen: { text: string; values: unknown[] }[] = [];
      const clients = Client.prototype as unknown as { query: (...args: unknown[]) => unknown };
      const original = clients.query;
      clients.query = function (this: unknown, ...args: unknown[]) {
        const query = args[0] as string | { text: string; values?: unknown[] };
        seen.push(
          typeof query === "string"
            ? { text: query, values: (args[1] as unknown[]) ?? [] }
            : { text: query.text, values: query.values ?? [] },
        );
        return original.apply(this, args);
      };
      try {
        await work();
      } finally {
        clients.query = original;
      }
      return seen.filter((statement) => /\bfrom\b/i.test(statement.text));
    };
    const reads = (statements: { text: string }[], table: string) =>
      statements.filter((statement) => statement.text.includes(`from "${table}"`));

    await createRegistryEntry(coordinator, { kind: "species", scientificName: `Probus deletus ${run}`, commonName: `Deleted ${run}` });
    await createRegistryEntry(coordinator, {
      kind: "substrate_recipes",
      code: `DEL${run}`, // not "-${run}": the CSV test below lists those
      name: "Never used",
      base: "Oak sawdust",
      supplement: "",
      supplementPercent: 0,
      targetMoisture: 0.6,
      treatment: "sterilised",
    });
    const registries = await listRegistries(coordinator);
    const speciesEntry = registries.species.find((entry) => entry.commonName === `Deleted ${run}`)!;
    const recipe = registries.substrateRecipes.find((entry) => entry.code === `DEL${run}`)!;

    const forSpecies = await statementsOf(() => moveRegistryEntry(coordinator, "species", speciesEntry.id, "delete"));
    expect(reads(forSpecies, "blocks")).toEqual([]);
    expect(reads(forSpecies, "trial_arms")).toEqual([]);
    const strainReads = reads(forSpecies, "strains");
    expect(strainReads.length).toBeGreaterThan(0);
    expect(strainReads.every((statement) => /"species_id" = \$1/.test(statement.text))).toBe(true);

    const forRecipe = await statementsOf(() => moveRegistryEntry(coordinator, "substrate_recipes", recipe.id, "delete"));
    expect(reads(forRecipe, "trial_arms")).toEqual([]);
    expect(reads(forRecipe, "strains")).toEqual([]);
    const blockReads = reads(forRecipe, "blocks");
    expect(blockReads).toHaveLength(1);
    expect(blockReads[0].text).toMatch(/"substrate_recipe_id" = \$1/);
    expect((await inspector.query("select 1 from substrate_recipes where id = $1", [recipe.id])).rowCount).toBe(0);
    expect((await inspector.query("select 1 from species where id = $1", [speciesEntry.id])).rowCount).toBe(0);
  });

  it("imports a CSV list all at once, or not at all with the line of each problem", async () => {
    const good = `code,name,base,supplement,supplement_percent,target_moisture_percent,treatment\nOAK-${run},Oak and bran,Oak sawdust,Wheat bran,12,61,sterilised\nSTR-${run},Pasteurised straw,Wheat straw,,0,70,pasteurised\n`;
    expect(await importRegistryCsv(coordinator, "substrate_recipes", good)).toBe(2);
    const { rows } = await inspector.query(
      "select code, target_moisture::float as moisture from substrate_recipes where code like $1 order by code",
      [`%-${run}`],
    );
    expect(rows).toEqual([
      { code: `OAK-${run}`, moisture: 0.61 },
      { code: `STR-${run}`, moisture: 0.7 },
    ]);

    const bad = `code,species,name,source\nX1-${run},Pleurotus ostreatus,Fine,culture bank\nX2-${run},No such fungus,Broken,culture bank\n`;
    const refusal = await importRegistryCsv(coordinator, "strains", bad).then(
      () => null,
      (error: { fieldProblems?: { field: string; message: string }[] }) => error,
    );
    expect(refusal?.fieldProblems).toHaveLength(1);
    expect(refusal?.fieldProblems?.[0].field).toBe("file");
    expect(refusal?.fieldProblems?.[0].message).toContain("Line 3");
    expect((await inspector.query("select 1 from strains where code = any($1)", [[`X1-${run}`, `X2-${run}`]])).rowCount).toBe(0);
    await expect(importRegistryCsv(coordinator, "substrate_recipes", good)).rejects.toThrow(/already in the registry/);
  });
});
