import { spawn, type ChildProcessWithoutNullStreams } from "node:child_process";
import { randomUUID } from "node:crypto";
import { createInterface, type Interface } from "node:readline";
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { changeGeneration } from "@/db/change-feed";
import { closeDatabase } from "@/db/client";
import { hashPassword } from "@/lib/auth/password";
import type { SessionClaims } from "@/lib/auth/sessions";
import {
  changePassword,
  changeRole,
  deactivatePerson,
  loadMember,
  redeemAccessToken,
  setFarmStatus,
  type Member,
} from "@/lib/data/members";
import { endEverySession, endSession, memberForSession } from "@/lib/data/sessions";
import { checkPassword } from "@/lib/data/sign-in";
import { hashToken, newAccessToken } from "@/lib/members/tokens";
import { superuserPool } from "../support/database";

/**
 * A session cookie that someone copied (a shared computer, a stolen laptop, a coordinator
 * looking over a shoulder) must stop working the moment its owner signs out, changes or resets
 * the password, or loses access, in this process and in any other app process on the database.
 * Before this, the cookie kept working for up to eight hours after all of these.
 */

const demoPassword = "alder-valley-demo";
const patiently = { timeout: 5_000, interval: 50 };
let inspector: Pool;
let coordinator: Member;
let fernbrookId: string;
const made: string[] = [];
const madeFarms: string[] = [];

/** A member of their own (the demo sign-ins other tests use stay untouched), signed-in password the demo's. */
async function person(role: "observer" | "grower" | "farm_manager", farmId: string | null = null): Promise<Member> {
  const email = `session-${randomUUID().slice(0, 8)}@aldervalley.example`;
  const { rows } = await inspector.query<{ id: string }>(
    `insert into users (email, name, role, farm_id, password_hash)
     select $1, 'Session probe', $2, $3, password_hash from users where email = 'observer@extension.example' returning id`,
    [email, role, farmId],
  );
  made.push(rows[0].id);
  return (await loadMember(rows[0].id))!;
}

/** Signs in as the sign-in form does and returns what the new session cookie would carry. */
async function signIn(member: Member, password = demoPassword): Promise<SessionClaims> {
  const outcome = await checkPassword(member.email, password, `10.8.${made.length}.1`);
  if (outcome.status !== "ok") throw new Error(`sign-in refused: ${outcome.status}`);
  return { memberId: outcome.userId, sessionId: randomUUID(), sessionVersion: outcome.sessionVersion, signedInAt: Date.now() };
}

const works = async (claims: SessionClaims) => (await memberForSession(claims)) !== null;

beforeAll(async () => {
  inspector = superuserPool();
  const { rows } = await inspector.query<{ id: string }>("select id from users where email = 'coordinator@aldervalley.example'");
  coordinator = (await loadMember(rows[0].id))!;
  fernbrookId = (await inspector.query<{ id: string }>("select id from farms where name = 'Fernbrook Farm'")).rows[0].id;
  await vi.waitFor(() => expect(changeGeneration("members")).not.toBeNull(), patiently);
});

afterAll(async () => {
  await inspector.query("delete from users where id = any($1)", [made]);
  await inspector.query("delete from farms where id = any($1)", [madeFarms]);
  await inspector.end();
  await closeDatabase();
});

