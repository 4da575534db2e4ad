import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase } from "@/db/client";
import { signInPace } from "@/lib/auth/sign-in-pace";
import { checkPassword } from "@/lib/data/sign-in";
import { superuserPool } from "./support/database";

const demoPassword = "alder-valley-demo";
let inspector: Pool;

beforeAll(() => {
  inspector = superuserPool();
});

afterAll(async () => {
  await inspector.end();
  await closeDatabase();
});

describe("checking a password", () => {
  it("lets a demo member in and records the sign-in in the audit log", async () => {
    const outcome = await checkPassword("observer@extension.example", demoPassword, "10.0.0.1");
    expect(outcome).toMatchObject({ status: "ok", name: "Ines Walker" });
    const { rows } = await inspector.query<{ action: string }>(
      "select action from audit_events where subject = $1 order by id desc limit 1",
      ["observer@extension.example"],
    );
    expect(rows[0].action).toBe("sign-in");
  });

  it("answers a wrong password and an unknown e-mail alike", async () => {
    const wrongPassword = await checkPassword("manager@hollowoak.example", "not-it", "10.0.0.2");
    const unknownEmail = await checkPassword("nobody@elsewhere.example", "not-it", "10.0.0.2");
    expect(wrongPassword).toEqual({ status: "refused" });
    expect(unknownEmail).toEqual(wrongPassword);
  });

  it("refuses a deactivated member even with the right password", async () => {
    await inspector.query("update users set active = false where email = 'manager@stonebank.example'");
    try {
      expect(await checkPassword("manager@stonebank.example", demoPassword, "10.0.0.3")).toEqual({ status: "refused" });
    } finally {
      await inspector.query("update users set active = true where email = 'manager@stonebank.example'");
    }
  });

  it(`slows an e-mail from one address after ${signInPace.accountAndAddress.free} failures, even with the right password, and keeps count in the database`, async () => {
    // A member of its own, so the demo sign-ins the browser tests use stay open.
    const email = "rate-limit-probe@aldervalley.example";
    await inspector.query(
      `insert into users (email, name, role, password_hash)
       select $1, 'Rate-limit probe', 'observer', password_hash from users where email = 'observer@extension.example'`,
      [email],
    );
    for (let attempt = 0; attempt < signInPace.accountAndAddress.free; attempt++) {
      expect(await checkPassword(email, `guess-${attempt}`, "10.1.0.1")).toEqual({ status: "refused" });
    }
    expect(await checkPassword(email, demoPassword, "10.1.0.1")).toMatchObject({ status: "rate_limited" });
    const { rows } = await inspector.query<{ failures: number }>(
      "select count(*)::int as failures from sign_in_attempts where email = $1 and not succeeded",
      [email],
    );
    expect(rows[0].failures).toBe(signInPace.accountAndAddress.free);
  });

  it(`slows a network address after ${signInPace.address.free} failures across e-mails`, async () => {
    const address = "10.2.0.1";
    for (let attempt = 0; attempt < signInPace.address.free; attempt++) {
      await checkPassword(`someone-${attempt}@elsewhere.example`, "guess", address);
    }
    expect(await checkPassword("manager@wrenfield.example", demoPassword, address)).toMatchObject({ status: "rate_limited" });
    expect(await checkPassword("manager@wrenfield.example", demoPassword, "10.2.0.2")).toMatchObject({ status: "ok" });
  });
});
