import { readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { changeGeneration, keptLoaders, keptUntilChanged, type Caller, type KeptLoader } from "@/db/change-feed";
import { closeDatabase } from "@/db/client";
import { loadMember, type Member } from "@/lib/data/members";
// Imported for the loaders they keep.
import "@/lib/data/pooled-results";
import "@/lib/data/sessions";
import { superuserPool } from "../support/database";

/**
 * Every copy a process keeps (db/change-feed.ts) is asked for by two farms' people and by every
 * role, one after another, so each later caller would be handed an earlier caller's copy if its
 * key missed who is asking. Each answer must equal a fresh load for that caller. The table below
 * must name every loader in the code (a test fails when one is added without a case here).
 */

interface Case {
  /** The caller the loader is given for a member (most take the member; the guard's takes a context). */
  caller: (member: Member) => Caller;
  args: unknown[];
}

let inspector: Pool;
let people: { label: string; member: Member }[];
let cases: Record<string, Case>;

const memberCaller = (member: Member): Caller => member;

function sourceFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const full = path.join(dir, name);
    if (statSync(full).isDirectory()) return name === "node_modules" ? [] : sourceFiles(full);
    return /\.tsx?$/.test(name) && !name.endsWith(".test.ts") ? [full] : [];
  });
}

/** The names of every kept loader the code makes, read from the source. */
function loaderNamesInSource(): string[] {
  const names: string[] = [];
  for (const file of ["app", "lib", "db"].flatMap(sourceFiles)) {
    for (const match of readFileSync(file, "utf8").matchAll(/\bkept(?:UntilChanged|ForEveryone)\(\s*"([^"]+)"/g)) names.push(match[1]);
  }
  return names.sort();
}

beforeAll(async () => {
  inspector = superuserPool();
  const { rows } = await inspector.query<{ label: string; id: string }>(
    `select label, id from (
       select 'farm A manager' as label, u.id, 1 as n from users u join farms f on f.id = u.farm_id where f.name = 'Fernbrook Farm' and u.role = 'farm_manager'
       union all select 'farm A grower', u.id, 2 from users u join farms f on f.id = u.farm_id where f.name = 'Fernbrook Farm' and u.role = 'grower'
       union all select 'farm B manager', u.id, 3 from users u join farms f on f.id = u.farm_id where f.name = 'Hollow Oak Mushrooms' and u.role = 'farm_manager'
       union all select 'coordinator', id, 4 from users where email = 'coordinator@aldervalley.example'
       union all select 'observer', id, 5 from users where email = 'observer@extension.example'
     ) people order by n`,
  );
  people = await Promise.all(rows.map(async (row) => ({ label: row.label, member: (await loadMember(row.id))! })));
  expect(people.map((person) => person.label)).toEqual(["farm A manager", "farm A grower", "farm B manager", "coordinator", "observer"]);
  const oyster = (await inspector.query<{ id: string }>("select id from species where common_name ilike '%oyster%' limit 1")).rows[0].id;
  const query = { speciesId: oyster, flushWindow: "all" };
  cases = {
    "the guard's member": { caller: (member) => ({ userId: member.id, farmId: null, role: null }), args: [] },
    "the guard's ended sessions": { caller: (member) => ({ userId: member.id, farmId: null, role: null }), args: [] },
    "results page": { caller: memberCaller, args: [query] },
    "results JSON": { caller: memberCaller, args: [query] },
    "own blocks": { caller: memberCaller, args: [oyster, "all", {}] },
    "results updating": { caller: memberCaller, args: [] },
  };
  // Copies are kept only while the change feed listens.
  await vi.waitFor(() => expect(changeGeneration("members")).not.toBeNull(), { timeout: 5_000, interval: 50 });
});

afterAll(async () => {
  await inspector.end();
  await closeDatabase();
});

describe("copies kept until the database says they changed", () => {
  it("are all named here, and nothing is named here that the code lacks", () => {
    const inSource = loaderNamesInSource();
    expect(inSource).toEqual([...new Set(inSource)]);
    expect(inSource).toEqual(Object.keys(cases).sort());
    expect(
      keptLoaders()
        .map((loader) => loader.name)
        .sort(),
    ).toEqual(inSource);
  });

  it("give each caller, asked in turn, exactly what a fresh load gives that caller", async () => {
    const crossed: string[] = [];
    for (const loader of keptLoaders()) {
      const { caller, args } = cases[loader.name];
      for (const person of people) {
        if (!loader.perCaller) {
          expect(await (loader.kept as () => Promise<unknown>)(), loader.name).toEqual(await (loader.load as () => Promise<unknown>)());
          continue;
        }
        const kept = await loader.kept(caller(person.member), ...args);
        // Asked twice: the second answer must be the kept one, or this test proves nothing.
        expect(await loader.kept(caller(person.member), ...args), `${loader.name} kept for ${person.label}`).toBe(kept);
        const fresh = await loader.load(caller(person.member), ...args);
        if (JSON.stringify(kept) !== JSON.stringify(fresh)) crossed.push(`${loader.name} as ${person.label}`);
      }
    }
    expect(crossed).toEqual([]);
  });

  it("differ between the two farms where the farms' own data differ, so a crossed copy would show", async () => {
    const ownBlocks = keptLoaders().find((loader) => loader.name === "own blocks") as KeptLoader;
    const { args } = cases["own blocks"];
    const [farmA, , farmB, coordinator] = people;
    const a = JSON.stringify(await ownBlocks.load(farmA.member, ...args));
    const b = JSON.stringify(await ownBlocks.load(farmB.member, ...args));
    expect(a).not.toEqual(b);
    expect(JSON.parse(JSON.stringify(await ownBlocks.load(coordinator.member, ...args)))).toEqual([]);
  });

  it("are keyed by the whole caller, whatever the loader reads of it", async () => {
    let loads = 0;
    const echo = keptUntilChanged(
      "test: echo the farm",
      "members",
      (caller: Caller) => {
        loads++;
        return Promise.resolve(caller.farmId);
      },
      () => "",
    );
    const [farmA, , farmB] = people;
    expect(await echo(farmA.member)).toBe(farmA.member.farmId);
    expect(await echo(farmB.member)).toBe(farmB.member.farmId);
    expect(await echo({ ...farmA.member, role: "grower" })).toBe(farmA.member.farmId);
    expect(await echo(farmA.member)).toBe(farmA.member.farmId);
    expect(loads).toBe(3);
  });
});
