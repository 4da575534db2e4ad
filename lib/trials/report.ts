import { binsOf, publishableSpread, suppressedMessage, type Spread } from "@/lib/pooled";
import type { Random } from "@/lib/random";
import type { ProportionInterval } from "@/lib/stats";
import {
  analyseTrial,
  plainAnswer,
  type FarmDifference,
  type OutcomeRecord,
  type PooledDifference,
  type TrialAnalysis,
  type TrialArmInfo,
} from "./analysis";
import type { TrialDesignKind } from "./design-kind";
import { analyseFactorialTrial, factorialDesignFromArms, type FactorialTrialAnalysis } from "./factorial";
import { exclusionReasons, trialOutcomeRecords, type ClassifiedOutcomeRecord, type ExclusionReason } from "./outcome";
import { analyseRoomTrial, type PublishedRoomAnalysis } from "./room-analysis";
import { crossingOf, trialSampleSize } from "./sample-size";

/** One arm as a published report shows it: each figure only with the co-op's minimum number of farms behind it. */
export interface PublishedArm {
  label: string;
  /** Blocks analysed in the arm, or null where fewer than the minimum number of farms ran it. */
  n: number | null;
  /** 10th–90th percentiles of block BE for the boxplot, each with enough blocks beyond it (lib/pooled/bins.ts); null when too few. */
  spread: Spread | null;
  contamination: (ProportionInterval & { contaminated: number; blocks: number }) | null;
  /** Why the arm's figures are withheld, when they are. */
  withheld: string | null;
}

/** A farm's row in a farm-by-farm chart, under the pseudonym the report drew for it; `own` marks the reading farm's row. */
export interface PublishedFarmDifference extends FarmDifference {
  own?: boolean;
}

export interface PublishedPooledDifference extends Omit<PooledDifference, "farms"> {
  farms: PublishedFarmDifference[];
}

/** What a trial report publishes: the analysis with every single farm and single block taken out. */
export interface PublishedTrialAnalysis extends Omit<TrialAnalysis, "arms" | "farmPooling" | "blocksAnalysed" | "blocksLeftOut"> {
  /** Null where fewer than the minimum number of farms reported: one farm's block counts are its own. */
  blocksAnalysed: number | null;
  blocksLeftOut: number | null;
  arms: PublishedArm[];
  farmPooling: PublishedPooledDifference[];
  /** Whether other farms' rows appear (anonymised) in the farm-by-farm charts. */
  perFarmRows: boolean;
}

/** A farm's pseudonym in one trial's report and its own estimates, to be kept where only that farm can read them. */
export interface TrialReportFarm {
  farmKey: string;
  pseudonym: string;
  ownEstimates: { arm: string; estimate: number; lower: number; upper: number }[];
}

/** "Farm A" … "Farm Z", then "Farm A2" …: names that say nothing about which farm is which. */
export function pseudonymAt(index: number): string {
  return `Farm ${String.fromCharCode(65 + (index % 26))}${index >= 26 ? Math.floor(index / 26) + 1 : ""}`;
}

const farmsOf = (records: readonly OutcomeRecord[]) => new Set(records.map((record) => record.farm)).size;

/**
 * Takes from a trial's analysis everything that could show one farm or one block, before it is
 * stored and published:
 * - an arm's figures (block count, spread, contamination, its mean and its differences) only
 *   where at least the minimum number of farms ran it, and none at all below that for the trial:
 *   a trial analysed on one farm publishes none of its counts;
 * - boxplot percentiles only with at least three blocks at or beyond each, read from whole-point
 *   bins, so no drawn value is a single block's BE (whiskers are never the extremes);
 * - a pooled farm-by-farm estimate only from the minimum number of farms;
 * - other farms' rows only when the co-op allows them and the trial has the minimum number of
 *   farms, under pseudonyms drawn at random for this trial (`random` must be seeded unpredictably
 *   by the caller) and listed in pseudonym order, which therefore says nothing either.
 * Each farm's pseudonym and own estimates come back apart, to be stored where only that farm
 * reads them. `records` carry the opaque farm keys the analysis ran on.
 */