describe("a copied session cookie", () => {
  it("stops working when its session signs out, while the member's other sessions go on", async () => {
    const member = await person("observer");
    const copied = await signIn(member);
    const laptop = await signIn(member);
    expect(await works(copied)).toBe(true);
    await endSession(copied, new Date(Date.now() + 8 * 3600_000));
    expect(await works(copied)).toBe(false);
    expect(await works(laptop)).toBe(true);
  });

  it("stops working, with every other session, after 'sign out everywhere'", async () => {
    const member = await person("observer");
    const sessions = [await signIn(member), await signIn(member)];
    await endEverySession(member);
    for (const session of sessions) expect(await works(session)).toBe(false);
    expect(await works(await signIn(member))).toBe(true);
  });

  it("stops working after the member changes the password", async () => {
    const member = await person("observer");
    const copied = await signIn(member);
    await changePassword(member, demoPassword, "a-new-password-for-sessions");
    expect(await works(copied)).toBe(false);
    expect(await works(await signIn(member, "a-new-password-for-sessions"))).toBe(true);
  });

  it("stops working after a password reset by link", async () => {
    const member = await person("observer");
    const copied = await signIn(member);
    const { token, tokenHash } = newAccessToken();
    await inspector.query(
      `insert into access_tokens (purpose, token_hash, email, user_id, role, expires_at)
       values ('password_reset', $1, $2, $3, 'observer', now() + interval '1 hour')`,
      [tokenHash, member.email, member.id],
    );
    expect(hashToken(token)).toBe(tokenHash);
    expect(await redeemAccessToken(token, "password_reset", { name: "", password: "reset-by-link-password" })).toMatchObject({
      status: "reset",
    });
    expect(await works(copied)).toBe(false);
  });

  it("stops working when the coordinator deactivates the member, and stays ended if they are let back in", async () => {
    const grower = await person("grower", fernbrookId);
    const copied = await signIn(grower);
    await deactivatePerson(coordinator, grower.id);
    expect(await works(copied)).toBe(false);
    await inspector.query("update users set active = true where id = $1", [grower.id]);
    await vi.waitFor(async () => expect((await loadMember(grower.id))?.active).toBe(true), patiently);
    expect(await works(copied)).toBe(false);
  });

  it("stops working when the member's role changes", async () => {
    const grower = await person("grower", fernbrookId);
    const copied = await signIn(grower);
    await changeRole(coordinator, grower.id, "farm_manager");
    expect(await works(copied)).toBe(false);
    expect((await memberForSession(await signIn(grower)))?.role).toBe("farm_manager");
  });

  it("stops working when the member's farm is suspended", async () => {
    const { rows } = await inspector.query<{ id: string }>("insert into farms (name) values ($1) returning id", [
      `Session farm ${randomUUID().slice(0, 6)}`,
    ]);
    madeFarms.push(rows[0].id);
    const manager = await person("farm_manager", rows[0].id);
    const copied = await signIn(manager);
    await setFarmStatus(coordinator, rows[0].id, "suspended");
    await setFarmStatus(coordinator, rows[0].id, "active");
    expect(await works(copied)).toBe(false);
  });

  it("stops working when the member is moved to another farm, whoever moves them (here psql)", async () => {
    const { rows } = await inspector.query<{ id: string }>("insert into farms (name) values ($1) returning id", [
      `Moved-to farm ${randomUUID().slice(0, 6)}`,
    ]);
    madeFarms.push(rows[0].id);
    const grower = await person("grower", fernbrookId);
    const copied = await signIn(grower);
    expect(await works(copied)).toBe(true);
    // The cookie names no farm; a session kept after a move would act for the new farm with the old sign-in.
    await inspector.query("update users set farm_id = $2 where id = $1", [grower.id, rows[0].id]);
    await vi.waitFor(async () => expect(await works(copied)).toBe(false), patiently);
    expect((await memberForSession(await signIn(grower)))?.farmId).toBe(rows[0].id);
  });

  it("stops working when someone changes the password outside the app (psql), once PostgreSQL tells the process", async () => {
    const member = await person("observer");
    const copied = await signIn(member);
    expect(await works(copied)).toBe(true);
    // An administrator sets a new password straight in the table: the trigger ends the sessions.
    await inspector.query("update users set password_hash = $2 where id = $1", [member.id, await hashPassword("set-by-an-administrator")]);
    await vi.waitFor(async () => expect(await works(copied)).toBe(false), patiently);
  });

  it("cannot be revived by writing an older session version back", async () => {
    const member = await person("observer");
    const copied = await signIn(member);
    await endEverySession(member);
    await inspector.query("update users set session_version = $2 where id = $1", [member.id, copied.sessionVersion]);
    const { rows } = await inspector.query<{ session_version: number }>("select session_version from users where id = $1", [member.id]);
    expect(rows[0].session_version).toBe(copied.sessionVersion + 1);
  });

  it("does not outlive the working day, even if its cookie was re-issued", async () => {
    const member = await person("observer");
    const session = await signIn(member);
    expect(await memberForSession(session, session.signedInAt + 7.9 * 3600_000)).not.toBeNull();
    expect(await memberForSession(session, session.signedInAt + 8 * 3600_000)).toBeNull();
  });
});

/** Another app process on the same database, with its own pools, change feed and kept copies. */
class OtherProcess {
  private readonly child: ChildProcessWithoutNullStreams;
  private readonly lines: Interface;
  private readonly waiting: ((line: string) => void)[] = [];

  constructor() {
    this.child = spawn("npx", ["tsx", "--conditions=react-server", "tests/integration/support/session-probe.ts"], {
      env: process.env,
      stdio: ["pipe", "pipe", "pipe"],
    });
    this.child.stderr.on("data", (chunk: Buffer) => process.stderr.write(chunk));
    this.lines = createInterface({ input: this.child.stdout });
    this.lines.on("line", (line) => this.waiting.shift()?.(line));
  }

  private next(): Promise<string> {
    return new Promise((resolve) => this.waiting.push(resolve));
  }

  ready(): Promise<string> {
    return this.next();
  }

  ask(claims: SessionClaims): Promise<string> {
    const answer = this.next();
    this.child.stdin.write(`${JSON.stringify(claims)}\n`);
    return answer;
  }

  stop(): void {
    this.child.stdin.end();
    this.child.kill();
  }
}

describe("in another app process on the same database", () => {
  let other: OtherProcess;

  beforeAll(async () => {
    other = new OtherProcess();
    expect(await other.ready()).toBe("ready");
  });

  afterAll(() => other?.stop());

  it("a session signed out here ends there too, though that process kept its copy of the member", async () => {
    const member = await person("observer");
    const copied = await signIn(member);
    expect(await other.ask(copied)).toBe("current");
    expect(await other.ask(copied)).toBe("current");
    await endSession(copied, new Date(Date.now() + 8 * 3600_000));
    await vi.waitFor(async () => expect(await other.ask(copied)).toBe("ended"), patiently);
  });

  it("'sign out everywhere' here ends every session there", async () => {
    const member = await person("observer");
    const sessions = [await signIn(member), await signIn(member)];
    for (const session of sessions) expect(await other.ask(session)).toBe("current");
    await endEverySession(member);
    for (const session of sessions) await vi.waitFor(async () => expect(await other.ask(session)).toBe("ended"), patiently);
  });
});
