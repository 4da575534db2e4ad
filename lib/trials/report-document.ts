import { cautions } from "@/lib/cautions";
import type { Difference } from "./analysis";
import type { FactorialComparison, FactorialTrialAnalysis } from "./factorial";
import { roomUnitSentence, type PublishedRoomAnalysis } from "./room-analysis";
import type { StoredTrialResults } from "./report";
import { formatDateTime, formatDay, utcDisplay, type TimeDisplay } from "@/lib/time/display";
import { agree, count } from "@/lib/words";

/** What a report export needs of a trial: the trial as the reader may see it (lib/data/trials.ts getTrial gives it). */
export interface ReportTrial {
  code: string;
  title: string;
  question: string;
  speciesName: string;
  publishedAt: Date | null;
  outcomeFlushes: number;
  contaminatedHandling: string;
  protocolNotes: string | null;
  withdrawalsAfterPublication: number;
  arms: {
    label: string;
    isReference: boolean;
    strainCode: string;
    strainName: string;
    treatmentName: string | null;
    treatmentKind: string | null;
  }[];
  results: StoredTrialResults;
}

export interface ReportTable {
  title: string;
  caption?: string;
  columns: string[];
  rows: string[][];
}

export interface ReportSection {
  heading: string;
  paragraphs: string[];
  tables: ReportTable[];
}

/** A printed report: its title lines, then pages of sections, each page starting on a new sheet. */
export interface TrialReportDocument {
  title: string;
  subtitle: string;
  pages: ReportSection[][];
  footer: string;
}

const fmt = (value: number, digits = 1) => value.toFixed(digits);
const pText = (p: number) => (p < 0.001 ? "< 0.001" : fmt(p, 3));

/** "A: BO-1 Blue oyster · horizontal slits", the arm as a grower knows it, not its letter alone. */
export function armName(arm: ReportTrial["arms"][number]): string {
  return `${arm.label}: ${arm.strainCode} ${arm.strainName}${arm.treatmentName ? ` · ${arm.treatmentName}` : ""}`;
}

/** A farm's row as the report page labels it: the reader's own farm marked, every other farm only under its pseudonym. */
const farmLabel = (farm: { farm: string; own?: boolean }) =>
  farm.own && farm.farm !== "Your farm" ? `${farm.farm} (your farm)` : farm.farm;

/** The one-paragraph summary under the answer, as the report page words it. */
function analysedLine(trial: ReportTrial): string {
  const { analysis } = trial.results;
  const counted =
    analysis.blocksAnalysed === null
      ? `Fewer than ${analysis.minimumFarms} farms reported, so no figure of this trial is published.`
      : `${count(analysis.blocksAnalysed, "block")} from ${count(analysis.farmsContributing, "farm")} ${agree(analysis.blocksAnalysed, "was", "were")} analysed.`;
  const method =
    analysis.differencesFrom === "arm + farm"
      ? "Differences are between farm-adjusted means (each farm counts as a block) and are adjusted for comparing every pair of arms (Tukey)."
      : "Differences in this analysis compare the pooled blocks of each arm without taking farms into account (one-way Tukey–Kramer).";
  return `${counted} Intervals are 95 %. ${method}`;
}

function differenceTable(rows: Difference[], farmAdjusted: boolean): ReportTable {
  const arms = new Set(rows.flatMap((row) => [row.arm, row.versus])).size;
  return {
    title: "Differences between arms",
    caption: farmAdjusted
      ? `Difference between two arms' farm-adjusted mean BE, from the model BE ~ arm + farm. Intervals and p-values allow for comparing all ${(arms * (arms - 1)) / 2} pairs of arms (Tukey).`
      : "Difference between two arms' mean BE over the pooled blocks, farms not taken into account (one-way Tukey–Kramer), as this analysis was made.",
    columns: ["Comparison", "Difference (BE points)", "95 % interval (Tukey)", "p, adjusted (Tukey)"],
    rows: rows.map((row) => [
      `${row.arm} - ${row.versus}`,
      fmt(row.estimate),
      `${fmt(row.lower)} to ${fmt(row.upper)}`,
      pText(row.pAdjusted),
    ]),
  };
}

