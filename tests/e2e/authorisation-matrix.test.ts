import { readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import type { Pool } from "pg";
import type { APIResponse, BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { superuserPool } from "../integration/support/database";
import { appUrl, openBrowser } from "./support/browser";
import { AppShell, SignInPage } from "./support/pages";

/**
 * Every route handler, called as each role, as a member of another farm and signed out. The
 * matrix below must name every app/**\/route.ts method (a test fails when one is missing), and
 * every answer is checked for foreign farms' names and for pooled cells from too few farms.
 * Server actions have their own matrix in server-action-matrix.test.ts.
 */

type Caller = "coordinator" | "farmManager" | "grower" | "observer" | "otherFarmManager" | "signedOut";
const callers: Record<Exclude<Caller, "signedOut">, { email: string; farm: string | null }> = {
  coordinator: { email: "coordinator@aldervalley.example", farm: null },
  farmManager: { email: "manager@fernbrook.example", farm: "Fernbrook Farm" },
  grower: { email: "grower@fernbrook.example", farm: "Fernbrook Farm" },
  observer: { email: "observer@extension.example", farm: null },
  otherFarmManager: { email: "manager@hollowoak.example", farm: "Hollow Oak Mushrooms" },
};

/** allowed: may use it (any status but 401/403/5xx); foreign: the resource is Fernbrook's, so another farm gets 403/404. */
type Expectation = "allowed" | "forbidden" | "foreign";
interface Entry {
  file: string;
  method: "GET" | "POST";
  path: (ids: Fixtures) => string;
  body?: string;
  expect: Record<Exclude<Caller, "signedOut">, Expectation>;
}

interface Fixtures {
  uploadId: string;
  trialId: string;
  speciesId: string;
}

const farmPeopleOnly = {
  coordinator: "forbidden",
  farmManager: "allowed",
  grower: "allowed",
  observer: "forbidden",
  otherFarmManager: "allowed",
} as const;
const fernbrookUpload = {
  coordinator: "forbidden",
  farmManager: "allowed",
  grower: "allowed",
  observer: "forbidden",
  otherFarmManager: "foreign",
} as const;
const everyone = {
  coordinator: "allowed",
  farmManager: "allowed",
  grower: "allowed",
  observer: "allowed",
  otherFarmManager: "allowed",
} as const;

const matrix: Entry[] = [
  { file: "app/api/results/route.ts", method: "GET", path: (ids) => `/api/results?species=${ids.speciesId}&window=all`, expect: everyone },
  { file: "app/api/my-farm/route.ts", method: "GET", path: () => "/api/my-farm", expect: farmPeopleOnly },
  { file: "app/api/season-logs/route.ts", method: "GET", path: () => "/api/season-logs", expect: farmPeopleOnly },
  { file: "app/api/season-logs/route.ts", method: "POST", path: () => "/api/season-logs", body: "", expect: farmPeopleOnly },
  { file: "app/api/season-logs/template/route.ts", method: "GET", path: () => "/api/season-logs/template", expect: everyone },
  { file: "app/api/season-logs/export/route.ts", method: "GET", path: () => "/api/season-logs/export", expect: farmPeopleOnly },
  {
    file: "app/api/season-logs/[uploadId]/route.ts",
    method: "GET",
    path: (ids) => `/api/season-logs/${ids.uploadId}`,
    expect: fernbrookUpload,
  },
  {
    file: "app/api/season-logs/[uploadId]/file/route.ts",
    method: "GET",
    path: (ids) => `/api/season-logs/${ids.uploadId}/file`,
    expect: fernbrookUpload,
  },
  {
    file: "app/api/season-logs/[uploadId]/report/route.ts",
    method: "GET",
    path: (ids) => `/api/season-logs/${ids.uploadId}/report`,
    expect: fernbrookUpload,
  },
  {
    file: "app/api/season-logs/[uploadId]/check/route.ts",
    method: "POST",
    path: (ids) => `/api/season-logs/${ids.uploadId}/check`,
    body: "{}",
    expect: fernbrookUpload,
  },
  {
    file: "app/api/season-logs/[uploadId]/commit/route.ts",
    method: "POST",
    path: (ids) => `/api/season-logs/${ids.uploadId}/commit`,
    body: "{}",
    expect: fernbrookUpload,
  },
  {
    file: "app/api/trials/[trialId]/list/route.ts",
    method: "GET",
    path: (ids) => `/api/trials/${ids.trialId}/list`,
    expect: farmPeopleOnly,
  },
  // The published report as every member reads it (T-2026-01 is published in the demo).
  {
    file: "app/api/trials/[trialId]/report/pdf/route.ts",
    method: "GET",
    path: (ids) => `/api/trials/${ids.trialId}/report/pdf`,
    expect: everyone,
  },
  {
    file: "app/api/trials/[trialId]/report/csv/route.ts",
    method: "GET",
    path: (ids) => `/api/trials/${ids.trialId}/report/csv`,
    expect: everyone,
  },
  {
    file: "app/(app)/farm-people/data/download/route.ts",
    method: "GET",
    path: () => "/farm-people/data/download",
    expect: { coordinator: "forbidden", farmManager: "allowed", grower: "forbidden", observer: "forbidden", otherFarmManager: "allowed" },
  },
];

function routeFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const full = path.join(dir, name);
    if (statSync(full).isDirectory()) return routeFiles(full);
    return name === "route.ts" ? [full] : [];
  });
}

