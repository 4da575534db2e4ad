// Times the pooled-statistics refresh on a generated co-op of 50 farms × 10 000 blocks ×
// 4 flushes (2 million harvests), each beside a bare SQL GROUP BY computing the same per-farm
// sums in the same run; cuts the first release of them; times one results computation from the
// live statistics and from the release; then serves the built app on the same database and loads
// the results API with 20 clients for 30 s, beside a static file from the same server. Prints
// figures only.
import { performance } from "node:perf_hooks";
import { Pool } from "pg";
import { hashPassword } from "../lib/auth/password";
import { closeDatabase } from "../db/client";
import { cutSetupRelease } from "../lib/data/pooled-releases";
import { buildPooledResults, roundPooledResults, type FlushStatisticsRow, type StrainStatisticsRow } from "../lib/pooled";
import { seededRandom } from "../lib/random";
import { load, serveApp, signIn } from "./bench-app";

const FARMS = 50;
const BLOCKS_PER_FARM = 10_000;
const FLUSHES = 4;
const RUNS = 5;

function pool(url: string | undefined, database?: string): Pool {
  if (!url) throw new Error("Run this through npm run bench:pooled (it sets the database up)");
  const parsed = new URL(url);
  if (database) parsed.pathname = `/${database}`;
  return new Pool({ connectionString: parsed.toString(), max: 2 });
}

const database = process.env.RHIZO_DATABASE;
const superuser = pool(process.env.SUPERUSER_DATABASE_URL, database);
const analyst = pool(process.env.ANALYST_DATABASE_URL);

/** Runs the works in turn, RUNS rounds, so a cold cache or a busy moment falls on each alike; medians. */
async function timedSideBySide(works: (() => Promise<unknown>)[]): Promise<number[]> {
  const times: number[][] = works.map(() => []);
  for (let run = 0; run < RUNS; run++) {
    for (const [index, work] of works.entries()) {
      const start = performance.now();
      await work();
      times[index].push(performance.now() - start);
    }
  }
  return times.map((list) => list.sort((a, b) => a - b)[Math.floor(RUNS / 2)]);
}

const ms = (value: number) => `${value.toFixed(0)} ms`;

// The same sums the refresh stores (blocks, contaminated, BE n/Σ/Σ², days to first harvest), per
// farm × strain × recipe × method × arm, as one plain aggregate query over the same rows.
const bareGroupBy = (where: string) => `
  create temp table bench_sums as
    select b.farm_id, s.species_id, b.strain_id, b.substrate_recipe_id, b.fruiting_method_id, b.trial_arm_id,
      count(*) as blocks, count(*) filter (where b.contaminated) as contaminated,
      count(h.fresh) as efficiency_blocks, sum(100 * h.fresh / (b.wet_mass_g * (1 - b.moisture))) as efficiency_sum,
      sum((100 * h.fresh / (b.wet_mass_g * (1 - b.moisture)))^2) as efficiency_squares,
      sum(h.first_on - b.inoculated_on) as first_harvest_days_sum
    from blocks b join strains s on s.id = b.strain_id
    left join (select block_id, sum(fresh_mass_g) as fresh, min(harvested_on) as first_on from harvests ${where.replace("b.farm_id", "farm_id")} group by block_id) h on h.block_id = b.id
    ${where}
    group by 1, 2, 3, 4, 5, 6;
  drop table bench_sums`;

async function generate(): Promise<string> {
  console.log(`Generating ${FARMS} farms × ${BLOCKS_PER_FARM} blocks × ${FLUSHES} flushes …`);
  const start = performance.now();
  await superuser.query(`
    insert into cooperative_settings (name, minimum_farms) values ('Bench co-op', 3) on conflict do nothing;
    insert into species (scientific_name, common_name) values ('Fungus benchmarkii', 'bench mushroom');
    insert into strains (code, name, source, species_id) select 'B-' || n, 'Bench strain ' || n, 'culture_bank', (select id from species limit 1) from generate_series(1, 10) n;
    insert into substrate_recipes (code, name, base, target_moisture, treatment) values ('R1', 'Recipe one', 'Sawdust', 0.62, 'sterilised'), ('R2', 'Recipe two', 'Straw', 0.7, 'sterilised');
    insert into treatments (code, name, kind) values ('M1', 'Method one', 'fruiting_method');
    insert into farms (name) select 'Bench farm ' || n from generate_series(1, ${FARMS}) n;`);
  await superuser.query(`
    create temp table strain_list as select id, row_number() over (order by code) as n from strains;
    insert into blocks (farm_id, code, strain_id, substrate_recipe_id, fruiting_method_id, inoculated_on, wet_mass_g, moisture, contaminated, spent_mass_g)
    select f.id, 'B' || g, (select id from strain_list where n = 1 + g % 10),
      (select id from substrate_recipes order by code limit 1 offset g % 2), (select id from treatments limit 1),
      date '2026-01-01' + (g % 150), 2300 + (g * 7919) % 500, 0.6 + ((g * 104729) % 50) / 1000.0, (g * 31) % 25 = 0,
      case when g % 3 = 0 then 1700 end
    from farms f cross join generate_series(1, ${BLOCKS_PER_FARM}) g;
    drop table strain_list;`);
  await superuser.query(`
    insert into harvests (farm_id, block_id, flush, harvested_on, fresh_mass_g)
    select b.farm_id, b.id, k, b.inoculated_on + 20 + 14 * k, round((400 - 60 * k + (hashtext(b.id::text || k) % 80))::numeric, 1)
    from blocks b cross join generate_series(1, ${FLUSHES}) k
    where not b.contaminated or k = 1;`);
  // As autovacuum would leave a real co-op's tables: statistics, visibility map and hint bits set.
  await superuser.query("vacuum analyze");
  const { rows } = await superuser.query<{ harvests: number }>("select count(*)::int as harvests from harvests");
  console.log(`  ${rows[0].harvests} harvests in ${ms(performance.now() - start)}`);
  return (await superuser.query<{ id: string }>("select id from farms order by name limit 1")).rows[0].id;
}

