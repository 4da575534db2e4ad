/**
 * npm run bench:import — season-log import speed and memory, beside PostgreSQL's own COPY.
 *
 * For each size it runs a fresh child process (so peak memory is that size's alone) that:
 *   1. generates a season log with lib/import/generate.ts (not timed);
 *   2. times the app's path end to end: stream-parse the bytes, store the upload with its report,
 *      preview and staged parse (createUpload), then commit (commitUpload takes the staged parse,
 *      plans against what is stored and inserts or updates in one transaction);
 *   3. times two baselines on the same rows: a COPY (psql \copy) of the normalised rows into an
 *      unindexed scratch table ("bare COPY"), and a superuser COPY of the very blocks and harvests
 *      the commit wrote into copies of the real tables with all their constraints, indexes, foreign
 *      keys and triggers ("real-table COPY", the honest limit for any import that keeps them);
 * and prints rows per second of the import and both baselines, both ratios, the CPU seconds of
 * Node and of the PostgreSQL backends that served the import, and peak memory (max RSS).
 * The 500 000-row size runs the parse only (memory target: under 400 MB).
 * Runs through scripts/with-db.sh, which gives it a scratch database of its own.
 * `npm run bench:import -- 100000` runs one size alone.
 */
import { spawn, spawnSync } from "node:child_process";
import { createReadStream, createWriteStream, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { pipeline } from "node:stream/promises";
import { Pool } from "pg";
import { from as copyFrom, to as copyTo } from "pg-copy-streams";
import type { Member } from "@/lib/data/members";
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
  copyCpuSeconds?: number;
  realCopySeconds?: number;
  realCopyCpuSeconds?: number;
  /** Blocks and harvests the commit wrote, which the real-table COPY writes again. */
  realCopyRows?: number;
  nodeCpuSeconds?: number;
  postgresCpuSeconds?: number;
  peakRssMb: number;
}