let browser: BrowserContext;
let inspector: Pool;
let fixtures: Fixtures;
let farmNames: string[];
let farmIds: Map<string, string>;
let minimumFarms: number;
let madeUploadId: string | null = null;

beforeAll(async () => {
  browser = await openBrowser();
  inspector = superuserPool();
  const farms = (await inspector.query<{ id: string; name: string }>("select id, name from farms")).rows;
  farmNames = farms.map((farm) => farm.name);
  farmIds = new Map(farms.map((farm) => [farm.name, farm.id]));
  minimumFarms = (await inspector.query<{ minimum_farms: number }>("select minimum_farms from cooperative_settings")).rows[0].minimum_farms;
  const fernbrook = (await inspector.query<{ id: string }>("select id from farms where name = 'Fernbrook Farm'")).rows[0].id;
  // A real upload of Fernbrook's, made the way a farm makes one: the template's header line
  // only, so checking or committing it changes no data.
  await browser.clearCookies();
  const page = browser.pages()[0] ?? (await browser.newPage());
  await new SignInPage(page).signIn(callers.farmManager.email);
  await new AppShell(page).waitUntilSignedIn();
  const template = await (await page.request.get(`${appUrl}/api/season-logs/template`)).text();
  const posted = await page.request.post(`${appUrl}/api/season-logs`, {
    headers: { "content-type": "text/csv", "x-file-name": "fernbrook-private.csv", origin: appUrl },
    data: `${template.split(/\r?\n/)[0]}\n`,
  });
  expect(posted.status(), await posted.text()).toBeLessThan(300);
  const upload = (
    await inspector.query<{ id: string }>(
      "select id from uploads where farm_id = $1 and file_name = 'fernbrook-private.csv' order by uploaded_at desc limit 1",
      [fernbrook],
    )
  ).rows[0];
  madeUploadId = upload.id;
  fixtures = {
    uploadId: upload.id,
    trialId: (await inspector.query<{ id: string }>("select id from trials where code = 'T-2026-01'")).rows[0].id,
    speciesId: (await inspector.query<{ id: string }>("select id from species where common_name ilike '%oyster%'")).rows[0].id,
  };
});

afterAll(async () => {
  await browser?.close();
  if (madeUploadId) await inspector?.query("delete from uploads where id = $1", [madeUploadId]);
  await inspector?.end();
});

/** Calls a route as the app's own pages do; a POST names its origin, as a browser's always does. */
async function call(entry: Entry, origin: string | null = appUrl): Promise<APIResponse> {
  const url = `${appUrl}${entry.path(fixtures)}`;
  const options = { maxRedirects: 0, failOnStatusCode: false };
  const page = browser.pages()[0] ?? (await browser.newPage());
  if (entry.method === "GET") return page.request.get(url, options);
  return page.request.post(url, { ...options, data: entry.body ?? "", headers: origin ? { origin } : {} });
}

/** Every published pooled figure in a results answer must come from at least the minimum number of farms. */
function smallCells(body: unknown): string[] {
  const problems: string[] = [];
  const results = (
    body as {
      results?: {
        strains: {
          strainName: string;
          farms: { status: string; value?: number };
          efficiency: { status: string; value?: { farms: number } };
        }[];
      };
    }
  ).results;
  for (const strain of results?.strains ?? []) {
    if (strain.farms.status === "published" && strain.farms.value! < minimumFarms) problems.push(`${strain.strainName} farms`);
    if (strain.efficiency.status === "published" && strain.efficiency.value!.farms < minimumFarms) problems.push(`${strain.strainName} BE`);
  }
  return problems;
}

