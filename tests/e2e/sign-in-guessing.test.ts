import type { Pool } from "pg";
import type { BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { signInPace } from "@/lib/auth/sign-in-pace";
import { superuserPool } from "../integration/support/database";
import { openBrowser, screenshot } from "./support/browser";
import { SignInPage } from "./support/pages";

/**
 * A guesser sends every wrong password with a made-up X-Forwarded-For, hoping each looks like a
 * new address. Before, the per-address limit believed the header. With no trusted proxy
 * configured (the default), the server must count them all against the real connection.
 */

const email = "forged-address-target@aldervalley.example";
let inspector: Pool;
let browser: BrowserContext;

beforeAll(async () => {
  inspector = superuserPool();
  await inspector.query(
    `insert into users (email, name, role, password_hash)
     select $1, 'Forged address target', 'observer', password_hash from users where email = 'observer@extension.example'`,
    [email],
  );
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
  await inspector.query("delete from users where email = $1", [email]);
  await inspector.end();
});

describe("a guesser forging X-Forwarded-For", () => {
  it("is counted at the connection's real address and slowed after the free tries", async () => {
    const page = browser.pages()[0] ?? (await browser.newPage());
    const signIn = new SignInPage(page);
    const forged: string[] = [];
    let message = "";
    for (let guess = 0; guess <= signInPace.accountAndAddress.free; guess++) {
      const address = `203.0.113.${10 + guess}`;
      forged.push(address);
      await browser.setExtraHTTPHeaders({ "x-forwarded-for": address, "x-real-ip": address });
      await signIn.signIn(email, `guess-number-${guess}`);
      message = await signIn.errorMessage();
      if (guess < signInPace.accountAndAddress.free) expect(message).toContain("do not match");
    }
    expect(message).toContain("Too many tries for this account from your network");
    await screenshot(page, "sign-in-slowed");

    const { rows } = await inspector.query<{ ip: string }>(
      "select distinct ip from sign_in_attempts where email = $1 union select distinct ip from audit_events where subject = $1",
      [email],
    );
    const seen = rows.map((row) => row.ip);
    expect(seen.filter((ip) => forged.includes(ip))).toEqual([]);
    expect(seen).toEqual(["127.0.0.1"]);
  });
});
