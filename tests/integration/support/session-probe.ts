// A second app process for tests: it answers, for each session (one JSON line of claims on
// stdin), whether its guard would still accept it ("current" or "ended"), with its own pools,
// change feed and kept copies. Run with --conditions=react-server (the data layer is server-only).
import { createInterface } from "node:readline";
import { changeGeneration } from "@/db/change-feed";
import { closeDatabase } from "@/db/client";
import type { SessionClaims } from "@/lib/auth/sessions";
import { memberForSession } from "@/lib/data/sessions";

async function listening(): Promise<void> {
  while (changeGeneration("members") === null) await new Promise((resolve) => setTimeout(resolve, 20));
}

await listening();
process.stdout.write("ready\n");
for await (const line of createInterface({ input: process.stdin })) {
  if (!line.trim()) continue;
  const member = await memberForSession(JSON.parse(line) as SessionClaims);
  process.stdout.write(`${member ? "current" : "ended"}\n`);
}
await closeDatabase();
