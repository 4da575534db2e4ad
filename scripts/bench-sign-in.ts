// npm run bench:sign-in — a farm manager's page while a burst of wrong passwords hits the
// sign-in, beside the same page with the server otherwise idle, in the same run (loopback).
//
// The burst: 20 connections for 30 s posting wrong passwords for a real member to Auth.js's
// credentials endpoint. It runs twice: (a) each try from a different client address (the app
// trusts one proxy here, so the addresses are read from X-Forwarded-For, as for a botnet behind
// the co-op's reverse proxy): every try is admitted and costs a full bcrypt comparison, the
// worst case for the CPU; (b) every try from one address: after the free tries they are paced
// away without bcrypt. Meanwhile one client loads /my-farm as Fernbrook's manager, and the
// database's app connections are sampled for any held inside a transaction.
import { spawnSync } from "node:child_process";
import { Pool } from "pg";
import { load, serveApp, signIn, type LoadResult } from "./bench-app";

const BURST_CONNECTIONS = 20;
const BURST_SECONDS = 30;
const PAGE_SECONDS = 20;
const demoPassword = "alder-valley-demo";
const managerEmail = "manager@fernbrook.example";

function requireEnv(name: string): string {
  const value = process.env[name];
  if (!value) throw new Error(`${name} is not set: run this through npm run bench:sign-in`);
  return value;
}

const superuserUrl = new URL(requireEnv("SUPERUSER_DATABASE_URL"));
superuserUrl.pathname = `/${requireEnv("RHIZO_DATABASE")}`;
const superuser = new Pool({ connectionString: superuserUrl.toString(), max: 1 });

/** Samples the app role's connections every 100 ms: the most at once busy, and inside a transaction. */
function sampleConnections(): { stop: () => Promise<{ busy: number; inTransaction: number }> } {
  let busy = 0;
  let inTransaction = 0;
  let running = true;
  const loop = (async () => {
    while (running) {
      const { rows } = await superuser.query<{ busy: number; in_transaction: number }>(
        `select count(*) filter (where state = 'active')::int as busy,
                count(*) filter (where state like 'idle in transaction%')::int as in_transaction
         from pg_stat_activity where datname = current_database() and usename = 'rhizo_app' and application_name <> 'rhizomorph change feed'`,
      );
      busy = Math.max(busy, rows[0].busy);
      inTransaction = Math.max(inTransaction, rows[0].in_transaction);
      await new Promise((resolve) => setTimeout(resolve, 100));
    }
  })();
  return {
    stop: async () => {
      running = false;
      await loop;
      return { busy, inTransaction };
    },
  };
}

async function csrf(url: string): Promise<{ token: string; cookie: string }> {
  const response = await fetch(`${url}/api/auth/csrf`);
  const { csrfToken } = (await response.json()) as { csrfToken: string };
  const cookie = response.headers
    .getSetCookie()
    .map((entry) => entry.split(";")[0])
    .join("; ");
  return { token: csrfToken, cookie };
}

interface BurstFigures {
  page: LoadResult & { p95: number };
  burst: LoadResult & { p95: number };
  connections: { busy: number; inTransaction: number };
}

async function pageDuringBurst(url: string, pageCookie: string, distinctAddresses: boolean): Promise<BurstFigures> {
  const { token, cookie } = await csrf(url);
  let sent = 0;
  const sampler = sampleConnections();
  const headers = { "content-type": "application/x-www-form-urlencoded", origin: url, cookie };
  const burst = load({
    url: `${url}/api/auth/callback/credentials`,
    connections: BURST_CONNECTIONS,
    duration: BURST_SECONDS,
    method: "POST",
    headers,
    setupRequest: (request) => {
      sent++;
      const address = distinctAddresses ? `10.${(sent >> 16) & 255}.${(sent >> 8) & 255}.${sent & 255}` : "10.200.0.1";
      return {
        ...request,
        headers: { ...headers, "x-forwarded-for": address },
        body: new URLSearchParams({ csrfToken: token, email: managerEmail, password: `wrong-${sent}` }).toString(),
      };
    },
  });
  // The page is timed inside the burst: it starts once the burst runs and ends before it stops.
  await new Promise((resolve) => setTimeout(resolve, 5_000));
  const page = await load({ url: `${url}/my-farm`, connections: 1, duration: PAGE_SECONDS, headers: { cookie: pageCookie } });
  const burstResult = await burst;
  return { page, burst: burstResult, connections: await sampler.stop() };
}

