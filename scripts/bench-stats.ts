// Times the co-op's pooled analyses on a season-sized synthetic data set, next to the
// cheapest thing that touches every row (a per-group mean loop), so the ratio shows what
// the statistics cost on top of reading the data. Prints figures only; asserts nothing.
import { performance } from "node:perf_hooks";
import { blockedAnova, blockedAnovaFromCells, metaAnalysis, type BlockedAnovaCell, type BlockedAnovaObservation } from "../lib/stats";
import { seededRandom } from "../lib/random";

const FARMS = 50;
const STRAINS = 10;
const BLOCKS_PER_STRAIN = 200;
const RUNS = 7;

function season(): BlockedAnovaObservation[] {
  const random = seededRandom(20240601);
  const strainEffect = Array.from({ length: STRAINS }, (_, s) => 4 * s - 18);
  const obs: BlockedAnovaObservation[] = [];
  for (let farm = 0; farm < FARMS; farm++) {
    const farmEffect = random.normal(0, 15);
    for (let strain = 0; strain < STRAINS; strain++) {
      for (let block = 0; block < BLOCKS_PER_STRAIN; block++) {
        obs.push({
          treatment: `strain ${strain + 1}`,
          block: `farm ${farm + 1}`,
          y: 75 + farmEffect + strainEffect[strain] + random.normal(0, 12),
        });
      }
    }
  }
  return obs;
}

function groupMeans(obs: BlockedAnovaObservation[]): Map<string, number> {
  const sums = new Map<string, { total: number; count: number }>();
  for (const o of obs) {
    const key = `${o.block}\u0000${o.treatment}`;
    const entry = sums.get(key);
    if (entry) {
      entry.total += o.y;
      entry.count++;
    } else {
      sums.set(key, { total: o.y, count: 1 });
    }
  }
  const means = new Map<string, number>();
  for (const [key, { total, count }] of sums) means.set(key, total / count);
  return means;
}

// Each farm's difference of every strain from strain 1 with its sampling variance, then
// one random-effects pooling per strain: what farms would share instead of their rows.
function pooledStrainDifferences(obs: BlockedAnovaObservation[]) {
  const cells = new Map<string, { n: number; sum: number; sumSq: number }>();
  for (const o of obs) {
    const key = `${o.block}\u0000${o.treatment}`;
    const cell = cells.get(key) ?? { n: 0, sum: 0, sumSq: 0 };
    cell.n++;
    cell.sum += o.y;
    cells.set(key, cell);
  }
  for (const o of obs) {
    const cell = cells.get(`${o.block}\u0000${o.treatment}`);
    if (cell) {
      const d = o.y - cell.sum / cell.n;
      cell.sumSq += d * d;
    }
  }
  const results = [];
  for (let strain = 2; strain <= STRAINS; strain++) {
    const studies = [];
    for (let farm = 1; farm <= FARMS; farm++) {
      const a = cells.get(`farm ${farm}\u0000strain ${strain}`);
      const b = cells.get(`farm ${farm}\u0000strain 1`);
      if (!a || !b) continue;
      studies.push({
        y: a.sum / a.n - b.sum / b.n,
        v: a.sumSq / (a.n - 1) / a.n + b.sumSq / (b.n - 1) / b.n,
      });
    }
    results.push(metaAnalysis(studies));
  }
  return results;
}

function median(xs: number[]): number {
  const sorted = [...xs].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

function time<T>(run: () => T): { ms: number; result: T } {
  let result = run();
  const times: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    const start = performance.now();
    result = run();
    times.push(performance.now() - start);
  }
  return { ms: median(times), result };
}

// Each farm × strain cell's count, mean and sum of squares, as Co-op results receives them.
function cellSummaries(obs: BlockedAnovaObservation[]): BlockedAnovaCell[] {
  const cells = new Map<string, BlockedAnovaCell & { ys: number[] }>();
  for (const o of obs) {
    const key = `${o.block}\u0000${o.treatment}`;
    const cell = cells.get(key) ?? { treatment: o.treatment, block: o.block, n: 0, mean: 0, sumOfSquares: 0, ys: [] };
    cell.ys.push(o.y);
    cells.set(key, cell);
  }
  return [...cells.values()].map(({ ys, ...cell }) => {
    const mean = ys.reduce((a, b) => a + b, 0) / ys.length;
    return { ...cell, n: ys.length, mean, sumOfSquares: ys.reduce((sum, y) => sum + (y - mean) ** 2, 0) };
  });
}

const obs = season();
const cells = cellSummaries(obs);
const naive = time(() => groupMeans(obs));
const blocked = time(() => blockedAnova(obs));
const fromCells = time(() => blockedAnovaFromCells(cells));
const pooled = time(() => pooledStrainDifferences(obs));

console.log(
  `Data: ${FARMS} farms × ${STRAINS} strains × ${BLOCKS_PER_STRAIN} blocks = ${obs.length} blocks; median of ${RUNS} runs after one warm-up.`,
);
console.log("");
const rows: [string, number][] = [
  ["per-group mean loop (naive)", naive.ms],
  ["blockedAnova (strain + farm)", blocked.ms],
  [`the same from ${cells.length} cell sums`, fromCells.ms],
  ["metaAnalysis of farm differences", pooled.ms],
];
console.log(`${"task".padEnd(36)}${"ms".padStart(10)}${"× naive".padStart(10)}`);
for (const [name, ms] of rows) {
  console.log(`${name.padEnd(36)}${ms.toFixed(2).padStart(10)}${(ms / naive.ms).toFixed(2).padStart(10)}`);
}
console.log("");
const strongest = blocked.result.means.reduce((best, m) => (m.estimate > best.estimate ? m : best));
console.log(
  `Check: strain F = ${blocked.result.treatment.f.toFixed(1)} on ${blocked.result.treatment.df} and ${blocked.result.residual.df} df; ` +
    `best ${strongest.treatment} at ${strongest.estimate.toFixed(2)} % BE [${strongest.lower.toFixed(2)}, ${strongest.upper.toFixed(2)}]; ` +
    `strain 10 − strain 1 farm-adjusted ${(-blocked.result.comparisons.find((c) => c.a === "strain 1" && c.b === "strain 10")!.difference).toFixed(2)} (Tukey p ${fromCells.result.comparisons[8].pAdjusted.toExponential(1)}), ` +
    `pooled over farms ${pooled.result[STRAINS - 2].random.estimate.toFixed(2)} (simulated 36), I² ${pooled.result[STRAINS - 2].i2.toFixed(1)} %; ` +
    `${naive.result.size} farm × strain cells.`,
);