export function discloseTrialAnalysis(
  analysis: TrialAnalysis,
  input: {
    arms: readonly TrialArmInfo[];
    records: readonly OutcomeRecord[];
    minimumFarms: number;
    showPerFarmEstimates: boolean;
    random: Random;
  },
): { report: PublishedTrialAnalysis; farms: TrialReportFarm[] } {
  const { minimumFarms } = input;
  const few = suppressedMessage(minimumFarms);
  const enough = analysis.enoughFarms;
  const armByLabel = new Map(input.arms.map((arm) => [arm.label, arm]));

  const withheldArms = new Set<string>();
  const arms: PublishedArm[] = analysis.arms.map((arm) => {
    const armId = armByLabel.get(arm.label)?.id;
    const all = input.records.filter((record) => record.armId === armId);
    const analysed = all.filter((record): record is OutcomeRecord & { value: number } => record.value !== null);
    const withheld = !enough || farmsOf(analysed) < minimumFarms ? few : null;
    if (withheld) withheldArms.add(arm.label);
    return {
      label: arm.label,
      n: withheld ? null : analysed.length,
      spread: withheld ? null : publishableSpread(binsOf(analysed.map((record) => record.value))),
      contamination: enough && farmsOf(all) >= minimumFarms ? arm.contamination : null,
      withheld,
    };
  });
  const shown = (label: string) => !withheldArms.has(label);

  const pseudonym = new Map(
    input.random.shuffle([...new Set(input.records.map((record) => record.farm))]).map((key, index) => [key, pseudonymAt(index)]),
  );
  const perFarmRows = input.showPerFarmEstimates && enough;
  const farmPooling = analysis.farmPooling
    .filter((pooling) => shown(pooling.arm))
    .map((pooling) => {
      const enoughFarmsPooled = pooling.farms.length >= minimumFarms;
      return {
        ...pooling,
        farms: perFarmRows
          ? pooling.farms
              .map((farm) => ({ ...farm, farm: pseudonym.get(farm.farm)! }))
              .sort((a, b) => a.farm.localeCompare(b.farm, "en", { numeric: true }))
          : [],
        pooled: enoughFarmsPooled ? pooling.pooled : null,
        note: enoughFarmsPooled
          ? pooling.note
          : `Fewer than ${minimumFarms} farms ran both arms with 2 or more blocks each, so farms are not pooled.`,
      };
    });

  const versusReference = analysis.versusReference.filter((row) => shown(row.arm) && shown(row.versus));
  const withheldNote =
    withheldArms.size && enough
      ? [
          `Arm${withheldArms.size === 1 ? "" : "s"} ${[...withheldArms].join(", ")}: run on fewer than ${minimumFarms} farms, so ${withheldArms.size === 1 ? "its" : "their"} figures are not published.`,
        ]
      : [];
  const report: PublishedTrialAnalysis = {
    ...analysis,
    blocksAnalysed: enough ? analysis.blocksAnalysed : null,
    blocksLeftOut: enough ? analysis.blocksLeftOut : null,
    arms,
    anova: analysis.anova
      ? { ...analysis.anova, adjustedMeans: analysis.anova.adjustedMeans.filter((mean) => shown(mean.treatment)) }
      : null,
    versusReference,
    betweenArms: analysis.betweenArms.filter((row) => shown(row.arm) && shown(row.versus)),
    farmPooling,
    notes: [...analysis.notes, ...withheldNote],
    answer:
      withheldArms.size && enough
        ? plainAnswer(input.arms, analysis.referenceArm, versusReference, enough, analysis.farmsContributing, minimumFarms)
        : analysis.answer,
    perFarmRows,
  };

  const farms: TrialReportFarm[] = [...pseudonym].map(([farmKey, name]) => ({
    farmKey,
    pseudonym: name,
    ownEstimates: farmPooling.flatMap((pooling) => {
      const own = analysis.farmPooling.find((entry) => entry.arm === pooling.arm)?.farms.find((farm) => farm.farm === farmKey);
      return own ? [{ arm: pooling.arm, estimate: own.estimate, lower: own.lower, upper: own.upper }] : [];
    }),
  }));
  return { report, farms };
}