/**
 * What goes on each page of a published trial report taken away as a PDF: the same figures,
 * words and cautions as the report page, rounded as it rounds them, for the reader the trial
 * was read as (their own farm marked, nobody else's; getTrial has already done that).
 * Page 1: the answer, the arms and their adjusted means. Page 2: differences, farm by farm,
 * contamination, deviations, the protocol and the cautions.
 */
/** `display`: the reader's zone and date style (the download route passes them); UTC, named, otherwise. */
export function trialReportDocument(trial: ReportTrial, display: TimeDisplay = utcDisplay): TrialReportDocument {
  const { analysis, deviations } = trial.results;
  const first: ReportSection[] = [
    {
      heading: "The answer",
      paragraphs: [analysis.answer, analysedLine(trial), ...analysis.notes],
      tables: [],
    },
    {
      heading: "Arms as declared",
      paragraphs: [],
      tables: [
        {
          title: "Arms as declared",
          columns: ["Arm", "Strain", "Treatment"],
          rows: trial.arms.map((arm) => [
            `${arm.label}${arm.isReference ? " (reference)" : ""}`,
            `${arm.strainCode} ${arm.strainName}`,
            arm.treatmentName ?? "-",
          ]),
        },
      ],
    },
  ];
  if (analysis.anova) {
    first.push({
      heading: "Biological efficiency by arm, adjusted for farm",
      paragraphs: [
        ...(analysis.arms.some((arm) => arm.withheld)
          ? [`Arms run on fewer than ${analysis.minimumFarms} farms are left out of every table.`]
          : []),
        `Do the arms differ, once farms are allowed for? F = ${fmt(analysis.anova.arm.f, 2)} on ${analysis.anova.arm.df} degrees of freedom, p ${pText(analysis.anova.arm.p)}. Do farms differ? p ${pText(analysis.anova.farm.p)}.`,
      ],
      tables: [
        {
          title: "Adjusted mean BE",
          columns: ["Arm", "Blocks", "Adjusted mean BE", "95 % interval"],
          rows: analysis.anova.adjustedMeans.map((mean) => [
            `${mean.treatment}${mean.treatment === analysis.referenceArm ? " (reference)" : ""}`,
            String(analysis.arms.find((arm) => arm.label === mean.treatment)?.n ?? "-"),
            `${fmt(mean.estimate)} %`,
            `${fmt(mean.lower)} - ${fmt(mean.upper)} %`,
          ]),
        },
      ],
    });
  }

  const factorial = trial.results.factorial;
  if (factorial?.anova) first.push(factorialSection(factorial, factorial.anova));
  const rooms = trial.results.rooms;
  if (rooms) first.push(roomSection(rooms, analysis.referenceArm));

  const second: ReportSection[] = [];
  if (analysis.versusReference.length) {
    second.push({
      heading: "Differences between arms",
      paragraphs: [],
      tables: [differenceTable([...analysis.versusReference, ...analysis.betweenArms], analysis.differencesFrom === "arm + farm")],
    });
  }
  if (analysis.farmPooling.length) {
    second.push({
      heading: "Farm by farm",
      paragraphs: [
        analysis.perFarmRows
          ? "Farms appear only under names drawn at random for this trial; only your own farm is marked, and only for you."
          : "Only the pooled estimate and, for a farm taking part, its own farm are shown.",
        `${cautions.pooledFigures.title}: ${cautions.pooledFigures.text}`,
      ],
      tables: analysis.farmPooling.map((pooling) => ({
        title: `Arm ${pooling.arm} against reference arm ${analysis.referenceArm} (BE points)`,
        caption: pooling.note ?? undefined,
        columns: ["Farm", "Difference", "95 % interval"],
        rows: [
          ...pooling.farms.map((farm) => [farmLabel(farm), fmt(farm.estimate), `${fmt(farm.lower)} to ${fmt(farm.upper)}`]),
          ...(pooling.pooled
            ? [
                [
                  `All farms pooled (random effects; I² = ${Math.round(pooling.pooled.i2)} %)`,
                  fmt(pooling.pooled.estimate),
                  `${fmt(pooling.pooled.lower)} to ${fmt(pooling.pooled.upper)}`,
                ],
              ]
            : []),
        ],
      })),
    });
  }
  second.push({
    heading: "Contamination by arm",
    paragraphs: [`${cautions.spores.title}: ${cautions.spores.text}`],
    tables: [
      {
        title: "Contamination by arm",
        columns: ["Arm", "Contaminated", "Rate", "95 % interval (Wilson)"],
        rows: analysis.arms.map(({ label, contamination }) =>
          contamination
            ? [
                label,
                `${contamination.contaminated} of ${contamination.blocks}`,
                `${fmt(contamination.p * 100)} %`,
                `${fmt(contamination.lower * 100)} - ${fmt(contamination.upper * 100)} %`,
              ]
            : [label, `fewer than ${analysis.minimumFarms} farms ran this arm`, "", ""],
        ),
      },
    ],
  });
  second.push({
    heading: "Deviations from the plan",
    paragraphs: [
      `${count(deviations.farmsDropped, "invited farm")} dropped out or never answered; ${deviations.farmsDeclined} declined.`,
      ...(deviations.blocksMade !== null && deviations.blocksLeftOut !== null
        ? [
            `${deviations.blocksMade} of ${deviations.blocksAssigned} listed blocks reached a season log.`,
            `${deviations.blocksLeftOut} block${deviations.blocksLeftOut === 1 ? " was" : "s were"} left out of the BE comparison (contaminated, as declared, or without a wet mass or moisture).`,
          ]
        : [`Block counts are not published: fewer than ${analysis.minimumFarms} farms reported.`]),
      ...(trial.withdrawalsAfterPublication > 0
        ? [
            `${trial.withdrawalsAfterPublication === 1 ? "One farm" : `${trial.withdrawalsAfterPublication} farms`} withdrew their data from the co-op after these results were published. The figures above stay as they were published.`,
          ]
        : []),
    ],
    tables: [],
  });
  second.push({
    heading: "Protocol as declared",
    paragraphs: [
      `Species: ${trial.speciesName}.`,
      `Outcome: biological efficiency over flushes 1-${trial.outcomeFlushes}; contaminated blocks ${trial.contaminatedHandling === "exclude" ? "left out" : "count as 0 %"}. Contamination rate by arm as a second outcome.`,
      ...(trial.protocolNotes ? [trial.protocolNotes] : []),
      ...(trial.arms.some((arm) => arm.treatmentKind === "humidity")
        ? [`${cautions.humidifiers.title}: ${cautions.humidifiers.text}`]
        : []),
    ],
    tables: [],
  });

  return {
    title: `${trial.code} — ${trial.title}`,
    subtitle: `${trial.question}${trial.publishedAt ? ` Published ${formatDay(trial.publishedAt, display)}.` : ""}`,
    pages: [first, second],
    footer: `Analysed ${formatDateTime(trial.results.analysedAt, display)}. Rhizomorph records yields; it is not safety, food or health advice.`,
  };
}

