import { afterEach, describe, expect, it, vi } from "vitest";
import { checkEnv, env } from "./env";

afterEach(() => vi.unstubAllEnvs());

const complete = {
  DATABASE_URL: "postgres://rhizo_app:x@127.0.0.1:5432/rhizomorph",
  ANALYST_DATABASE_URL: "postgres://rhizo_analyst:x@127.0.0.1:5432/rhizomorph",
  JOBS_DATABASE_URL: "postgres://rhizo_jobs:x@127.0.0.1:5432/rhizomorph",
  AUTH_SECRET: "a".repeat(44),
};

function stub(values: Record<string, string>): void {
  for (const [name, value] of Object.entries(values)) vi.stubEnv(name, value);
}

describe("the app's settings", () => {
  it("start with every database address and a secret; the rest have npm start's values", () => {
    stub(complete);
    vi.stubEnv("APP_URL", "");
    vi.stubEnv("SMTP_PORT", "");
    expect(checkEnv()).toMatchObject({ APP_URL: "http://127.0.0.1:3000", SMTP_PORT: 2525, RHIZO_TRUSTED_PROXIES: 0 });
  });

  it("name every setting that is missing or wrong, and what to set", () => {
    stub({ ...complete, DATABASE_URL: "", AUTH_SECRET: "short", SMTP_PORT: "mail" });
    expect(() => checkEnv()).toThrow(/DATABASE_URL is not set[\s\S]*AUTH_SECRET is too short[\s\S]*SMTP_PORT must be a port number/);
  });

  it("never sign unsubscribe links with an empty secret", () => {
    vi.stubEnv("AUTH_SECRET", "");
    expect(() => env("AUTH_SECRET")).toThrow(/AUTH_SECRET is not set/);
  });

  it("read the number of trusted proxies, none by default", () => {
    vi.stubEnv("RHIZO_TRUSTED_PROXIES", "");
    expect(env("RHIZO_TRUSTED_PROXIES")).toBe(0);
    vi.stubEnv("RHIZO_TRUSTED_PROXIES", "2");
    expect(env("RHIZO_TRUSTED_PROXIES")).toBe(2);
    for (const wrong of ["yes", "-1", "1.5", "11"]) {
      vi.stubEnv("RHIZO_TRUSTED_PROXIES", wrong);
      expect(() => env("RHIZO_TRUSTED_PROXIES"), wrong).toThrow(/whole number from 0 to 10/);
    }
  });

  it("keep the app's address without a trailing slash, and refuse one that is not a web address", () => {
    vi.stubEnv("APP_URL", "https://coop.example/");
    expect(env("APP_URL")).toBe("https://coop.example");
    vi.stubEnv("APP_URL", "coop.example");
    expect(() => env("APP_URL")).toThrow(/APP_URL must be the app's public address/);
  });
});
