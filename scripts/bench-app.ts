// Shared by the benchmarks that load the built app over HTTP: serve it on the bench database,
// sign in through the real sign-in page, and load a URL with autocannon, keeping every response
// time (autocannon itself reports p90 and p97.5, not p95).
import { spawn, spawnSync } from "node:child_process";
import { mkdtempSync } from "node:fs";
import { createRequire } from "node:module";
import { tmpdir } from "node:os";
import path from "node:path";
import { chromium } from "playwright-core";

export interface LoadResult {
  requests: { average: number; total: number };
  latency: { p50: number; p90: number; p97_5: number; p99: number };
  non2xx: number;
  errors: number;
  timeouts: number;
  statusCodeStats: Record<string, { count: number }>;
}
interface LoadTracker {
  on(event: "response", listener: (client: unknown, statusCode: number, bytes: number, milliseconds: number) => void): void;
}
export interface LoadOptions {
  url: string;
  connections: number;
  duration: number;
  headers?: Record<string, string>;
  method?: "GET" | "POST";
  body?: string;
  /** Changes each request before it is sent (autocannon's setupRequest). */
  setupRequest?: (request: { method: string; path: string; headers: Record<string, string>; body?: string }) => {
    method: string;
    path: string;
    headers: Record<string, string>;
    body?: string;
  };
}
// autocannon ships no types; this is the part of its API used here.
const autocannon = createRequire(import.meta.url)("autocannon") as (
  options: {
    url: string;
    connections: number;
    duration: number;
    headers?: Record<string, string>;
    method?: string;
    body?: string;
    requests?: { method: string; path: string; setupRequest: LoadOptions["setupRequest"] }[];
  },
  done: (error: Error | null, result: LoadResult) => void,
) => LoadTracker;

/** p95 of the times given, in milliseconds. */
export function p95(times: number[]): number {
  const sorted = [...times].sort((a, b) => a - b);
  return sorted[Math.floor(0.95 * (sorted.length - 1))] ?? Number.NaN;
}

/** Loads a URL for `duration` seconds; p95 from every response time. */
export function load(options: LoadOptions): Promise<LoadResult & { p95: number; times: number[] }> {
  return new Promise((resolve, reject) => {
    const times: number[] = [];
    const tracker = autocannon(
      {
        url: options.url,
        connections: options.connections,
        duration: options.duration,
        // Only what is given: an explicit undefined would override autocannon's own defaults.
        ...(options.headers ? { headers: options.headers } : {}),
        ...(options.method ? { method: options.method } : {}),
        ...(options.body ? { body: options.body } : {}),
        ...(options.setupRequest
          ? { requests: [{ method: options.method ?? "GET", path: new URL(options.url).pathname, setupRequest: options.setupRequest }] }
          : {}),
      },
      (error, result) => {
        if (error) return reject(error);
        resolve({ ...result, p95: p95(times), times });
      },
    );
    tracker.on("response", (_client, _status, _bytes, milliseconds) => times.push(milliseconds));
  });
}

/** Serves the built app (built into .next-bench first if the sources changed) on this database. */
export async function serveApp(extraEnv: Record<string, string> = {}): Promise<{ url: string; pid: number; stop: () => void }> {
  console.log("\nServing the app on the bench database (building it into .next-bench first if the sources changed) …");
  const env = { ...process.env, NEXT_DIST_DIR: process.env.NEXT_DIST_DIR ?? ".next-bench", ...extraEnv };
  const built = spawnSync("bash", ["-c", ". scripts/lib.sh && ensure_app_build"], { env, encoding: "utf8" });
  if (built.status !== 0) throw new Error(`The app did not build:\n${built.stdout}${built.stderr}`);
  const port = process.env.APP_PORT ?? "3200";
  const server = spawn("npx", ["next", "start", "--hostname", "127.0.0.1", "--port", port], {
    env,
    stdio: ["ignore", "ignore", "inherit"],
    detached: true,
  });
  const url = `http://127.0.0.1:${port}`;
  for (let attempt = 0; ; attempt++) {
    if (
      await fetch(`${url}/icon.svg`).then(
        (response) => response.ok,
        () => false,
      )
    )
      break;
    if (attempt > 150) throw new Error(`The app did not start on ${url}`);
    await new Promise((resolve) => setTimeout(resolve, 200));
  }
  return { url, pid: server.pid!, stop: () => process.kill(-server.pid!, "SIGTERM") };
}

/** Signs in through the real sign-in page and returns the session cookie. */
export async function signIn(url: string, email: string, password: string): Promise<string> {
  const browser = await chromium.launchPersistentContext(mkdtempSync(path.join(tmpdir(), "rhizomorph-bench-")), {
    executablePath: "/usr/bin/chromium",
    headless: true,
    args: ["--no-sandbox", "--disable-gpu", "--no-first-run"],
  });
  try {
    const page = await browser.newPage();
    await page.goto(`${url}/sign-in`);
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Password").fill(password);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByTestId("member-name").waitFor();
    return (await browser.cookies()).map((entry) => `${entry.name}=${entry.value}`).join("; ");
  } finally {
    await browser.close();
  }
}
