import { readFileSync } from "node:fs";
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { seasonLogLines } from "@/lib/import/generate";
import { superuserPool } from "../integration/support/database";
import { openBrowser } from "./support/browser";
import { AppShell, SignInPage } from "./support/pages";
import { startSecondServer } from "./support/second-server";

/**
 * Three farms each send a 45 MB season log at the same moment (the largest files allowed are
 * 50 MB). The server must answer all three and stay under 1 GB of resident memory: read from
 * /proc as the peak the process ever reached (VmHWM), not timed. Run against a server of its
 * own, so its peak is this test's alone.
 */

const limitMegabytes = 1024;
const fileName = "memory-probe-45mb.csv";
let inspector: Pool;
let server: { url: string; pid: number; stop: () => void };
let file: Buffer;

function megabytesOf(pid: number, field: "VmHWM" | "VmRSS"): number {
  const line = readFileSync(`/proc/${pid}/status`, "utf8")
    .split("\n")
    .find((entry) => entry.startsWith(`${field}:`));
  return Number(/(\d+)/.exec(line ?? "")?.[1]) / 1024;
}

/**
 * A real-looking season log of about 45 MB (a European-style sheet: semicolons, decimal commas)
 * that the demo co-op's registers accept, so every row is parsed, planned and staged for a
 * commit: heavier than a file wrong on every row, whose errors are only counted past the first
 * few thousand (tmp measurements: about 560 MB against 520 MB above the server's own).
 */
function seasonLogOf(bytes: number): Buffer {
  const parts: string[] = [];
  let size = 0;
  for (const generated of seasonLogLines({ rows: 1_000_000, seed: 45, style: "european", blockPrefix: "M" })) {
    const cells = generated.split(";");
    // The demo co-op's codes for strain, substrate and fruiting method; no trial.
    if (parts.length > 0) [cells[1], cells[2], cells[3], cells[4], cells[8]] = ["PO-01", "HWB-20", "", "", "SLIT-ACROSS"];
    const line = cells.join(";");
    if (size + line.length + 2 > bytes) break;
    parts.push(line);
    size += line.length + 2;
  }
  return Buffer.from(`${parts.join("\r\n")}\r\n`);
}

async function signedInCookie(email: string): Promise<string> {
  const browser = await openBrowser();
  try {
    const page = browser.pages()[0] ?? (await browser.newPage());
    await new SignInPage(page, server.url).signIn(email);
    await new AppShell(page).waitUntilSignedIn();
    return (await browser.cookies()).map((cookie) => `${cookie.name}=${cookie.value}`).join("; ");
  } finally {
    await browser.close();
  }
}

beforeAll(async () => {
  inspector = superuserPool();
  file = seasonLogOf(45 * 1024 * 1024);
  server = await startSecondServer();
});

afterAll(async () => {
  server?.stop();
  await inspector.query("delete from uploads where file_name = $1", [fileName]);
  await inspector.end();
});

describe("three 45 MB season logs sent at once", () => {
  it(`are all answered, and the server stays under ${limitMegabytes} MB of memory`, async () => {
    expect(file.byteLength).toBeGreaterThan(44 * 1024 * 1024);
    const cookies = await Promise.all(
      ["manager@fernbrook.example", "manager@hollowoak.example", "manager@millcreek.example"].map(signedInCookie),
    );
    const before = megabytesOf(server.pid, "VmRSS");
    const answers = await Promise.all(
      cookies.map((cookie) =>
        fetch(`${server.url}/api/season-logs`, {
          method: "POST",
          headers: { cookie, origin: server.url, "content-type": "text/csv", "x-file-name": fileName },
          body: new Uint8Array(file),
        }).then(async (response) => ({ status: response.status, body: await response.text() })),
      ),
    );
    const peak = megabytesOf(server.pid, "VmHWM");
    console.log(`Server memory: ${before.toFixed(0)} MB before the uploads, peak ${peak.toFixed(0)} MB (limit ${limitMegabytes} MB)`);
    for (const answer of answers) expect(answer.status, answer.body.slice(0, 300)).toBe(201);
    // Each file was read to the end: every row parsed, checked and planned.
    for (const answer of answers) {
      const view = JSON.parse(answer.body) as { upload: { rowCount: number; sizeBytes: number; outcome: string } };
      expect(view.upload.sizeBytes).toBe(file.byteLength);
      expect(view.upload.outcome).toBe("received");
      expect(view.upload.rowCount).toBeGreaterThan(400_000);
    }
    expect(peak).toBeLessThan(limitMegabytes);
  });
});