/**
 * The report as one farm's people read it: their own row marked in each farm-by-farm chart (added
 * from their own estimates when other farms' rows are not shown), nobody else's.
 */
export function markOwnFarm(report: PublishedTrialAnalysis, own: Omit<TrialReportFarm, "farmKey"> | null): PublishedTrialAnalysis {
  if (!own) return report;
  return {
    ...report,
    farmPooling: report.farmPooling.map((pooling) => {
      if (report.perFarmRows)
        return { ...pooling, farms: pooling.farms.map((farm) => (farm.farm === own.pseudonym ? { ...farm, own: true } : farm)) };
      const mine = own.ownEstimates.find((estimate) => estimate.arm === pooling.arm);
      return mine
        ? { ...pooling, farms: [{ farm: "Your farm", estimate: mine.estimate, lower: mine.lower, upper: mine.upper, own: true }] }
        : pooling;
    }),
  };
}

/** One arm's blocks in "Deviations from the plan": counts only, null where fewer than the minimum number of farms ran the arm. */
export interface ArmDeviation {
  label: string;
  counts: {
    listed: number;
    inSeasonLog: number;
    /** Blocks in the BE comparison: the achieved sample size. */
    analysed: number;
    /** Of those, contaminated blocks counted as 0 %, as declared. */
    countedAsZero: number;
    leftOut: Record<ExclusionReason, number>;
  } | null;
}

/** The planned sample size from the design (80 % power, lib/trials/sample-size.ts) beside what was achieved. */
export interface PlannedAndAchieved {
  farmsPlanned: number | null;
  farmsTakingPart: number;
  /** Null where fewer than the minimum number of farms reported. */
  farmsContributing: number | null;
  /** Blocks per arm the comparison needs for 80 % power, and to make once the expected loss is allowed for; null when the design gave no figures. */
  blocksPerArmNeeded: number | null;
  blocksPerArmToMake: number | null;
}

/** What is stored on the trial when it closes, and shown once published: only what the report may show. */
export interface StoredTrialResults {
  analysis: PublishedTrialAnalysis;
  /**
   * For a trial crossing strains with fruiting methods: the two factors, their interaction and
   * simple effects (lib/trials/factorial.ts); its answer is then `analysis.answer`. Absent for a
   * one-factor trial and for results stored before trials could cross two factors.
   */
  factorial?: FactorialTrialAnalysis;
  /**
   * For a trial whose rooms were drawn to climate regimes: the room-mean analysis (farm as block),
   * rooms per arm and the observed ICC; its answer is then `analysis.answer`, and the block-level
   * comparisons (which would count blocks sharing a room as independent) are not published.
   */
  rooms?: PublishedRoomAnalysis;
  /** Block counts are null where fewer than the minimum number of farms reported. */
  deviations: {
    farmsDropped: number;
    farmsDeclined: number;
    blocksAssigned: number;
    blocksMade: number | null;
    blocksLeftOut: number | null;
    /** Every block left out, by reason and arm (absent from results stored before blocks were classified on closing). */
    byArm?: ArmDeviation[];
    plan?: PlannedAndAchieved;
  };
  analysedAt: string;
}

