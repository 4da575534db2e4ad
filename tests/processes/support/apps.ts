import { spawn, type ChildProcess } from "node:child_process";
import { createServer } from "node:net";
import { Pool } from "pg";

/**
 * Real app processes for the tests that need more than one, or need one killed: each is
 * `next start` of the build the test script made (NEXT_DIST_DIR), on a free loopback port, with
 * its own job workers, on a database of the test's own (a copy of the freshly seeded test
 * database, so killing and restarting disturbs nothing else).
 */

export interface Database {
  name: string;
  env: Record<string, string>;
  superuser: Pool;
  drop(): Promise<void>;
}

function withDatabase(url: string, name: string): string {
  const parsed = new URL(url);
  parsed.pathname = `/${name}`;
  return parsed.toString();
}

function requireEnv(name: string): string {
  const value = process.env[name];
  if (!value) throw new Error(`${name} is not set: run these tests through npm test`);
  return value;
}

/** A copy of the seeded test database (PostgreSQL's CREATE DATABASE … TEMPLATE), for one test file. */
export async function copyOfTestDatabase(label: string): Promise<Database> {
  const source = requireEnv("RHIZO_DATABASE");
  const name = `${source}_${label}`;
  const admin = new Pool({ connectionString: withDatabase(requireEnv("SUPERUSER_DATABASE_URL"), "postgres"), max: 1 });
  try {
    await admin.query(`drop database if exists "${name}" with (force)`);
    await admin.query(`create database "${name}" template "${source}" owner rhizo_owner`);
  } finally {
    await admin.end();
  }
  const env = {
    RHIZO_DATABASE: name,
    DATABASE_URL: withDatabase(requireEnv("DATABASE_URL"), name),
    ANALYST_DATABASE_URL: withDatabase(requireEnv("ANALYST_DATABASE_URL"), name),
    JOBS_DATABASE_URL: withDatabase(requireEnv("JOBS_DATABASE_URL"), name),
    OWNER_DATABASE_URL: withDatabase(requireEnv("OWNER_DATABASE_URL"), name),
  };
  const superuser = new Pool({ connectionString: withDatabase(requireEnv("SUPERUSER_DATABASE_URL"), name), max: 3 });
  // Killing an app ends its connections; so may the drop below.
  superuser.on("error", () => undefined);
  return {
    name,
    env,
    superuser,
    async drop() {
      await superuser.end();
      const cleanup = new Pool({ connectionString: withDatabase(requireEnv("SUPERUSER_DATABASE_URL"), "postgres"), max: 1 });
      try {
        await cleanup.query(`drop database if exists "${name}" with (force)`);
      } finally {
        await cleanup.end();
      }
    },
  };
}

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const address = server.address();
      server.close(() => (typeof address === "object" && address ? resolve(address.port) : reject(new Error("no port"))));
    });
  });
}

export interface App {
  url: string;
  /** Everything the process printed, for a failing test's message. */
  output(): string;
  /** SIGKILL to the process and its children: no shutdown of any kind, as when the machine dies. */
  kill(): Promise<void>;
  /** An ordinary stop (SIGTERM). */
  stop(): Promise<void>;
}

function ended(child: ChildProcess): Promise<void> {
  return child.exitCode !== null || child.signalCode !== null
    ? Promise.resolve()
    : new Promise((resolve) => child.once("exit", () => resolve()));
}

