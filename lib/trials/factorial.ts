import { StatsInputError, factorialAnova, type AnovaTerm, type FactorialObservation, type PairwiseComparison } from "@/lib/stats";
import { lowerFirst, type OutcomeRecord } from "./analysis";
import { count } from "@/lib/words";

/** One level of a trial factor, e.g. the strain "Valley Wild" or the fruiting method "Horizontal slits". */
export interface FactorLevel {
  id: string;
  /** As it starts a sentence or heads a column: "Horizontal slits". */
  label: string;
  /** As it reads inside a sentence, when that differs from the label: "an opened top". */
  inSentence?: string;
}

export interface TrialFactor {
  /** Singular, as it reads in a sentence: "strain", "fruiting method". */
  name: string;
  /** "strains", "fruiting methods". */
  plural: string;
  /** Two or more levels; the first is the reference the others are compared with. */
  levels: FactorLevel[];
}

/**
 * A trial whose arms cross two factors: every arm is one level of each, and every combination of
 * levels is exactly one arm. The first factor leads the answer (it is the trial's main question).
 */
export interface FactorialDesign {
  factors: [TrialFactor, TrialFactor];
  arms: { armId: string; levels: [string, string] }[];
}

/** What is wrong with a factorial design, in words a coordinator can act on; empty when it is sound. */
export function factorialDesignProblems(design: FactorialDesign): string[] {
  const problems: string[] = [];
  design.factors.forEach((factor) => {
    if (factor.levels.length < 2) problems.push(`Give the ${factor.name} at least two levels to compare.`);
    if (new Set(factor.levels.map((level) => level.id)).size !== factor.levels.length) {
      problems.push(`A ${factor.name} is listed twice; list each once.`);
    }
  });
  const [first, second] = design.factors;
  const seen = new Map<string, string>();
  for (const arm of design.arms) {
    const a = first.levels.find((level) => level.id === arm.levels[0]);
    const b = second.levels.find((level) => level.id === arm.levels[1]);
    if (!a || !b) {
      problems.push(`An arm is not one ${first.name} and one ${second.name} of the design; choose a level of each.`);
      continue;
    }
    const key = `${a.id}\u0000${b.id}`;
    if (seen.has(key)) problems.push(`Two arms are both ${a.label} with ${b.label}; each combination is one arm.`);
    seen.set(key, arm.armId);
  }
  for (const a of first.levels) {
    for (const b of second.levels) {
      if (!seen.has(`${a.id}\u0000${b.id}`))
        problems.push(`No arm is ${a.label} with ${b.label}; a crossed trial needs every combination.`);
    }
  }
  return problems;
}

/** Level − versus, in BE points, from least-squares means of the factorial model; Tukey-adjusted within its family. */
export interface FactorialComparison {
  /** Labels of the two levels, and their ids in the design. */
  level: string;
  versus: string;
  levelId: string;
  versusId: string;
  estimate: number;
  se: number;
  lower: number;
  upper: number;
  pAdjusted: number;
}

export interface FactorialTrialAnalysis {
  /** The two factors' names, in the design's order. */
  factors: [string, string];
  farmsContributing: number;
  minimumFarms: number;
  enoughFarms: boolean;
  blocksAnalysed: number;
  blocksLeftOut: number;
  /** BE ~ first + second + first × second + farm, type II; null below the minimum farms or when it cannot be fitted. */
  anova: {
    first: AnovaTerm;
    second: AnovaTerm;
    interaction: AnovaTerm;
    farm: AnovaTerm;
    residual: { df: number; ss: number; ms: number };
  } | null;
  /** Least-squares mean BE (%) of each combination, averaged over farms with equal weight; `blocks` analysed. */
  cellMeans: { levels: [string, string]; blocks: number; estimate: number; lower: number; upper: number }[];
  /** Each factor's levels compared pair by pair, averaged over the other factor's levels. */
  mainEffects: [FactorialComparison[], FactorialComparison[]];
  /** The first factor's levels within each level of the second, and the second's within each of the first. */
  simpleEffects: [{ within: string; comparisons: FactorialComparison[] }[], { within: string; comparisons: FactorialComparison[] }[]];
  /** p of the interaction below `interactionLevel`: the answer then compares within levels, not averaged. */
  interactionMaterial: boolean;
  interactionLevel: number;
  notes: string[];
  answer: string;
}

