import bcrypt from "bcryptjs";
import { describe, expect, it } from "vitest";
import { hashPassword, passwordHashCost, unknownUserHash, verifyPassword } from "./password";

describe("password hashing", () => {
  it("uses bcrypt at cost 10 or more and never stores the password itself", async () => {
    const hash = await hashPassword("spawn-run-at-24C");
    expect(passwordHashCost).toBeGreaterThanOrEqual(10);
    expect(bcrypt.getRounds(hash)).toBe(passwordHashCost);
    expect(hash).not.toContain("spawn-run");
    expect(hash).toMatch(/^\$2[aby]\$/);
  });

  it("accepts the right password and refuses a wrong one", async () => {
    const hash = await hashPassword("spawn-run-at-24C");
    expect(await verifyPassword("spawn-run-at-24C", hash)).toBe(true);
    expect(await verifyPassword("spawn-run-at-25C", hash)).toBe(false);
  });

  it("salts every hash, so two members with one password get different hashes", async () => {
    expect(await hashPassword("same-password-1")).not.toBe(await hashPassword("same-password-1"));
  });

  it("keeps a decoy hash of the same cost for unknown e-mails", async () => {
    expect(bcrypt.getRounds(await unknownUserHash())).toBe(passwordHashCost);
  });
});