/** Per arm: listed, in a season log, analysed, left out by reason; withheld below the minimum number of farms, like every arm figure. */
function armDeviations(
  arms: readonly TrialArmInfo[],
  records: readonly ClassifiedOutcomeRecord[],
  assignedByArm: Readonly<Record<string, number>>,
  published: PublishedTrialAnalysis,
): ArmDeviation[] {
  return arms.map((arm) => {
    const own = records.filter((record) => record.armId === arm.id);
    const withheld = !published.enoughFarms || published.arms.find((shown) => shown.label === arm.label)?.withheld;
    if (withheld || farmsOf(own) < published.minimumFarms) return { label: arm.label, counts: null };
    const leftOut = Object.fromEntries(exclusionReasons.map((reason) => [reason, 0])) as Record<ExclusionReason, number>;
    for (const record of own) if (record.excluded) leftOut[record.excluded] += 1;
    return {
      label: arm.label,
      counts: {
        listed: assignedByArm[arm.id] ?? 0,
        inSeasonLog: own.length,
        analysed: own.filter((record) => record.value !== null).length,
        countedAsZero: own.filter((record) => record.countedAsZero).length,
        leftOut,
      },
    };
  });
}

/**
 * The whole report of a closing trial, from its blocks and harvests (read through the analyst
 * role): each block classified as the protocol declares (lib/trials/outcome.ts), the pre-declared
 * analysis, then discloseTrialAnalysis. What `results` holds may be stored on the trial and shown
 * to every member; `farms` goes where only each farm reads its row.
 */
export function trialReport(input: {
  arms: readonly TrialArmInfo[];
  blockRows: Parameters<typeof trialOutcomeRecords>[0];
  harvestRows: Parameters<typeof trialOutcomeRecords>[1];
  /** For a room-level trial: each block's fruiting room (an opaque key), from trialBlockRooms. */
  blockRooms?: ReadonlyMap<string, string | null>;
  outcome: Parameters<typeof trialOutcomeRecords>[2];
  minimumFarms: number;
  showPerFarmEstimates: boolean;
  random: Random;
  enrolments: readonly { status: string }[];
  blocksAssigned: number;
  /** Listed blocks per arm id, over every farm. */
  assignedByArm: Readonly<Record<string, number>>;
  design: {
    designKind?: TrialDesignKind;
    smallestDifference: number | null;
    expectedSd: number | null;
    plannedFarms: number | null;
    expectedLoss: number | null;
  };
  analysedAt: string;
}): { results: StoredTrialResults; farms: TrialReportFarm[] } {
  const records = trialOutcomeRecords(input.blockRows, input.harvestRows, input.outcome);
  const analysis = analyseTrial({ arms: [...input.arms], records, minimumFarms: input.minimumFarms });
  const disclosed = discloseTrialAnalysis(analysis, { ...input, records });
  const { farms } = disclosed;
  let report = disclosed.report;
  const factorial =
    input.design.designKind === "strain_by_method" ? factorialReport(input.arms, records, input.minimumFarms, report) : undefined;
  // trialOutcomeRecords keeps the block rows that carry an arm, in their order.
  const armedBlocks = input.blockRows.filter((row) => row.armId !== null);
  const rooms =
    input.design.designKind === "rooms"
      ? analyseRoomTrial({
          arms: input.arms,
          records: records.map((record, i) => ({ ...record, room: input.blockRooms?.get(armedBlocks[i].id) ?? null })),
          minimumFarms: input.minimumFarms,
        })
      : undefined;
  if (rooms) {
    // The room is the unit: block-level comparisons would treat blocks sharing a room's air as independent.
    report = {
      ...report,
      anova: null,
      versusReference: [],
      betweenArms: [],
      farmPooling: [],
      answer: rooms.answer,
    };
  }
  if (factorial) {
    // The crossing is the pre-declared analysis: its answer replaces the arm-by-arm one; what it could not do is said.
    report = factorial.anova
      ? { ...report, answer: factorial.answer }
      : { ...report, notes: [...report.notes, ...factorial.notes.filter((note) => !report.notes.includes(note))] };
  }
  const { smallestDifference, expectedSd, plannedFarms, expectedLoss } = input.design;
  const planned =
    smallestDifference && expectedSd && plannedFarms
      ? trialSampleSize(
          {
            difference: smallestDifference,
            sd: expectedSd,
            plannedFarms,
            expectedLoss: expectedLoss ?? 0,
            arms: input.arms.length,
            crossing: crossingOf(
              input.design.designKind,
              input.arms.map((arm) => ({ strainId: arm.strainId ?? arm.label, treatmentId: arm.treatmentId ?? null })),
            ),
          },
          [0.8],
        )
      : null;
  return {
    results: {
      analysis: report,
      ...(factorial ? { factorial } : {}),
      ...(rooms ? { rooms } : {}),
      deviations: {
        farmsDropped: input.enrolments.filter((enrolment) => enrolment.status === "dropped").length,
        farmsDeclined: input.enrolments.filter((enrolment) => enrolment.status === "declined").length,
        blocksAssigned: input.blocksAssigned,
        blocksMade: analysis.enoughFarms ? input.blockRows.length : null,
        blocksLeftOut: report.blocksLeftOut,
        byArm: armDeviations(input.arms, records, input.assignedByArm, report),
        plan: {
          farmsPlanned: plannedFarms,
          farmsTakingPart: input.enrolments.filter((enrolment) => enrolment.status === "accepted").length,
          farmsContributing: analysis.enoughFarms ? analysis.farmsContributing : null,
          blocksPerArmNeeded: planned?.ok ? Math.ceil(planned.rows[0].exactPerArm - 1e-9) : null,
          blocksPerArmToMake: planned?.ok ? planned.rows[0].perArmToMake : null,
        },
      },
      analysedAt: input.analysedAt,
    },
    farms,
  };
}

