import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { closeDatabase } from "@/db/client";
import { signInPace } from "@/lib/auth/sign-in-pace";
import { changePassword, loadMember, redeemAccessToken } from "@/lib/data/members";
import { checkPassword } from "@/lib/data/sign-in";
import { newAccessToken } from "@/lib/members/tokens";
import { superuserPool } from "../support/database";

/**
 * A guesser who knows a member's e-mail. Before, five wrong passwords locked the real owner out
 * for fifteen minutes from anywhere, and bcrypt ran inside a database transaction, so a burst of
 * wrong passwords held every pooled connection "idle in transaction" and stalled every page.
 */

// Every bcrypt job notes how many app connections sit inside a transaction at that moment.
const transactionsOpenDuringBcrypt = vi.hoisted(() => ({ seen: [] as number[], probe: null as null | (() => Promise<number>) }));
vi.mock("@/lib/auth/password", async (importOriginal) => {
  const actual = await importOriginal<typeof import("@/lib/auth/password")>();
  const noted = async () => {
    if (transactionsOpenDuringBcrypt.probe) transactionsOpenDuringBcrypt.seen.push(await transactionsOpenDuringBcrypt.probe());
  };
  return {
    ...actual,
    verifyPassword: async (password: string, hash: string) => {
      await noted();
      return actual.verifyPassword(password, hash);
    },
    hashPassword: async (password: string) => {
      await noted();
      return actual.hashPassword(password);
    },
  };
});

const demoPassword = "alder-valley-demo";
let inspector: Pool;
let ownerEmail: string;
let ownerId: string;

beforeAll(async () => {
  inspector = superuserPool();
  ownerEmail = "guessing-target@aldervalley.example";
  const { rows } = await inspector.query<{ id: string }>(
    `insert into users (email, name, role, password_hash)
     select $1, 'Guessing target', 'observer', password_hash from users where email = 'observer@extension.example' returning id`,
    [ownerEmail],
  );
  ownerId = rows[0].id;
  transactionsOpenDuringBcrypt.probe = async () => {
    const { rows: open } = await inspector.query<{ open: number }>(
      `select count(*)::int as open from pg_stat_activity
       where datname = current_database() and usename = 'rhizo_app' and state like 'idle in transaction%'`,
    );
    return open[0].open;
  };
});

afterAll(async () => {
  transactionsOpenDuringBcrypt.probe = null;
  await inspector.query("delete from users where id = $1", [ownerId]);
  await inspector.end();
  await closeDatabase();
});

describe("guessing a member's password", () => {
  it("slows the guesser's address, never the owner signing in from their own", async () => {
    const guesser = "198.51.100.23";
    for (let guess = 0; guess < signInPace.accountAndAddress.free + 1; guess++) await checkPassword(ownerEmail, `guess-${guess}`, guesser);
    const fromGuesser = await checkPassword(ownerEmail, demoPassword, guesser);
    expect(fromGuesser).toMatchObject({ status: "rate_limited" });
    expect((fromGuesser as { retryAfterSeconds: number }).retryAfterSeconds).toBeGreaterThan(0);
    expect(await checkPassword(ownerEmail, demoPassword, "203.0.113.80")).toMatchObject({ status: "ok" });
  });

  it("paces guesses sent all at once like guesses sent one after another", async () => {
    const guesser = "198.51.100.24";
    const outcomes = await Promise.all(Array.from({ length: 12 }, (_, guess) => checkPassword(ownerEmail, `burst-${guess}`, guesser)));
    const checked = outcomes.filter((outcome) => outcome.status === "refused").length;
    // Tries are admitted one at a time and count as failures while in flight: after the free
    // ones, the next must wait two seconds, which a burst admitted within milliseconds never does.
    expect(checked).toBe(signInPace.accountAndAddress.free);
    expect(outcomes.filter((outcome) => outcome.status === "rate_limited")).toHaveLength(12 - checked);
  });

  it("makes the wait grow with every further failure and forgives after a success", async () => {
    const address = "198.51.100.25";
    const waitAfter = async (failures: number) => {
      await inspector.query("delete from sign_in_attempts where ip = $1", [address]);
      await inspector.query(
        "insert into sign_in_attempts (email, ip, succeeded, attempted_at) select $1, $2, false, now() from generate_series(1, $3)",
        [ownerEmail, address, failures],
      );
      const outcome = await checkPassword(ownerEmail, demoPassword, address);
      return outcome.status === "rate_limited" ? outcome.retryAfterSeconds : 0;
    };
    const free = signInPace.accountAndAddress.free;
    const waits = [await waitAfter(free), await waitAfter(free + 2), await waitAfter(free + 5)];
    expect(waits[0]).toBeGreaterThan(0);
    expect(waits[1]).toBeGreaterThan(waits[0]);
    expect(waits[2]).toBeGreaterThan(waits[1]);
    expect(waits[2]).toBeLessThanOrEqual(signInPace.accountAndAddress.ceilingSeconds);

    await inspector.query("delete from sign_in_attempts where ip = $1", [address]);
    await inspector.query(
      "insert into sign_in_attempts (email, ip, succeeded, attempted_at) select $1, $2, false, now() - interval '1 hour' from generate_series(1, $3)",
      [ownerEmail, address, free - 1],
    );
    await inspector.query(
      "insert into sign_in_attempts (email, ip, succeeded, attempted_at) values ($1, $2, true, now() - interval '30 minutes')",
      [ownerEmail, address],
    );
    await inspector.query(
      "insert into sign_in_attempts (email, ip, succeeded, attempted_at) select $1, $2, false, now() from generate_series(1, $3)",
      [ownerEmail, address, free - 1],
    );
    expect(await checkPassword(ownerEmail, demoPassword, address)).toMatchObject({ status: "ok" });
  });
});

describe("the password work", () => {
  it("runs with no app connection inside a transaction: sign-in, password change and reset", async () => {
    transactionsOpenDuringBcrypt.seen.length = 0;
    // One at a time: whatever transaction is open while bcrypt runs is then the caller's own.
    await checkPassword(ownerEmail, "wrong-one", "192.0.2.10");
    await checkPassword("nobody@elsewhere.example", "wrong-two", "192.0.2.11");
    await checkPassword(ownerEmail, demoPassword, "192.0.2.12");
    const owner = (await loadMember(ownerId))!;
    await changePassword(owner, demoPassword, "changed-outside-a-transaction");
    const { token, tokenHash } = newAccessToken();
    await inspector.query(
      `insert into access_tokens (purpose, token_hash, email, user_id, role, expires_at)
       values ('password_reset', $1, $2, $3, 'observer', now() + interval '1 hour')`,
      [tokenHash, ownerEmail, ownerId],
    );
    expect(await redeemAccessToken(token, "password_reset", { name: "", password: "reset-outside-a-transaction" })).toMatchObject({
      status: "reset",
    });
    // Three sign-ins, a change (verify + hash) and a reset (hash); a decoy hash may be made once.
    expect(transactionsOpenDuringBcrypt.seen.length).toBeGreaterThanOrEqual(6);
    expect(transactionsOpenDuringBcrypt.seen.filter((open) => open > 0)).toEqual([]);
  });
});