describe("the authorisation matrix", () => {
  it("names every route handler method in the app", () => {
    const listed = new Set(matrix.map((entry) => `${entry.method} ${entry.file}`));
    const missing: string[] = [];
    for (const file of routeFiles("app")) {
      if (file.includes("[...nextauth]")) continue;
      const source = readFileSync(file, "utf8");
      for (const method of ["GET", "POST", "PUT", "PATCH", "DELETE"]) {
        if (new RegExp(`export (const|async function) ${method}\\b`).test(source) && !listed.has(`${method} ${file}`))
          missing.push(`${method} ${file}`);
      }
    }
    expect(missing).toEqual([]);
  });

  it("answers the signed-out with 401 (API) or a redirect to sign-in", async () => {
    await browser.clearCookies();
    for (const entry of matrix) {
      const response = await call(entry);
      const where = `${entry.method} ${entry.file}`;
      if (entry.path(fixtures).startsWith("/api/")) expect(response.status(), where).toBe(401);
      else expect([302, 303, 307], where).toContain(response.status());
    }
  });

  it("refuses every state-changing call from another site, or naming no site, with 403 and a reason, before the handler runs", async () => {
    await browser.clearCookies();
    const page = browser.pages()[0] ?? (await browser.newPage());
    await new SignInPage(page).signIn(callers.farmManager.email);
    await new AppShell(page).waitUntilSignedIn();
    const { rows: before } = await inspector.query<{ count: number }>("select count(*)::int as count from uploads");
    for (const entry of matrix.filter((candidate) => candidate.method !== "GET")) {
      for (const origin of ["https://attacker.example", "null", null]) {
        const response = await call(entry, origin);
        const where = `${entry.method} ${entry.file} with Origin ${origin ?? "(none)"}`;
        expect(response.status(), where).toBe(403);
        expect(((await response.json()) as { message: string }).message, where).toMatch(/refused/);
      }
    }
    // Auth.js's own routes too (a forged sign-out or sign-in).
    for (const path of ["/api/auth/signout", "/api/auth/callback/credentials"]) {
      const response = await page.request.post(`${appUrl}${path}`, {
        headers: { origin: "https://attacker.example" },
        form: { email: callers.farmManager.email, password: "x" },
        maxRedirects: 0,
        failOnStatusCode: false,
      });
      expect(response.status(), path).toBe(403);
    }
    // A season-log POST from another site stored nothing.
    const { rows: after } = await inspector.query<{ count: number }>("select count(*)::int as count from uploads");
    expect(after[0].count).toBe(before[0].count);
  });

  for (const caller of Object.keys(callers) as (keyof typeof callers)[]) {
    it(`gives the ${caller} what the matrix says, and nothing of another farm`, async () => {
      await browser.clearCookies();
      const page = browser.pages()[0] ?? (await browser.newPage());
      await new SignInPage(page).signIn(callers[caller].email);
      await new AppShell(page).waitUntilSignedIn();
      const foreignNames = farmNames.filter((name) => name !== callers[caller].farm);
      for (const entry of matrix) {
        const response = await call(entry);
        const where = `${caller}: ${entry.method} ${entry.file} → ${response.status()}`;
        const expected = entry.expect[caller];
        if (expected === "forbidden") expect(response.status(), where).toBe(403);
        else if (expected === "foreign") expect([403, 404], where).toContain(response.status());
        else {
          expect([401, 403], where).not.toContain(response.status());
          expect(response.status(), where).toBeLessThan(500);
        }
        const type = response.headers()["content-type"] ?? "";
        if (!/json|text|csv/.test(type)) continue;
        const text = await response.text();
        for (const name of foreignNames) {
          expect(text.includes(name), `${where} shows ${name}`).toBe(false);
          expect(text.includes(farmIds.get(name)!), `${where} shows ${name}'s id`).toBe(false);
        }
        if (expected === "foreign") expect(text, where).not.toContain("fernbrook-private.csv");
        if (entry.file === "app/api/results/route.ts" && response.ok()) expect(smallCells(JSON.parse(text)), where).toEqual([]);
      }
    });
  }
});