async function main() {
  // RHIZO_BENCH_REUSE=1 keeps an already generated co-op (run scripts/bench-pooled.ts directly).
  const existing = process.env.RHIZO_BENCH_REUSE
    ? (await superuser.query<{ id: string }>("select id from farms order by name limit 1")).rows[0]?.id
    : undefined;
  const farmId = existing ?? (await generate());
  if (existing) {
    // A co-op kept from an earlier run has its releases too; the first release is timed again from none.
    // Releases refuse to be removed; the superuser switches the refusing triggers off in its own transaction.
    await superuser.query(`begin; set local session_replication_role = replica;
      delete from pooled_release_strain_rows; delete from pooled_release_flush_rows; delete from pooled_release_drying_rows;
      delete from pooled_release_regime_rows; delete from pooled_releases; commit;`);
  }
  // The baseline writes its sums into a temp table as the analyst; no role has TEMPORARY on a
  // real database (migration 0011), so only this scratch one grants it.
  await superuser.query(`grant temporary on database "${database}" to rhizo_analyst`);

  const [fullRefresh, fullBare] = await timedSideBySide([
    () => analyst.query("select pooled_refresh_all()"),
    () => analyst.query(bareGroupBy("")),
  ]);

  // One farm sends a season log of 40 000 rows: all its harvests are replaced, then refreshed.
  await superuser.query("update harvests set fresh_mass_g = fresh_mass_g + 1 where farm_id = $1", [farmId]);
  const [oneRefresh, oneBare] = await timedSideBySide([
    () => analyst.query("select pooled_refresh_farm($1)", [farmId]),
    () => analyst.query(bareGroupBy(`where b.farm_id = '${farmId}'`)),
  ]);

  // (d) The co-op's first release of these statistics, then a scheduled attempt that finds nothing new (it plans and writes nothing).
  const firstStart = performance.now();
  const first = await cutSetupRelease();
  const firstCut = performance.now() - firstStart;
  if (first.outcome !== "cut") throw new Error(`The first release was not cut: ${first.outcome}`);
  const [nothingNew] = await timedSideBySide([() => cutSetupRelease()]);

  // What one results request computes: read the species' statistics and pool them, from the live
  // tables (as before releases) and from the release (as the app does now), side by side.
  const species = (await analyst.query<{ id: string }>("select id from species limit 1")).rows[0].id;
  const strains = (await analyst.query<{ id: string; name: string }>("select id, name from strains")).rows;
  const columns = `farm_id as "farmId", strain_id as "strainId", substrate_recipe_id as "substrateRecipeId", fruiting_method_id as "fruitingMethodId"`;
  const strainColumns = `${columns}, blocks, blocks_contaminated as "blocksContaminated", efficiency_blocks as "efficiencyBlocks",
    efficiency_sum as "efficiencySum", efficiency_squares as "efficiencySquares", efficiency_bins as "efficiencyBins",
    first_harvest_blocks as "firstHarvestBlocks", first_harvest_days_sum as "firstHarvestDaysSum"`;
  const flushColumns = `${columns}, flush, finished_blocks as "finishedBlocks", blocks_fruiting as "blocksFruiting", share_sum as "shareSum",
    share_squares as "shareSquares", cumulative_sum as "cumulativeSum", cumulative_squares as "cumulativeSquares"`;
  const pool = (rows: StrainStatisticsRow[], flushRows: FlushStatisticsRow[]) =>
    buildPooledResults({
      rows,
      flushRows,
      strains,
      filters: {},
      minimumFarms: 3,
      showPerFarmEstimates: false,
      viewerFarmId: farmId,
      random: seededRandom(1),
    });
  const fromLive = async () =>
    pool(
      (await analyst.query(`select ${strainColumns} from farm_strain_statistics where species_id = $1 and flush_window = 'all'`, [species]))
        .rows as StrainStatisticsRow[],
      (await analyst.query(`select ${flushColumns} from farm_flush_statistics where species_id = $1`, [species]))
        .rows as FlushStatisticsRow[],
    );
  const release = first.release.number;
  const fromRelease = async () =>
    roundPooledResults(
      pool(
        (
          await analyst.query(
            `select ${strainColumns} from pooled_release_strain_rows where release_number = $1 and species_id = $2 and flush_window = 'all'`,
            [release, species],
          )
        ).rows as StrainStatisticsRow[],
        (
          await analyst.query(`select ${flushColumns} from pooled_release_flush_rows where release_number = $1 and species_id = $2`, [
            release,
            species,
          ])
        ).rows as FlushStatisticsRow[],
      ),
    );
  const [liveTime, releaseTime] = await timedSideBySide([fromLive, fromRelease]);
  // The release holds every figure here (50 farms in each cell), so its figures are the live ones, rounded.
  const same = JSON.stringify(await fromRelease()) === JSON.stringify(roundPooledResults(await fromLive()));

  console.log("");
  console.log(`| measurement (median of ${RUNS}) | pooled refresh | bare GROUP BY, same sums | ratio |`);
  console.log("| --- | --- | --- | --- |");
  console.log(`| (a) one farm after a 40 000-row upload | ${ms(oneRefresh)} | ${ms(oneBare)} | ${(oneRefresh / oneBare).toFixed(2)}× |`);
  console.log(`| (b) full recompute, ${FARMS} farms | ${ms(fullRefresh)} | ${ms(fullBare)} | ${(fullRefresh / fullBare).toFixed(2)}× |`);
  console.log("");
  console.log("| measurement | from the live statistics (before releases) | from the release (now) |");
  console.log("| --- | --- | --- |");
  console.log(
    `| results for one species (read statistics + pool, no HTTP; median of ${RUNS}) | ${ms(liveTime)} | ${ms(releaseTime)} (with rounding) |`,
  );
  console.log(`| figures | | ${same ? "the same as the live ones, rounded" : "DIFFERENT from the live ones"} |`);
  console.log(`| (d) cutting the first release, ${FARMS} farms | | ${ms(firstCut)} |`);
  console.log(`| (d) a scheduled attempt with nothing new (plans, writes nothing; median of ${RUNS}) | | ${ms(nothingNew)} |`);

  if (!process.env.RHIZO_BENCH_SKIP_HTTP) await loadTest(species, farmId);
}