/**
 * The pre-declared analysis of a crossed trial (e.g. two strains × two fruiting methods) on the
 * same per-block outcomes as analyseTrial: lib/stats factorialAnova with farm as block. The answer
 * names the levels ("Horizontal slits gave 6 BE points more than an opened top, across both
 * strains (95 % interval 2 to 10)"), never arm letters. Interactions are tested with less power
 * than main effects, so the threshold at which one counts as material is looser than 5 % by
 * default (10 %, common practice); the protocol may declare another.
 *
 * analyseTrial still gives what does not depend on the crossing: blocks and contamination by arm,
 * the farm-by-farm pooling of each arm against the reference.
 */
export function analyseFactorialTrial(input: {
  design: FactorialDesign;
  records: OutcomeRecord[];
  minimumFarms: number;
  level?: number;
  interactionLevel?: number;
}): FactorialTrialAnalysis {
  const { design, records, minimumFarms } = input;
  const level = input.level ?? 0.95;
  const interactionLevel = input.interactionLevel ?? 0.1;
  const [first, second] = design.factors;
  const armLevels = new Map(design.arms.map((arm) => [arm.armId, arm.levels]));
  const position = (factor: TrialFactor, id: string) => factor.levels.findIndex((candidate) => candidate.id === id);
  const analysed = records.flatMap((record) => {
    const levels = armLevels.get(record.armId);
    return levels && record.value !== null ? [{ farm: record.farm, levels, value: record.value }] : [];
  });
  const farms = new Set(analysed.map((record) => record.farm)).size;
  const enoughFarms = farms >= minimumFarms;
  const notes: string[] = [];
  const empty: FactorialTrialAnalysis = {
    factors: [first.name, second.name],
    farmsContributing: farms,
    minimumFarms,
    enoughFarms,
    blocksAnalysed: analysed.length,
    blocksLeftOut: records.length - analysed.length,
    anova: null,
    cellMeans: [],
    mainEffects: [[], []],
    simpleEffects: [[], []],
    interactionMaterial: false,
    interactionLevel,
    notes,
    answer: "",
  };
  const problems = factorialDesignProblems(design);
  if (problems.length) {
    notes.push(...problems);
    return { ...empty, answer: "No answer: the arms do not form a complete crossing of the two factors." };
  }
  if (!enoughFarms) {
    notes.push(`Only ${count(farms, "farm")} reported outcomes; the co-op shows pooled figures only from ${minimumFarms} farms up.`);
    return {
      ...empty,
      answer: `No answer yet: ${count(farms, "farm")} reported, and the co-op needs ${minimumFarms} before it pools.`,
    };
  }

  // Rows in the design's level order, so the model sees each factor's reference first.
  const observations: FactorialObservation[] = analysed
    .map(({ farm, levels: [a, b], value }) => ({
      a,
      b,
      block: farm,
      y: value,
      order: position(first, a) * second.levels.length + position(second, b),
    }))
    .sort((x, y) => x.order - y.order)
    .map(({ a, b, block, y }) => ({ a, b, block, y }));
  let fit: ReturnType<typeof factorialAnova>;
  try {
    fit = factorialAnova(observations, level);
  } catch (error) {
    if (!(error instanceof StatsInputError)) throw error;
    notes.push(`The factorial analysis could not be fitted: ${error.message}`);
    return { ...empty, answer: "No answer: the factorial analysis could not be fitted (see the notes)." };
  }

  const labelOf = (factor: TrialFactor, id: string) => levelOf(factor, id).label;
  // The model gives mean(earlier) − mean(later); read each pair as the later level against the earlier one.
  const read = (factor: TrialFactor, pairs: PairwiseComparison[]): FactorialComparison[] =>
    pairs.map((pair) => ({
      level: labelOf(factor, pair.b),
      versus: labelOf(factor, pair.a),
      levelId: pair.b,
      versusId: pair.a,
      estimate: -pair.difference,
      se: pair.se,
      lower: -pair.upper,
      upper: -pair.lower,
      pAdjusted: pair.pAdjusted,
    }));
  const blocksIn = (a: string, b: string) => observations.filter((o) => o.a === a && o.b === b).length;
  const analysis: FactorialTrialAnalysis = {
    ...empty,
    anova: { first: fit.a, second: fit.b, interaction: fit.interaction, farm: fit.block, residual: fit.residual },
    cellMeans: fit.cellMeans.map((cell) => ({
      levels: [labelOf(first, cell.a), labelOf(second, cell.b)],
      blocks: blocksIn(cell.a, cell.b),
      estimate: cell.estimate,
      lower: cell.lower,
      upper: cell.upper,
    })),
    mainEffects: [read(first, fit.aComparisons), read(second, fit.bComparisons)],
    simpleEffects: [
      fit.aWithinB.map((group) => ({ within: labelOf(second, group.b), comparisons: read(first, group.comparisons) })),
      fit.bWithinA.map((group) => ({ within: labelOf(first, group.a), comparisons: read(second, group.comparisons) })),
    ],
    interactionMaterial: fit.interaction.p < interactionLevel,
  };
  analysis.answer = factorialAnswer(design, analysis, fit.interaction, level);
  return analysis;
}