const fullSizes = process.argv[2] && process.argv[2] !== "--one" ? [Number(process.argv[2])] : [10_000, 100_000];
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
async function prepareFarm(owner: Pool, name: string): Promise<Member> {
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
  return {
    id: userId,
    email: `bench-${farmId}@example.invalid`,
    name: "Bench Manager",
    role: "farm_manager",
    farmId,
    farmName: name,
    active: true,
    displayUnits: "metric",
    timeZone: null,
    dateStyle: "iso",
    sessionVersion: 1,
  };
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

function superuserPool(): Pool {
  const url = new URL(requireEnv("SUPERUSER_DATABASE_URL"));
  url.pathname = `/${requireEnv("RHIZO_DATABASE")}`;
  return new Pool({ connectionString: url.toString(), max: 1 });
}

/** CPU time (user + system, in clock ticks) of each backend serving the app role, read from /proc. */
async function appBackendTicks(superuser: Pool): Promise<Map<number, number>> {
  const { rows } = await superuser.query<{ pid: number }>(
    "select pid from pg_stat_activity where datname = current_database() and usename = 'rhizo_app'",
  );
  const ticks = new Map<number, number>();
  for (const { pid } of rows) {
    try {
      ticks.set(pid, ticksOf(pid));
    } catch {
      // The connection closed meanwhile.
    }
  }
  return ticks;
}

function ticksOf(pid: number): number {
  // Fields after the command's closing parenthesis: utime and stime are the 12th and 13th.
  const fields = readFileSync(`/proc/${pid}/stat`, "utf8").split(") ")[1].split(" ");
  return Number(fields[11]) + Number(fields[12]);
}

/** COPY of files into tables in one transaction on one superuser connection: wall time and that backend's CPU time. */
async function timedCopy(superuser: Pool, loads: [table: string, file: string, format: "csv" | "text"][]) {
  const client = await superuser.connect();
  try {
    const { rows } = await client.query<{ pid: number }>("select pg_backend_pid() as pid");
    const before = ticksOf(rows[0].pid);
    const started = performance.now();
    await client.query("begin");
    for (const [table, file, format] of loads) {
      await pipeline(
        createReadStream(file, { highWaterMark: 256 * 1024 }),
        client.query(copyFrom(`copy ${table} from stdin with (format ${format})`)),
      );
    }
    await client.query("commit");
    return { seconds: (performance.now() - started) / 1000, cpuSeconds: (ticksOf(rows[0].pid) - before) / ticksPerSecond };
  } finally {
    client.release();
  }
}

async function copyOut(superuser: Pool, query: string, file: string): Promise<void> {
  const client = await superuser.connect();
  try {
    await pipeline(client.query(copyTo(`copy (${query}) to stdout`)), createWriteStream(file));
  } finally {
    client.release();
  }
}

const ticksPerSecond = Number(spawnSync("getconf", ["CLK_TCK"], { encoding: "utf8" }).stdout.trim()) || 100;

/**
 * Copies of blocks and harvests in a schema of their own, with what the real ones have: defaults,
 * checks, indexes (LIKE … INCLUDING ALL), foreign keys (the harvests' tenant key pointing at the
 * copy of blocks) and triggers (the change notices), read from the catalogue so they follow the schema.
 */
async function prepareRealTableCopies(superuser: Pool): Promise<void> {
  await superuser.query("drop schema if exists bench_real cascade; create schema bench_real");
  for (const table of ["blocks", "harvests"]) {
    await superuser.query(`create table bench_real.${table} (like public.${table} including all)`);
  }
  await superuser.query("set search_path = pg_catalog");
  try {
    const { rows } = await superuser.query<{ statement: string }>(
      `select format('alter table bench_real.%I add constraint %I %s', t.relname, c.conname,
         replace(pg_get_constraintdef(c.oid), 'REFERENCES public.blocks(', 'REFERENCES bench_real.blocks(')) as statement
       from pg_constraint c join pg_class t on t.oid = c.conrelid
       where c.contype = 'f' and t.relnamespace = 'public'::regnamespace and t.relname in ('blocks', 'harvests')
       union all
       select replace(replace(pg_get_triggerdef(g.oid), ' ON public.blocks ', ' ON bench_real.blocks '), ' ON public.harvests ', ' ON bench_real.harvests ')
       from pg_trigger g join pg_class t on t.oid = g.tgrelid
       where not g.tgisinternal and t.relnamespace = 'public'::regnamespace and t.relname in ('blocks', 'harvests')`,
    );
    for (const { statement } of rows) await superuser.query(statement);
  } finally {
    await superuser.query("reset search_path");
  }
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

  const superuser = superuserPool();
  const ticksBefore = await appBackendTicks(superuser);
  const cpuBefore = process.cpuUsage();
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
    const cpuAfter = process.cpuUsage(cpuBefore);
    const ticksAfter = await appBackendTicks(superuser);
    await stopPooledRefresh();
    if (receipt.counts.newHarvests + receipt.counts.newBlocks === 0) throw new Error("the bench commit wrote nothing");
    figures.uploadSeconds = (uploaded - parsed) / 1000;
    figures.commitSeconds = (committed - uploaded) / 1000;
    figures.endToEndSeconds = (committed - started) / 1000;
    figures.nodeCpuSeconds = (cpuAfter.user + cpuAfter.system) / 1e6;
    let ticks = 0;
    for (const [pid, after] of ticksAfter) ticks += after - (ticksBefore.get(pid) ?? 0);
    figures.postgresCpuSeconds = ticks / ticksPerSecond;

    await superuser.query(`create table if not exists bench_copy_rows (block_code text, strain text, substrate text, inoculated_on date, wet_g numeric, wet_written text,
      moisture numeric, fruiting_method text, flush integer, harvested_on date, fresh_g numeric, fresh_written text, dry_g numeric, contaminated boolean,
      contaminated_on date, spent_g numeric, notes text)`);
    await superuser.query("truncate bench_copy_rows");
    const csvPath = path.join(tmpdir(), `rhizomorph-bench-copy-${rows}.csv`);
    writeFileSync(csvPath, copyCsv(result.records));
    const bare = await timedCopy(superuser, [["bench_copy_rows", csvPath, "csv"]]);
    figures.copySeconds = bare.seconds;
    figures.copyCpuSeconds = bare.cpuSeconds;

    // The rows exactly as the commit stored them, written out (not timed), then copied back in as the superuser.
    await prepareRealTableCopies(superuser);
    const blocksPath = path.join(tmpdir(), `rhizomorph-bench-blocks-${rows}.copy`);
    const harvestsPath = path.join(tmpdir(), `rhizomorph-bench-harvests-${rows}.copy`);
    await copyOut(superuser, `select * from blocks where farm_id = '${context.farmId}' order by id`, blocksPath);
    await copyOut(superuser, `select * from harvests where farm_id = '${context.farmId}' order by id`, harvestsPath);
    const real = await timedCopy(superuser, [
      ["bench_real.blocks", blocksPath, "text"],
      ["bench_real.harvests", harvestsPath, "text"],
    ]);
    figures.realCopySeconds = real.seconds;
    figures.realCopyCpuSeconds = real.cpuSeconds;
    figures.realCopyRows = receipt.counts.newBlocks + receipt.counts.newHarvests;
  }
  figures.peakRssMb = process.resourceUsage().maxRSS / 1024;
  await owner.end();
  await superuser.end();
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
  console.log("Rows/s count the sheet's rows for all three. The real-table COPY writes the blocks and harvests the commit wrote.");
  console.log(
    "CPU: Node's and the app's PostgreSQL backends' for the import; the COPY's backend for each baseline. Ratio = baseline ÷ import (1 = as fast as the baseline).\n",
  );
  console.log(
    "rows     | MB   | parse s | upload s | commit s | import rows/s | bare COPY rows/s | ratio | real-table COPY rows/s | ratio | Node CPU s | PostgreSQL CPU s | bare COPY CPU s | real-table COPY CPU s | CPU ratio real | peak RSS MB",
  );
  const cells = (values: [string, number][]) => values.map(([text, width]) => text.padStart(width)).join(" | ");
  for (const rows of fullSizes) {
    const f = await runChild(rows, true);
    const app = perSecond(f.rows, f.endToEndSeconds);
    const copy = perSecond(f.rows, f.copySeconds);
    const real = perSecond(f.rows, f.realCopySeconds);
    const importCpu = f.nodeCpuSeconds! + f.postgresCpuSeconds!;
    console.log(
      `${String(f.rows).padEnd(8)} | ${cells([
        [(f.bytes / 1048576).toFixed(1), 4],
        [f.parseSeconds.toFixed(2), 7],
        [f.uploadSeconds!.toFixed(2), 8],
        [f.commitSeconds!.toFixed(2), 8],
        [String(app), 13],
        [String(copy), 16],
        [(app / copy).toFixed(2), 5],
        [`${real} (${f.realCopyRows} rows)`, 22],
        [(app / real).toFixed(2), 5],
        [f.nodeCpuSeconds!.toFixed(2), 10],
        [f.postgresCpuSeconds!.toFixed(2), 16],
        [f.copyCpuSeconds!.toFixed(2), 15],
        [f.realCopyCpuSeconds!.toFixed(2), 21],
        [(f.realCopyCpuSeconds! / importCpu).toFixed(2), 14],
        [f.peakRssMb.toFixed(0), 11],
      ])}`,
    );
  }
  const memory = await runChild(memorySize, false);
  console.log(
    `\n${memory.rows} rows, parse only: ${memory.parseSeconds.toFixed(2)} s (${perSecond(memory.rows, memory.parseSeconds)} rows/s), peak RSS ${memory.peakRssMb.toFixed(0)} MB for a ${(memory.bytes / 1048576).toFixed(0)} MB sheet generated straight into the parser (target < 400 MB; parse time includes generating)`,
  );
  console.log(
    "\nTarget (issue 17): the import at least 0.75 of the real-table COPY's rows per second at 100 000 rows; parsing 500 000 rows under 400 MB.",
  );
}

await main();
