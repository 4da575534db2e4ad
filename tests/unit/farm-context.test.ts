import { PgDialect } from "drizzle-orm/pg-core";
import { describe, expect, it } from "vitest";
import { farmContextStatement } from "@/db/client";
import { farmContextOf, farmOf } from "@/lib/data/context";
import type { Member } from "@/lib/data/members";
import { AppError } from "@/lib/errors";

const dialect = new PgDialect();

describe("the statement that sets a request's farm context", () => {
  it("binds the user, farm and role as parameters and never writes them into the SQL", () => {
    const hostile = "x'); drop table blocks; --";
    const query = dialect.sqlToQuery(farmContextStatement({ userId: hostile, farmId: hostile, role: "grower" }));
    expect(query.sql).not.toContain(hostile);
    expect(query.sql).not.toContain("grower");
    expect(query.params).toEqual([hostile, hostile, "grower"]);
    expect(query.sql.match(/\$\d/g)).toEqual(["$1", "$2", "$3"]);
  });

  it("sets each value for the transaction only (is_local = true), so a pooled connection never keeps it", () => {
    const query = dialect.sqlToQuery(farmContextStatement({ userId: null, farmId: null, role: null }));
    expect(query.sql.match(/set_config\('app\.(user_id|farm_id|role)', \$\d, true\)/g)).toHaveLength(3);
    expect(query.params).toEqual(["", "", ""]);
  });
});

const member = (fields: Partial<Member>): Member => ({
  id: "u1",
  email: "u1@example.invalid",
  name: "U One",
  role: "grower",
  farmId: "f1",
  farmName: "Farm One",
  active: true,
  displayUnits: "metric",
  timeZone: null,
  dateStyle: "iso",
  sessionVersion: 1,
  ...fields,
});

describe("farmContextOf: the one place a member's context comes from", () => {
  it("takes the member's id, farm and role as the database has them, and nothing else", () => {
    expect(farmContextOf(member({ id: "u2", farmId: "f2", role: "farm_manager" }))).toEqual({
      userId: "u2",
      farmId: "f2",
      role: "farm_manager",
    });
    expect(farmContextOf(member({ role: "coordinator", farmId: null }))).toEqual({ userId: "u1", farmId: null, role: "coordinator" });
  });
});

describe("farmOf: work only a farm's own people may do", () => {
  it("gives a farm member's context with its user and farm", () => {
    expect(farmOf(member({}), "see its blocks")).toEqual({ userId: "u1", farmId: "f1", role: "grower" });
  });

  it("refuses the coordinator and observers, who have no farm, saying what only farm people can do", () => {
    expect(() => farmOf(member({ farmId: null, role: "coordinator" }), "see its blocks")).toThrow(
      new AppError("forbidden", "Only a farm's own people can see its blocks."),
    );
    expect(() => farmOf(member({ farmId: null, role: "observer" }), "work with its season logs")).toThrow(/work with its season logs/);
  });
});