/**
 * The report's tables as one CSV sheet, one row per figure, rounded as the page shows them:
 * adjusted means, differences between arms, farm by farm (pseudonyms; the reader's own farm
 * marked) and contamination. Withheld arms have a note instead of figures.
 */
export function trialReportRows(trial: ReportTrial): Record<string, string | number>[] {
  const { analysis } = trial.results;
  const strainOf = (label: string) => {
    const arm = trial.arms.find((entry) => entry.label === label);
    return arm ? armName(arm) : label;
  };
  const round = (value: number, digits = 1) => Number(value.toFixed(digits));
  const base = { trial: trial.code };
  const rows: Record<string, string | number>[] = [];
  for (const mean of analysis.anova?.adjustedMeans ?? []) {
    rows.push({
      ...base,
      table: "adjusted mean BE (%)",
      arm: strainOf(mean.treatment),
      blocks: analysis.arms.find((arm) => arm.label === mean.treatment)?.n ?? "",
      estimate: round(mean.estimate),
      lower: round(mean.lower),
      upper: round(mean.upper),
    });
  }
  for (const row of [...analysis.versusReference, ...analysis.betweenArms]) {
    rows.push({
      ...base,
      table:
        analysis.differencesFrom === "arm + farm"
          ? "difference in farm-adjusted mean BE (points, Tukey)"
          : "difference in mean BE (points, Tukey-Kramer)",
      arm: strainOf(row.arm),
      compared_with: strainOf(row.versus),
      estimate: round(row.estimate),
      lower: round(row.lower),
      upper: round(row.upper),
      p_adjusted: pText(row.pAdjusted),
    });
  }
  const factorial = trial.results.factorial;
  if (factorial?.anova) {
    const [first, second] = factorial.factors;
    for (const cell of factorial.cellMeans)
      rows.push({
        ...base,
        table: `mean BE (%) of each ${first} with each ${second}, farm-adjusted`,
        arm: `${cell.levels[0]} with ${cell.levels[1]}`,
        blocks: cell.blocks,
        estimate: round(cell.estimate),
        lower: round(cell.lower),
        upper: round(cell.upper),
      });
    const comparisons = (table: string, list: FactorialComparison[], within = "") =>
      list.map((row) => ({
        ...base,
        table,
        arm: row.level,
        compared_with: row.versus,
        estimate: round(row.estimate),
        lower: round(row.lower),
        upper: round(row.upper),
        p_adjusted: pText(row.pAdjusted),
        note: within,
      }));
    rows.push(
      ...comparisons(`${first} difference averaged over ${second}s (BE points, Tukey)`, factorial.mainEffects[0]),
      ...comparisons(`${second} difference averaged over ${first}s (BE points, Tukey)`, factorial.mainEffects[1]),
      ...(factorial.interactionMaterial
        ? factorial.simpleEffects[0].flatMap((group) =>
            comparisons(`${first} difference within one ${second} (BE points, Tukey)`, group.comparisons, `with ${group.within}`),
          )
        : []),
    );
  }
  for (const pooling of analysis.farmPooling) {
    const table = "farm by farm difference (BE points)";
    for (const farm of pooling.farms) {
      rows.push({
        ...base,
        table,
        arm: strainOf(pooling.arm),
        compared_with: strainOf(analysis.referenceArm),
        farm: farmLabel(farm),
        estimate: round(farm.estimate),
        lower: round(farm.lower),
        upper: round(farm.upper),
      });
    }
    rows.push({
      ...base,
      table,
      arm: strainOf(pooling.arm),
      compared_with: strainOf(analysis.referenceArm),
      farm: "all farms pooled",
      ...(pooling.pooled
        ? { estimate: round(pooling.pooled.estimate), lower: round(pooling.pooled.lower), upper: round(pooling.pooled.upper) }
        : { note: pooling.note ?? "" }),
    });
  }
  for (const arm of analysis.arms) {
    rows.push({
      ...base,
      table: "contamination (%, Wilson interval)",
      arm: strainOf(arm.label),
      ...(arm.contamination
        ? {
            blocks: arm.contamination.blocks,
            contaminated: arm.contamination.contaminated,
            estimate: round(arm.contamination.p * 100),
            lower: round(arm.contamination.lower * 100),
            upper: round(arm.contamination.upper * 100),
          }
        : { note: `fewer than ${analysis.minimumFarms} farms ran this arm` }),
    });
  }
  return rows;
}

