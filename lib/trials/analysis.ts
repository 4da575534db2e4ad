import {
  StatsInputError,
  blockedAnova,
  describe,
  metaAnalysis,
  wilsonInterval,
  type AdjustedMean,
  type AnovaTerm,
  type Description,
  type PairwiseComparison,
  type ProportionInterval,
} from "@/lib/stats";
import { count } from "@/lib/words";

export interface TrialArmInfo {
  id: string;
  label: string;
  isReference: boolean;
  /** What the arm is, for the answer's words: its strain and, if any, its treatment (fruiting method …). */
  strainId?: string;
  strainName?: string;
  treatmentId?: string | null;
  treatmentName?: string | null;
}

/**
 * How the answer names an arm: by what it is, its letter in brackets for the block labels,
 * "Grey Morning with horizontal slits (arm B)"; just "arm B" when nothing else is known.
 */
export function armName(arm: Pick<TrialArmInfo, "label" | "strainName" | "treatmentName">): string {
  if (!arm.strainName) return `arm ${arm.label}`;
  const treatment = arm.treatmentName ? ` with ${lowerFirst(arm.treatmentName)}` : "";
  return `${arm.strainName}${treatment} (arm ${arm.label})`;
}

/** "Horizontal slits" reads "horizontal slits" inside a sentence; a code such as "PO-02" or "CO2 …" keeps its capitals. */
export function lowerFirst(name: string): string {
  return /^[A-Z][a-z]/.test(name) ? name[0].toLowerCase() + name.slice(1) : name;
}

const capitalised = (text: string) => text[0].toUpperCase() + text.slice(1);

/** One block's contribution: its farm (as an opaque key), arm, outcome (null = left out) and contamination. */
export interface OutcomeRecord {
  farm: string;
  armId: string;
  value: number | null;
  contaminated: boolean;
}

/**
 * Least-squares mean of `arm` − that of `versus` from the model outcome ~ arm + farm, in BE
 * points, with its standard error; interval and p-value Tukey-adjusted over all pairs of arms.
 */
export interface Difference {
  arm: string;
  versus: string;
  estimate: number;
  se: number;
  lower: number;
  upper: number;
  pAdjusted: number;
}

/** The model gives mean(earlier) − mean(later); each pair read as the later arm against the earlier one. */
export function laterAgainstEarlier(comparisons: readonly PairwiseComparison[]): Difference[] {
  return comparisons.map((pair) => ({
    arm: pair.b,
    versus: pair.a,
    estimate: -pair.difference,
    se: pair.se,
    lower: -pair.upper,
    upper: -pair.lower,
    pAdjusted: pair.pAdjusted,
  }));
}

export interface FarmDifference {
  farm: string;
  estimate: number;
  lower: number;
  upper: number;
}

export interface PooledDifference {
  arm: string;
  farms: FarmDifference[];
  pooled: { estimate: number; lower: number; upper: number; tau2: number; i2: number } | null;
  note: string | null;
}

export interface TrialAnalysis {
  referenceArm: string;
  farmsContributing: number;
  minimumFarms: number;
  enoughFarms: boolean;
  blocksAnalysed: number;
  blocksLeftOut: number;
  arms: {
    label: string;
    n: number;
    summary: Description | null;
    contamination: ProportionInterval & { contaminated: number; blocks: number };
  }[];
  anova: { arm: AnovaTerm; farm: AnovaTerm; adjustedMeans: AdjustedMean[] } | null;
  /**
   * How `versusReference` and `betweenArms` were made: "arm + farm" = from the least-squares means
   * of outcome ~ arm + farm with Tukey's adjustment, as R's pairs(emmeans(fit, "arm")). Results
   * stored before this field existed hold one-way Tukey–Kramer differences on pooled blocks.
   */
  differencesFrom?: "arm + farm";
  versusReference: Difference[];
  betweenArms: Difference[];
  farmPooling: PooledDifference[];
  notes: string[];
  answer: string;
}

const round1 = (x: number) => (Math.round(x * 10) / 10).toFixed(1);

function collectFarms(records: OutcomeRecord[]): string[] {
  return [...new Set(records.map((record) => record.farm))].sort((a, b) => a.localeCompare(b, "en", { numeric: true }));
}

/**
 * The trial's pre-declared analysis on per-block outcomes, all with lib/stats: blocked ANOVA
 * (arm + farm) with least-squares means and their Tukey-adjusted pairwise differences; per-farm
 * differences against the reference pooled by DerSimonian–Laird with I²; contamination by arm
 * with Wilson intervals; and the co-op's minimum-farms rule before any pooled figure is given.
 */
