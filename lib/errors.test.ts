import { describe, expect, it } from "vitest";
import { databaseRefusalOf } from "./errors";

describe("databaseRefusalOf", () => {
  it("reads the code and constraint from drizzle's wrapper and from pg's own error", () => {
    const pgError = Object.assign(new Error("duplicate key value violates unique constraint"), {
      code: "23505",
      constraint: "strains_code",
    });
    expect(databaseRefusalOf(new Error("Failed query", { cause: pgError }))).toEqual({ code: "23505", constraint: "strains_code" });
    expect(databaseRefusalOf(pgError)).toEqual({ code: "23505", constraint: "strains_code" });
  });

  it("finds nothing in what is not a database refusal", () => {
    for (const thrown of [null, undefined, "23505", 23505, new Error("network down"), { code: 23505 }]) {
      expect(databaseRefusalOf(thrown).code).toBeUndefined();
    }
  });
});