/** The level of `factor` with this id (the design was checked, so it is there). */
function levelOf(factor: TrialFactor, id: string): FactorLevel {
  const found = factor.levels.find((candidate) => candidate.id === id);
  if (!found) throw new Error(`Level ${id} is not in the ${factor.name} factor.`);
  return found;
}

const whole = (x: number) => String(Math.round(x));
const beGap = (x: number) => `${whole(Math.abs(x))} BE point${Math.round(Math.abs(x)) === 1 ? "" : "s"}`;
const pText = (p: number) => (p < 0.001 ? "p < 0.001" : `p = ${p.toFixed(3)}`);

function inSentence(level: FactorLevel): string {
  return level.inSentence ?? level.label;
}

/**
 * "Horizontal slits gave 6 BE points more than an opened top, across both strains (95 % interval
 * 2 to 10)." `subject` is how the level is written where the sentence needs it.
 */
function comparisonClause(
  subject: string,
  versus: FactorLevel,
  comparison: FactorialComparison,
  setting: string,
  interval: string,
): string {
  const range = `(${interval} ${whole(comparison.lower)} to ${whole(comparison.upper)})`;
  if (Math.round(comparison.estimate) === 0) return `${subject} gave about the same BE as ${inSentence(versus)}${setting} ${range}`;
  const direction = comparison.estimate > 0 ? "more" : "fewer";
  const clause = `${subject} gave ${beGap(comparison.estimate)} ${direction} than ${inSentence(versus)}${setting} ${range}`;
  return comparison.lower <= 0 && comparison.upper >= 0
    ? `${clause}, which includes no difference, so the data cannot tell them apart`
    : clause;
}

function factorialAnswer(design: FactorialDesign, analysis: FactorialTrialAnalysis, interaction: AnovaTerm, level: number): string {
  const [first, second] = design.factors;
  const percent = `${Math.round(level * 100)} %`;
  const interval = (factor: TrialFactor) =>
    factor.levels.length > 2
      ? `${percent} interval, allowing for comparing ${factor.levels.length} ${factor.plural},`
      : `${percent} interval`;
  const againstReference = (factor: TrialFactor, comparisons: FactorialComparison[]) =>
    comparisons.filter((comparison) => comparison.versusId === factor.levels[0].id);
  const across = (other: TrialFactor) =>
    other.levels.length === 2 ? `, across both ${other.plural}` : `, across all ${other.levels.length} ${other.plural}`;

  if (!analysis.interactionMaterial) {
    const sentences = ([0, 1] as const).flatMap((index) => {
      const factor = design.factors[index];
      const other = design.factors[1 - index];
      return againstReference(factor, analysis.mainEffects[index]).map(
        (comparison) =>
          `${comparisonClause(levelOf(factor, comparison.levelId).label, factor.levels[0], comparison, across(other), interval(factor))}.`,
      );
    });
    sentences.push(
      `The difference between ${first.plural} did not clearly depend on the ${second.name} (interaction ${pText(interaction.p)}), so each is given averaged over the other.`,
    );
    return sentences.join(" ");
  }
  const within = analysis.simpleEffects[0].map((group) => {
    const clauses = againstReference(first, group.comparisons).map((comparison) =>
      comparisonClause(inSentence(levelOf(first, comparison.levelId)), first.levels[0], comparison, "", interval(first)),
    );
    return `with ${group.within}, ${clauses.join("; ")}`;
  });
  return `The best ${first.name} depends on the ${second.name} (interaction ${pText(interaction.p)}), so ${first.plural} are compared within each ${second.name}: ${within.join("; ")}.`;
}