/**
 * The factorial analysis of a trial whose arms cross strains with fruiting methods, the method
 * leading (the trial's main question is usually the method; the strain is the second factor). It
 * publishes pooled figures only, and none when an arm's figures are withheld (run on fewer than the
 * minimum number of farms): every main effect and cell mean would then carry that arm's few farms.
 */
function factorialReport(
  arms: readonly TrialArmInfo[],
  records: OutcomeRecord[],
  minimumFarms: number,
  published: PublishedTrialAnalysis,
): FactorialTrialAnalysis {
  const design = factorialDesignFromArms(
    arms.map((arm) => ({
      id: arm.id,
      isReference: arm.isReference,
      strain: { id: arm.strainId ?? arm.label, name: arm.strainName ?? `arm ${arm.label}` },
      treatment: arm.treatmentId && arm.treatmentName ? { id: arm.treatmentId, name: arm.treatmentName } : null,
    })),
    { name: "fruiting method", plural: "fruiting methods" },
    { lead: "treatment" },
  );
  const empty = (note: string, answer: string): FactorialTrialAnalysis => ({
    factors: ["fruiting method", "strain"],
    farmsContributing: published.farmsContributing,
    minimumFarms,
    enoughFarms: published.enoughFarms,
    blocksAnalysed: 0,
    blocksLeftOut: 0,
    anova: null,
    cellMeans: [],
    mainEffects: [[], []],
    simpleEffects: [[], []],
    interactionMaterial: false,
    interactionLevel: 0.1,
    notes: [note],
    answer,
  });
  if (!design)
    return empty(
      "The arms do not cross every strain with every fruiting method, one arm each, so the crossed analysis was not made.",
      "No answer: the arms do not form a complete crossing of strains and fruiting methods.",
    );
  if (published.arms.some((arm) => arm.withheld) && published.enoughFarms)
    return empty(
      `Some arms ran on fewer than ${minimumFarms} farms, so the crossed analysis is not published.`,
      "No answer: some arms ran on too few farms for the crossed analysis.",
    );
  const analysis = analyseFactorialTrial({ design, records, minimumFarms });
  // Block counts of one farm are its own: none below the minimum, as for the arm-by-arm analysis.
  return analysis.enoughFarms ? analysis : { ...analysis, blocksAnalysed: 0, blocksLeftOut: 0 };
}
