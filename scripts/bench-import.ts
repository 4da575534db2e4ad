/**
 * npm run bench:import — season-log import speed and memory, beside PostgreSQL's own COPY.
 *
 * For each size it runs a fresh child process (so peak memory is that size's alone) that:
 *   1. generates a season log with lib/import/generate.ts (not timed);
 *   2. times the app's path end to end: stream-parse the bytes, store the upload with its report,
 *      preview and staged parse (createUpload), then commit (commitUpload takes the staged parse,
 *      plans against what is stored and inserts or updates in one transaction);
 *   3. times a COPY (psql \copy) of the same normalised rows into an unindexed scratch table;
 * and prints rows per second for both, the ratio and peak memory (max RSS).
 * The 500 000-row size runs the parse only (memory target: under 400 MB).
 * Runs through scripts/with-db.sh, which gives it a scratch database of its own.
 */
import { spawn, spawnSync } from "node:child_process";
import { writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { Pool } from "pg";
import type { FarmContext } from "@/db/client";
import { createSeasonLogParser } from "@/lib/import";
import { demoStrains, seasonLogLines } from "@/lib/import/generate";
import { parserOptions } from "@/lib/season-logs/report";

interface Figures {
  rows: number;
  bytes: number;
  parseSeconds: number;
  uploadSeconds?: number;
  commitSeconds?: number;
  endToEndSeconds?: number;
  copySeconds?: number;
  peakRssMb: number;
}

const fullSizes = [10_000, 100_000];
const memorySize = 500_000;

function requireEnv(name: string): string {
  const value = process.env[name];
  if (!value) throw new Error(`${name} is not set: run this through npm run bench:import`);
  return value;
}

function generate(rows: number, prefix: string): Buffer {
  const lines: string[] = [];
  for (const line of seasonLogLines({ rows, seed: rows, style: "european", blockPrefix: prefix })) lines.push(line);
  return Buffer.from(`${lines.join("\r\n")}\r\n`, "utf8");
}

/** A farm, its manager and the registry entries the generated sheets use, made as the owner. */
async function prepareFarm(owner: Pool, name: string): Promise<FarmContext> {
  const [{ id: speciesId }] = (
    await owner.query<{ id: string }>(
      "insert into species (scientific_name, common_name) values ('Fungus inventus', 'bench mushroom') on conflict (scientific_name) do update set common_name = excluded.common_name returning id",
    )
  ).rows;
  for (const code of demoStrains) {
    await owner.query(
      "insert into strains (code, species_id, name, source) values ($1, $2, $1, 'culture_bank') on conflict (code) do nothing",
      [code, speciesId],
    );
  }
  for (const code of ["HW-80/20", "HW-90/10", "SD-2"]) {
    await owner.query(
      "insert into substrate_recipes (code, name, base, target_moisture, treatment) values ($1, $1, 'hardwood sawdust', 0.62, 'sterilised') on conflict (code) do nothing",
      [code],
    );
  }
  for (const code of ["X-cut", "slits", "open top"]) {
    await owner.query("insert into treatments (code, name) values ($1, $1) on conflict (code) do nothing", [code]);
  }
  const [{ id: farmId }] = (await owner.query<{ id: string }>("insert into farms (name) values ($1) returning id", [name])).rows;
  const [{ id: userId }] = (
    await owner.query<{ id: string }>(
      "insert into users (email, name, role, farm_id) values ($1, 'Bench Manager', 'farm_manager', $2) returning id",
      [`bench-${farmId}@example.invalid`, farmId],
    )
  ).rows;
  return { userId, farmId, role: "farm_manager" };
}

/**
 * The commit starts the co-op's pooled refresh without waiting for it. It is not part of the
 * import, so the benchmark cancels it in its scratch database rather than let it share the
 * machine with the COPY that follows.
 */
async function stopPooledRefresh(): Promise<void> {
  const url = new URL(requireEnv("SUPERUSER_DATABASE_URL"));
  url.pathname = `/${requireEnv("RHIZO_DATABASE")}`;
  const superuser = new Pool({ connectionString: url.toString(), max: 1 });
  try {
    for (let attempt = 0; attempt < 50; attempt++) {
      const { rows } = await superuser.query<{ cancelled: boolean }>(
        `select pg_cancel_backend(pid) as cancelled from pg_stat_activity
         where datname = current_database() and pid <> pg_backend_pid() and query like '%pooled_refresh%' and state = 'active'`,
      );
      if (rows.some((row) => row.cancelled)) return;
      await new Promise((resolve) => setTimeout(resolve, 100));
    }
  } finally {
    await superuser.end();
  }
}

function copyCsv(records: ReturnType<ReturnType<typeof createSeasonLogParser>["end"]>["records"]): string {
  const cell = (value: string | number | boolean | null | undefined) =>
    value === null || value === undefined ? "" : `"${String(value).replace(/"/g, '""')}"`;
  const lines: string[] = [];
  for (const r of records) {
    lines.push(
      [
        r.blockCode,
        r.strainCode,
        r.substrate,
        r.inoculatedOn,
        r.wetBlockGrams,
        r.wetBlockAsWritten?.value,
        r.moisture,
        r.fruitingMethod,
        r.flush,
        r.harvestedOn,
        r.freshGrams,
        r.freshAsWritten?.value,
        r.dryGrams,
        r.contaminated,
        r.contaminatedOn,
        r.spentGrams,
        r.notes,
      ]
        .map(cell)
        .join(","),
    );
  }
  return `${lines.join("\n")}\n`;
}

/** Parse only, with the sheet generated straight into the parser, so the peak is the parser's own. */
function measureParse(rows: number): Figures {
  const started = performance.now();
  const parser = createSeasonLogParser(parserOptions({}, [...demoStrains]));
  let pending: string[] = [];
  let pendingLength = 0;
  let bytes = 0;
  const flush = () => {
    const chunk = Buffer.from(pending.join(""), "utf8");
    bytes += chunk.length;
    parser.write(chunk);
    pending = [];
    pendingLength = 0;
  };
  for (const line of seasonLogLines({ rows, seed: rows, style: "european", blockPrefix: `N${rows}` })) {
    pending.push(line, "\r\n");
    pendingLength += line.length + 2;
    if (pendingLength >= 64 * 1024) flush();
  }
  flush();
  const result = parser.end();
  return {
    rows: result.records.length,
    bytes,
    parseSeconds: (performance.now() - started) / 1000,
    peakRssMb: process.resourceUsage().maxRSS / 1024,
  };
}

async function measure(rows: number, full: boolean): Promise<Figures> {
  if (!full) return measureParse(rows);
  // The data layer is marked server-only: it loads only in the child, which runs with the react-server condition.
  const { closeDatabase } = await import("@/db/client");
  const { commitUpload, createUpload, getImportSetup } = await import("@/lib/data/season-logs");
  const owner = new Pool({ connectionString: requireEnv("OWNER_DATABASE_URL"), max: 1 });
  const content = generate(rows, `N${rows}`);
  const context = full ? await prepareFarm(owner, `Bench farm ${rows} ${Date.now()}`) : null;
  const setup = context ? await getImportSetup(context) : { knownStrains: [...demoStrains], remembered: {} };

  const started = performance.now();
  const parser = createSeasonLogParser(parserOptions({}, setup.knownStrains));
  const slice = 64 * 1024;
  for (let start = 0; start < content.length; start += slice) parser.write(content.subarray(start, start + slice));
  const result = parser.end();
  const parsed = performance.now();
  const figures: Figures = { rows: result.records.length, bytes: content.length, parseSeconds: (parsed - started) / 1000, peakRssMb: 0 };
  const errors = result.issues.filter((issue) => issue.severity === "error");
  if (errors.length > 0) throw new Error(`the generated sheet should read cleanly; first error: ${errors[0].message}`);

  if (context) {
    const view = await createUpload(context, { fileName: `bench-${rows}.csv`, content, result, choices: {} });
    const uploaded = performance.now();
    if (!view.canCommit)
      throw new Error(`the bench upload cannot be committed: ${view.report.issues.find((issue) => issue.severity === "error")?.message}`);
    const receipt = await commitUpload(context, view.upload.id, {});
    const committed = performance.now();
    await stopPooledRefresh();
    if (receipt.counts.newHarvests + receipt.counts.newBlocks === 0) throw new Error("the bench commit wrote nothing");
    figures.uploadSeconds = (uploaded - parsed) / 1000;
    figures.commitSeconds = (committed - uploaded) / 1000;
    figures.endToEndSeconds = (committed - started) / 1000;

    await owner.query(`create table if not exists bench_copy_rows (block_code text, strain text, substrate text, inoculated_on date, wet_g numeric, wet_written text,
      moisture numeric, fruiting_method text, flush integer, harvested_on date, fresh_g numeric, fresh_written text, dry_g numeric, contaminated boolean,
      contaminated_on date, spent_g numeric, notes text)`);
    await owner.query("truncate bench_copy_rows");
    const csvPath = path.join(tmpdir(), `rhizomorph-bench-copy-${rows}.csv`);
    writeFileSync(csvPath, copyCsv(result.records));
    const copyStarted = performance.now();
    const copy = spawnSync(
      "psql",
      [requireEnv("OWNER_DATABASE_URL"), "-q", "-v", "ON_ERROR_STOP=1", "-c", `\\copy bench_copy_rows from '${csvPath}' with (format csv)`],
      { encoding: "utf8" },
    );
    figures.copySeconds = (performance.now() - copyStarted) / 1000;
    if (copy.status !== 0) throw new Error(`COPY failed: ${copy.stderr}`);
  }
  figures.peakRssMb = process.resourceUsage().maxRSS / 1024;
  await owner.end();
  // A cancelled refresh may still be returning its connection; the child exits right after printing.
  void closeDatabase();
  return figures;
}

function runChild(rows: number, full: boolean): Promise<Figures> {
  return new Promise((resolve, reject) => {
    const child = spawn(
      process.execPath,
      [...process.execArgv, "--conditions=react-server", process.argv[1], "--one", String(rows), full ? "full" : "parse"],
      { stdio: ["ignore", "pipe", "inherit"] },
    );
    let output = "";
    child.stdout.on("data", (chunk: Buffer) => (output += chunk.toString()));
    child.on("exit", (code) => {
      const line = output.trim().split("\n").pop() ?? "";
      if (code === 0) resolve(JSON.parse(line) as Figures);
      else reject(new Error(`the ${rows}-row run failed (exit ${code})`));
    });
  });
}

const perSecond = (rows: number, seconds: number | undefined) => (seconds ? Math.round(rows / seconds) : 0);

async function main() {
  if (process.argv[2] === "--one") {
    const figures = await measure(Number(process.argv[3]), process.argv[4] === "full");
    process.stdout.write(`${JSON.stringify(figures)}\n`, () => process.exit(0));
    return;
  }
  console.log("Season-log import benchmark (generated European-style sheets; one fresh process per size)\n");
  console.log("rows     | MB   | parse s | upload s | commit s | end to end rows/s | COPY rows/s | ratio | peak RSS MB");
  for (const rows of fullSizes) {
    const f = await runChild(rows, true);
    const app = perSecond(f.rows, f.endToEndSeconds);
    const copy = perSecond(f.rows, f.copySeconds);
    console.log(
      `${String(f.rows).padEnd(8)} | ${(f.bytes / 1048576).toFixed(1).padStart(4)} | ${f.parseSeconds.toFixed(2).padStart(7)} | ${f.uploadSeconds!.toFixed(2).padStart(8)} | ${f.commitSeconds!.toFixed(2).padStart(8)} | ${String(app).padStart(17)} | ${String(copy).padStart(11)} | ${(app / copy).toFixed(2).padStart(5)} | ${f.peakRssMb.toFixed(0).padStart(11)}`,
    );
  }
  const memory = await runChild(memorySize, false);
  console.log(
    `\n${memory.rows} rows, parse only: ${memory.parseSeconds.toFixed(2)} s (${perSecond(memory.rows, memory.parseSeconds)} rows/s), peak RSS ${memory.peakRssMb.toFixed(0)} MB for a ${(memory.bytes / 1048576).toFixed(0)} MB sheet generated straight into the parser (target < 400 MB; parse time includes generating)`,
  );
  console.log("\nTarget: end to end at least 1/3 of COPY's rows per second (ratio ≥ 0.33).");
}

await main();