export const trialReportColumns = [
  "trial",
  "table",
  "arm",
  "compared_with",
  "farm",
  "blocks",
  "contaminated",
  "estimate",
  "lower",
  "upper",
  "p_adjusted",
  "note",
].map((key) => ({ key, header: key }));

const winAnsiExtras = new Set("€‚ƒ„…†‡ˆ‰Š‹ŒŽ‘’“”•–—˜™š›œžŸ");
const typewritten: Record<string, string> = { "\u2212": "-", "\u2012": "-", "\u2264": "<=", "\u2265": ">=", "\u202f": " ", "\u2009": " " };

/**
 * The PDF's built-in Helvetica has only the Windows-1252 characters; anything else would print
 * as a gap (a minus sign, a ≥). Those are written the way a typewriter would, the rest as "?".
 */
export function pdfSafeText(text: string): string {
  return [...text]
    .map((char) => {
      const code = char.codePointAt(0)!;
      if (char === "\n" || (code >= 0x20 && code <= 0x7e) || (code >= 0xa0 && code <= 0xff) || winAnsiExtras.has(char)) return char;
      return typewritten[char] ?? "?";
    })
    .join("");
}

const capitalised = (text: string) => text[0].toUpperCase() + text.slice(1);

/** A room-level trial's figures as the report page shows them (RoomResults): counts of rooms, never one room's mean. */
function roomSection(rooms: PublishedRoomAnalysis, referenceArm: string): ReportSection {
  const tables: ReportTable[] = [];
  if (rooms.anova)
    tables.push({
      title: "Farm-adjusted mean of room means",
      columns: ["Arm", "Rooms", "Mean BE", "95 % interval"],
      rows: rooms.adjustedMeans.map((mean) => [
        `${mean.treatment}${mean.treatment === referenceArm ? " (reference)" : ""}`,
        String(rooms.roomsPerArm.find((arm) => arm.label === mean.treatment)?.rooms ?? "-"),
        `${fmt(mean.estimate)} %`,
        `${fmt(mean.lower)} - ${fmt(mean.upper)} %`,
      ]),
    });
  if (rooms.versusReference.length)
    tables.push({
      title: "Differences between arms, rooms as the unit (Tukey)",
      columns: ["Difference", "BE points", "95 % interval", "p (adjusted)"],
      rows: [...rooms.versusReference, ...rooms.betweenArms].map((row) => [
        `${row.arm} - ${row.versus}`,
        fmt(row.estimate),
        `${fmt(row.lower)} to ${fmt(row.upper)}`,
        pText(row.pAdjusted),
      ]),
    });
  return {
    heading: "Biological efficiency by arm, rooms as the unit",
    paragraphs: [
      roomUnitSentence(rooms),
      ...(rooms.anova
        ? [
            `F = ${fmt(rooms.anova.arm.f, 2)} on ${rooms.anova.arm.df} and ${rooms.anova.residualDf} degrees of freedom (rooms), p ${pText(rooms.anova.arm.p)}.`,
          ]
        : []),
      ...rooms.notes,
    ],
    tables,
  };
}