/**
 * The factorial design read off a trial's arms, when they cross their strains with their
 * treatments (every strain with every treatment, one arm each); null otherwise. `second` names
 * the treatment factor, e.g. { name: "fruiting method", plural: "fruiting methods" }.
 */
export function factorialDesignFromArms(
  arms: readonly {
    id: string;
    isReference: boolean;
    strain: { id: string; name: string };
    treatment: { id: string; name: string } | null;
  }[],
  second: { name: string; plural: string },
  options: { lead?: "strain" | "treatment" } = {},
): FactorialDesign | null {
  const paired = arms.flatMap((arm) => (arm.treatment ? [{ ...arm, treatment: arm.treatment }] : []));
  if (paired.length !== arms.length || paired.length === 0) return null;
  const reference = paired.find((arm) => arm.isReference) ?? paired[0];
  const levels = (pick: (arm: (typeof paired)[number]) => { id: string; name: string }, lower: boolean) => {
    const byId = new Map<string, FactorLevel>();
    for (const arm of [reference, ...paired]) {
      const { id, name } = pick(arm);
      byId.set(id, lower && lowerFirst(name) !== name ? { id, label: name, inSentence: lowerFirst(name) } : { id, label: name });
    }
    return [...byId.values()];
  };
  const strain: TrialFactor = { name: "strain", plural: "strains", levels: levels((arm) => arm.strain, false) };
  // A method's name reads in lower case inside a sentence ("than opened top"); a strain's is a name and keeps its capitals.
  const treatment: TrialFactor = { ...second, levels: levels((arm) => arm.treatment, true) };
  const treatmentLeads = options.lead === "treatment";
  const design: FactorialDesign = {
    factors: treatmentLeads ? [treatment, strain] : [strain, treatment],
    arms: paired.map((arm) => ({
      armId: arm.id,
      levels: treatmentLeads ? [arm.treatment.id, arm.strain.id] : [arm.strain.id, arm.treatment.id],
    })),
  };
  const crossed = design.factors.every((factor) => factor.levels.length >= 2) && factorialDesignProblems(design).length === 0;
  return crossed ? design : null;
}

/**
 * What is wrong with a trial's arms declared as strains crossed with fruiting methods, in words a
 * coordinator can act on (factorialDesignProblems on the arms' strains and treatments): every arm
 * needs a fruiting method, and every strain must meet every method in exactly one arm. `strains`
 * and `treatments` give the names the messages use.
 */
export function crossedArmsProblems(
  arms: readonly { label: string; strainId: string; treatmentId: string | null }[],
  strains: readonly { id: string; name: string }[],
  treatments: readonly { id: string; name: string; kind?: string }[],
): string[] {
  const problems: string[] = [];
  for (const arm of arms) {
    const treatment = treatments.find((candidate) => candidate.id === arm.treatmentId);
    if (!treatment)
      problems.push(`Arm ${arm.label}: pick its fruiting method; in a crossed trial every arm is one strain with one method.`);
    else if (treatment.kind && treatment.kind !== "fruiting_method")
      problems.push(`Arm ${arm.label}: ${treatment.name} is not a fruiting method; a crossed trial crosses strains with fruiting methods.`);
  }
  if (problems.length) return problems;
  const levels = (ids: string[], names: readonly { id: string; name: string }[]) =>
    [...new Set(ids)].map((id) => ({ id, label: names.find((candidate) => candidate.id === id)?.name ?? id }));
  return factorialDesignProblems({
    factors: [
      {
        name: "strain",
        plural: "strains",
        levels: levels(
          arms.map((arm) => arm.strainId),
          strains,
        ),
      },
      {
        name: "fruiting method",
        plural: "fruiting methods",
        levels: levels(
          arms.map((arm) => arm.treatmentId!),
          treatments,
        ),
      },
    ],
    arms: arms.map((arm) => ({ armId: arm.label, levels: [arm.strainId, arm.treatmentId!] })),
  });
}

/** One arm per combination of the strains and methods picked, strains outer, labelled A, B, …; the first combination is the reference. */
export function crossedArms(strainIds: readonly string[], treatmentIds: readonly string[]) {
  return strainIds.flatMap((strainId, i) =>
    treatmentIds.map((treatmentId, j) => {
      const index = i * treatmentIds.length + j;
      return { label: String.fromCharCode(65 + index), strainId, treatmentId, isReference: index === 0 };
    }),
  );
}