export function analyseTrial(input: { arms: TrialArmInfo[]; records: OutcomeRecord[]; minimumFarms: number }): TrialAnalysis {
  const { arms, records, minimumFarms } = input;
  const reference = arms.find((arm) => arm.isReference) ?? arms[0];
  const ordered = [reference, ...arms.filter((arm) => arm.id !== reference.id)];
  const labelOf = new Map(arms.map((arm) => [arm.id, arm.label]));
  const analysed = records.filter(
    (record): record is OutcomeRecord & { value: number } => record.value !== null && labelOf.has(record.armId),
  );
  const farms = collectFarms(analysed);
  const enoughFarms = farms.length >= minimumFarms;
  const notes: string[] = [];

  const armSummaries = ordered.map((arm) => {
    const values = analysed.filter((record) => record.armId === arm.id).map((record) => record.value);
    const all = records.filter((record) => record.armId === arm.id);
    const contaminated = all.filter((record) => record.contaminated).length;
    const interval = all.length ? wilsonInterval(contaminated, all.length) : { p: 0, lower: 0, upper: 0 };
    return {
      label: arm.label,
      n: values.length,
      summary: values.length >= 2 ? describe(values) : null,
      contamination: { ...interval, contaminated, blocks: all.length },
    };
  });

  let anova: TrialAnalysis["anova"] = null;
  let versusReference: Difference[] = [];
  let betweenArms: Difference[] = [];
  const farmPooling: PooledDifference[] = [];

  if (!enoughFarms) {
    notes.push(`Only ${count(farms.length, "farm")} reported outcomes; the co-op shows pooled figures only from ${minimumFarms} farms up.`);
  } else {
    try {
      // Rows in the arms' order (reference first), so the model's pairs come out as (earlier, later).
      const order = new Map(ordered.map((arm, index) => [arm.id, index]));
      const inArmOrder = [...analysed].sort((a, b) => order.get(a.armId)! - order.get(b.armId)!);
      const fit = blockedAnova(
        inArmOrder.map((record) => ({ treatment: labelOf.get(record.armId)!, block: record.farm, y: record.value })),
      );
      anova = { arm: fit.treatment, farm: fit.block, adjustedMeans: fit.means };
      const pairs = laterAgainstEarlier(fit.comparisons);
      versusReference = pairs.filter((pair) => pair.versus === reference.label);
      betweenArms = pairs.filter((pair) => pair.versus !== reference.label);
    } catch (error) {
      if (!(error instanceof StatsInputError)) throw error;
      notes.push(`The blocked analysis could not be fitted, so the arms are not compared: ${error.message}`);
    }
    for (const arm of ordered.slice(1)) farmPooling.push(poolFarmDifferences(arm, reference, farms, analysed));
  }

  return {
    referenceArm: reference.label,
    farmsContributing: farms.length,
    minimumFarms,
    enoughFarms,
    blocksAnalysed: analysed.length,
    blocksLeftOut: records.length - analysed.length,
    arms: armSummaries,
    anova,
    differencesFrom: "arm + farm",
    versusReference,
    betweenArms,
    farmPooling,
    notes,
    answer: plainAnswer(arms, reference.label, versusReference, enoughFarms, farms.length, minimumFarms),
  };
}

function poolFarmDifferences(
  arm: TrialArmInfo,
  reference: TrialArmInfo,
  farms: string[],
  analysed: (OutcomeRecord & { value: number })[],
): PooledDifference {
  const perFarm: (FarmDifference & { v: number })[] = [];
  for (const farm of farms) {
    const own = analysed.filter((record) => record.farm === farm && record.armId === arm.id).map((record) => record.value);
    const ref = analysed.filter((record) => record.farm === farm && record.armId === reference.id).map((record) => record.value);
    if (own.length < 2 || ref.length < 2) continue;
    const a = describe(own);
    const r = describe(ref);
    const v = (a.sd * a.sd) / a.n + (r.sd * r.sd) / r.n;
    if (!(v > 0)) continue;
    const estimate = a.mean - r.mean;
    const half = 1.959963984540054 * Math.sqrt(v);
    perFarm.push({ farm, estimate, lower: estimate - half, upper: estimate + half, v });
  }
  const shown = perFarm.map(({ farm, estimate, lower, upper }) => ({ farm, estimate, lower, upper }));
  if (perFarm.length < 2) {
    return {
      arm: arm.label,
      farms: shown,
      pooled: null,
      note: "Fewer than 2 farms ran both arms with 2 or more blocks each, so farms cannot be pooled.",
    };
  }
  const meta = metaAnalysis(perFarm.map((farm) => ({ y: farm.estimate, v: farm.v })));
  return {
    arm: arm.label,
    farms: shown,
    pooled: { estimate: meta.random.estimate, lower: meta.random.lower, upper: meta.random.upper, tau2: meta.random.tau2, i2: meta.i2 },
    note: null,
  };
}

/**
 * The plain-language answer from the differences against the reference arm, each arm named by its
 * strain and treatment (armName), so a reader need not look up what "arm B" was.
 */
export function plainAnswer(
  arms: readonly TrialArmInfo[],
  reference: string,
  differences: Difference[],
  enoughFarms: boolean,
  farms: number,
  minimumFarms: number,
): string {
  if (!enoughFarms) return `No answer yet: ${count(farms, "farm")} reported, and the co-op needs ${minimumFarms} before it pools.`;
  if (!differences.length) return "No answer: the arms could not be compared.";
  const nameOf = (label: string) => {
    const arm = arms.find((candidate) => candidate.label === label);
    return arm ? armName(arm) : `arm ${label}`;
  };
  const referenceName = `the reference, ${nameOf(reference)}`;
  return differences
    .map((difference) => {
      const name = capitalised(nameOf(difference.arm));
      const range = `${round1(difference.lower)} to ${round1(difference.upper)} BE points`;
      if (difference.lower > 0)
        return `${name} gave more than ${referenceName}: ${round1(difference.estimate)} BE points more (95 % interval ${range}).`;
      if (difference.upper < 0)
        return `${name} gave less than ${referenceName}: ${round1(-difference.estimate)} BE points less (95 % interval ${range}).`;
      return `${name} and ${referenceName} could not be told apart: the difference was ${round1(difference.estimate)} BE points (95 % interval ${range}).`;
    })
    .join(" ");
}