/**
 * (c) GET /api/results as a signed-in observer (pooled figures only) and as the manager of a
 * bench farm (their own 10 000 blocks overlaid), beside GET /icon.svg: a static file, the server's own floor.
 */
async function loadTest(species: string, farmId: string) {
  const password = "bench-person-password";
  const people = [
    { email: "bench-observer@bench.example", name: "Bench observer", role: "observer", farmId: null },
    { email: "bench-manager@bench.example", name: "Bench manager", role: "farm_manager", farmId },
  ];
  const passwordHash = await hashPassword(password);
  for (const person of people) {
    await superuser.query(
      "insert into users (email, name, role, farm_id, password_hash) values ($1, $2, $3, $4, $5) on conflict do nothing",
      [person.email, person.name, person.role, person.farmId, passwordHash],
    );
  }
  const app = await serveApp();
  try {
    const observerCookie = await signIn(app.url, people[0].email, password);
    const managerCookie = await signIn(app.url, people[1].email, password);
    const resultsUrl = `${app.url}/api/results?species=${species}&window=all`;
    const baseline = await load({ url: `${app.url}/icon.svg`, connections: 20, duration: 30, headers: { cookie: observerCookie } });
    const asObserver = await load({ url: resultsUrl, connections: 20, duration: 30, headers: { cookie: observerCookie } });
    const asManager = await load({ url: resultsUrl, connections: 20, duration: 30, headers: { cookie: managerCookie } });
    console.log("");
    console.log("| 20 clients, 30 s, loopback | requests/s | p50 | p95 | p97.5 | non-2xx |");
    console.log("| --- | --- | --- | --- | --- | --- |");
    const rows = [
      ["GET /api/results (50 farms), observer", asObserver],
      ["GET /api/results (50 farms), farm manager (own blocks overlaid)", asManager],
      ["GET /icon.svg (static file, same server)", baseline],
    ] as const;
    for (const [name, result] of rows) {
      console.log(
        `| ${name} | ${result.requests.average.toFixed(0)} | ${result.latency.p50} ms | ${result.p95.toFixed(0)} ms | ${result.latency.p97_5} ms | ${result.non2xx} |`,
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
  await analyst.end();
  await closeDatabase();
}