/** Starts `next start` on the database and waits until it answers. */
export async function startApp(database: Database, extraEnv: Record<string, string> = {}): Promise<App> {
  const port = await freePort();
  const url = `http://127.0.0.1:${port}`;
  let printed = "";
  const child = spawn("node_modules/.bin/next", ["start", "--hostname", "127.0.0.1", "--port", String(port)], {
    env: { ...process.env, ...database.env, APP_URL: url, APP_PORT: String(port), RHIZO_JOB_POLL_SECONDS: "0.5", ...extraEnv },
    // A process group of its own, so a kill reaches every process next start runs.
    detached: true,
    stdio: ["ignore", "pipe", "pipe"],
  });
  child.stdout?.on("data", (chunk: Buffer) => (printed += chunk.toString()));
  child.stderr?.on("data", (chunk: Buffer) => (printed += chunk.toString()));
  const signal = async (name: NodeJS.Signals) => {
    if (child.exitCode !== null || child.signalCode !== null) return;
    process.kill(-child.pid!, name);
    await ended(child);
  };
  const app: App = { url, output: () => printed, kill: () => signal("SIGKILL"), stop: () => signal("SIGTERM") };
  for (let attempt = 0; ; attempt += 1) {
    if (child.exitCode !== null) throw new Error(`next start exited:\n${printed}`);
    try {
      if ((await fetch(`${url}/icon.svg`)).ok) return app;
    } catch {
      // not listening yet
    }
    if (attempt > 600) {
      await app.kill();
      throw new Error(`next start did not answer on ${url}:\n${printed}`);
    }
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

/** A signed-in member's session cookie, got the way the sign-in form gets it (Auth.js's credentials callback). */
export async function signIn(app: App, email: string, password = "alder-valley-demo"): Promise<string> {
  const csrf = await fetch(`${app.url}/api/auth/csrf`);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const jar = cookiesOf(csrf);
  const answer = await fetch(`${app.url}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie: jar, origin: app.url },
    body: new URLSearchParams({ csrfToken, email, password, callbackUrl: `${app.url}/` }),
  });
  const session = cookiesOf(answer)
    .split("; ")
    .find((cookie) => /session-token=/.test(cookie));
  if (!session) throw new Error(`signing in ${email} gave no session (status ${answer.status})`);
  return session;
}

/** Signs the session out through the app it is sent to, as the Sign out button does. */
export async function signOut(session: string, app: App): Promise<void> {
  const csrf = await fetch(`${app.url}/api/auth/csrf`, { headers: { cookie: session } });
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const answer = await fetch(`${app.url}/api/auth/signout`, {
    method: "POST",
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie: `${session}; ${cookiesOf(csrf)}`, origin: app.url },
    body: new URLSearchParams({ csrfToken, callbackUrl: `${app.url}/sign-in` }),
  });
  if (answer.status !== 302) throw new Error(`signing out gave status ${answer.status}`);
}

function cookiesOf(response: Response): string {
  return response.headers
    .getSetCookie()
    .map((cookie) => cookie.split(";")[0])
    .join("; ");
}

/** A request as the signed-in member (the session cookie works on every process: they share the secret). */
export async function as(session: string, app: App, path: string, init: RequestInit = {}): Promise<Response> {
  return fetch(`${app.url}${path}`, {
    ...init,
    redirect: "manual",
    headers: { ...(init.headers as Record<string, string> | undefined), cookie: session, origin: app.url },
  });
}

/** A season log of new blocks of strain PO-01 (oyster) with one flush each, as a farm's spreadsheet would give it. */
export function seasonLog(prefix: string, blocks: number): string {
  const header =
    "block_id,strain,substrate,inoculated_on,block_wet_weight,substrate_moisture,fruiting_method,flush,harvested_on,fresh_weight";
  const rows = Array.from(
    { length: blocks },
    (_, index) => `${prefix}-${index + 1},PO-01,HWB-20,2026-03-01,2500 g,62 %,SLIT-ACROSS,1,2026-04-10,${500 + index} g`,
  );
  return `${[header, ...rows].join("\r\n")}\r\n`;
}

/** Uploads and commits a season log through the app's own routes; returns once the commit has answered. */
export async function commitSeasonLog(session: string, app: App, text: string): Promise<void> {
  const uploaded = await as(session, app, "/api/season-logs", {
    method: "POST",
    headers: { "content-type": "text/csv", "x-file-name": "season.csv" },
    body: text,
  });
  if (uploaded.status !== 201) throw new Error(`upload answered ${uploaded.status}: ${await uploaded.text()}`);
  const view = (await uploaded.json()) as { upload: { id: string }; canCommit: boolean };
  if (!view.canCommit) throw new Error("the season log cannot be committed");
  const committed = await as(session, app, `/api/season-logs/${view.upload.id}/commit`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: "{}",
  });
  if (committed.status !== 200) throw new Error(`commit answered ${committed.status}: ${await committed.text()}`);
}
