import { createHash } from "node:crypto";
import { describe, expect, it } from "vitest";
import { accessLink, hashToken, isWellFormedToken, newAccessToken, tokenExpiresAt, tokenLifetimeMinutes } from "./tokens";

describe("one-time link tokens", () => {
  it("stores the SHA-256 of the token, never the token", () => {
    const { token, tokenHash } = newAccessToken();
    // FIPS 180-4 test vector: SHA-256("abc").
    expect(hashToken("abc")).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    expect(tokenHash).toBe(createHash("sha256").update(token).digest("hex"));
    expect(tokenHash).not.toContain(token);
  });

  it("makes a different well-formed token every time", () => {
    const tokens = new Set(Array.from({ length: 200 }, () => newAccessToken().token));
    expect(tokens.size).toBe(200);
    for (const token of tokens) expect(isWellFormedToken(token)).toBe(true);
    expect(isWellFormedToken("short")).toBe(false);
    expect(isWellFormedToken(`${"a".repeat(42)}!`)).toBe(false);
  });

  it("lets an invitation live a week and a reset an hour", () => {
    const now = new Date("2026-05-01T08:00:00Z");
    expect(tokenExpiresAt("invitation", now).toISOString()).toBe("2026-05-08T08:00:00.000Z");
    expect(tokenExpiresAt("password_reset", now).toISOString()).toBe("2026-05-01T09:00:00.000Z");
    expect(tokenLifetimeMinutes.password_reset).toBeLessThan(tokenLifetimeMinutes.invitation);
  });

  it("builds the link to the right public page", () => {
    expect(accessLink("http://127.0.0.1:3000/", "invitation", "abc_-1")).toBe("http://127.0.0.1:3000/accept-invitation?token=abc_-1");
    expect(accessLink("https://coop.example", "password_reset", "x")).toBe("https://coop.example/reset-password?token=x");
  });
});