/** A crossed trial's figures as the report page shows them: the terms, each combination's mean, the comparisons. */
function factorialSection(factorial: FactorialTrialAnalysis, anova: NonNullable<FactorialTrialAnalysis["anova"]>): ReportSection {
  const [first, second] = factorial.factors;
  const comparisonRows = (rows: FactorialComparison[], within?: string) =>
    rows.map((row) => [
      `${within ? `With ${within}: ` : ""}${row.level} - ${row.versus}`,
      fmt(row.estimate),
      `${fmt(row.lower)} to ${fmt(row.upper)}`,
      pText(row.pAdjusted),
    ]);
  const comparisonColumns = ["Difference", "BE points", "95 % interval", "p (adjusted)"];
  return {
    heading: `Does the ${first} matter, does the ${second}, and does one depend on the other?`,
    paragraphs: [
      `BE ~ ${first} + ${second} + ${first} x ${second} + farm, type II sums of squares. The interaction counts as material below p = ${fmt(factorial.interactionLevel, 2)}, decided before the trial.`,
    ],
    tables: [
      {
        title: "Terms of the model",
        columns: ["Term", "df", "F", "p"],
        rows: (
          [
            [capitalised(first), anova.first],
            [capitalised(second), anova.second],
            [`${capitalised(first)} x ${second}`, anova.interaction],
            ["Farm", anova.farm],
          ] as const
        ).map(([name, term]) => [name, String(term.df), fmt(term.f, 2), pText(term.p)]),
      },
      {
        title: `Farm-adjusted mean BE of each ${first} with each ${second}`,
        columns: [capitalised(first), capitalised(second), "Blocks", "Mean BE", "95 % interval"],
        rows: factorial.cellMeans.map((cell) => [
          cell.levels[0],
          cell.levels[1],
          String(cell.blocks),
          `${fmt(cell.estimate)} %`,
          `${fmt(cell.lower)} - ${fmt(cell.upper)} %`,
        ]),
      },
      ...(factorial.interactionMaterial
        ? [
            {
              title: `${capitalised(first)}s compared within each ${second} (Tukey within each)`,
              columns: comparisonColumns,
              rows: factorial.simpleEffects[0].flatMap((group) => comparisonRows(group.comparisons, group.within)),
            },
          ]
        : []),
      {
        title: `${capitalised(first)}s compared, averaged over the ${second}s (Tukey)`,
        columns: comparisonColumns,
        rows: comparisonRows(factorial.mainEffects[0]),
      },
      {
        title: `${capitalised(second)}s compared, averaged over the ${first}s (Tukey)`,
        columns: comparisonColumns,
        rows: comparisonRows(factorial.mainEffects[1]),
      },
    ],
  };
}