async function main() {
  console.log("Loading the demo co-op into the bench database …");
  const seeded = spawnSync("npx", ["tsx", "db/seed.ts"], { env: process.env, encoding: "utf8" });
  if (seeded.status !== 0) throw new Error(`Seeding failed:\n${seeded.stdout}${seeded.stderr}`);

  // One trusted proxy, so the burst can come from many addresses (see the top of this file).
  const app = await serveApp({ RHIZO_TRUSTED_PROXIES: "1" });
  try {
    const cookie = await signIn(app.url, managerEmail, demoPassword);
    const pageUrl = `${app.url}/my-farm`;
    await load({ url: pageUrl, connections: 1, duration: 3, headers: { cookie } });
    const idleSampler = sampleConnections();
    const idle = await load({ url: pageUrl, connections: 1, duration: PAGE_SECONDS, headers: { cookie } });
    const idleConnections = await idleSampler.stop();
    const everyTryChecked = await pageDuringBurst(app.url, cookie, true);
    const paced = await pageDuringBurst(app.url, cookie, false);
    // Idle again once the queued checks have drained, so warm-up and order fall on both sides.
    await new Promise((resolve) => setTimeout(resolve, 10_000));
    const afterSampler = sampleConnections();
    const idleAfter = await load({ url: pageUrl, connections: 1, duration: PAGE_SECONDS, headers: { cookie } });
    const afterConnections = await afterSampler.stop();

    const codes = (result: LoadResult) =>
      Object.entries(result.statusCodeStats)
        .map(([code, { count }]) => `${code}: ${count}`)
        .join(", ");
    console.log("");
    console.log(
      `| GET /my-farm as a farm manager, 1 client, ${PAGE_SECONDS} s | p50 | p95 | p95 ÷ idle p95 (before) | requests | app connections at most busy / in a transaction |`,
    );
    console.log("| --- | --- | --- | --- | --- | --- |");
    const row = (name: string, result: LoadResult & { p95: number }, connections: { busy: number; inTransaction: number }) =>
      console.log(
        `| ${name} | ${result.latency.p50} ms | ${result.p95.toFixed(0)} ms | ${(result.p95 / idle.p95).toFixed(2)}× | ${result.requests.total} (${codes(result)}) | ${connections.busy} / ${connections.inTransaction} |`,
      );
    row("idle, before the bursts", idle, idleConnections);
    row("idle, after the bursts", idleAfter, afterConnections);
    row(`during the burst, every try from its own address (each checked by bcrypt)`, everyTryChecked.page, everyTryChecked.connections);
    row(`during the burst, every try from one address (paced)`, paced.page, paced.connections);
    console.log("");
    console.log(
      `| burst: ${BURST_CONNECTIONS} connections, ${BURST_SECONDS} s, wrong passwords | tries/s | p50 | p95 | answers | no answer within 10 s |`,
    );
    console.log("| --- | --- | --- | --- | --- | --- |");
    for (const [name, figures] of [
      ["every try from its own address", everyTryChecked],
      ["every try from one address", paced],
    ] as const) {
      const { burst } = figures;
      console.log(
        `| ${name} | ${burst.requests.average.toFixed(1)} | ${burst.latency.p50} ms | ${burst.p95.toFixed(0)} ms | ${codes(burst)} | ${burst.timeouts} |`,
      );
    }
  } finally {
    app.stop();
  }
}

try {
  await main();
} finally {
  await superuser.end();
}
