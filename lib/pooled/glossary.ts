/**
 * The statistical words the results and trial pages use, each in a sentence or two a grower can
 * read. The glossary page lists them all; each page explains the ones it uses, where it uses them.
 * Sources: BE is common practice in the trade; the methods are as named in the statistics
 * literature cited in docs/references.md (Tukey's HSD, Holm's step-down method, Higgins and
 * Thompson's I², DerSimonian and Laird's τ²).
 */
export interface GlossaryTerm {
  id: string;
  term: string;
  plain: string;
}

export const glossary = [
  {
    id: "biological-efficiency",
    term: "Biological efficiency (BE)",
    plain:
      "Fresh mushrooms harvested as a share of the dry weight of the substrate they grew on: 1 kg of mushrooms from 1 kg of dry substrate is 100 % BE. It lets blocks of different sizes be compared.",
  },
  {
    id: "be-points",
    term: "BE points",
    plain: "A difference between two BE percentages: a strain at 62 % BE is 7 BE points above one at 55 %.",
  },
  {
    id: "interval",
    term: "95 % interval (confidence interval)",
    plain:
      "The range the true figure most likely lies in, given how much blocks and farms vary. Narrow means the data pin it down; wide means more blocks would help. An interval for a difference that includes 0 means the data cannot tell the two apart.",
  },
  {
    id: "farm-adjusted-mean",
    term: "Farm-adjusted mean (least-squares mean)",
    plain:
      "A strain's average BE as if every strain had been grown on the same farms. Farms differ in rooms and handling more than strains do, so a strain grown mostly on a good farm would otherwise look better than it is.",
  },
  {
    id: "tukey",
    term: "Tukey (comparing every pair)",
    plain:
      "When many pairs of strains are compared at once, some differences look real by chance. Tukey's method widens each interval and raises each p-value just enough that, taken together, they stay trustworthy.",
  },
  {
    id: "p-value",
    term: "p-value",
    plain:
      "How often a difference at least this large would turn up by chance if the strains were really the same. Below 0.05 is the usual line for calling a difference real; it says nothing about whether the difference is large enough to matter.",
  },
  {
    id: "holm",
    term: "Holm-adjusted p",
    plain:
      "A p-value corrected for testing several strains against the same reference (Holm's method), so that one of several tests coming out below 0.05 by luck is not taken for a finding.",
  },
  {
    id: "i-squared",
    term: "I² (how much farms disagree)",
    plain:
      "The share of the farm-to-farm differences in a strain's gain that is real rather than chance. Near 0 %: farms agree. Above about 50 %: the gain really differs from farm to farm, so your own rooms may give something else.",
  },
  {
    id: "tau",
    term: "τ (tau)",
    plain:
      "The typical farm-to-farm spread of a strain's gain, in BE points: the gain on one farm is often this much above or below the pooled one.",
  },
  {
    id: "reference-strain",
    term: "Reference strain",
    plain:
      "The strain every other one is compared with: in Co-op results the one grown on the most farms; in a trial the arm the coordinator declared as the reference.",
  },
  {
    id: "anova",
    term: "F and degrees of freedom",
    plain:
      "The analysis of variance behind a trial's answer: F compares the spread between arms with the spread within them, and the degrees of freedom say how many blocks and farms that rests on. A large F with a small p means the arms really differ.",
  },
  {
    id: "release",
    term: "Release",
    plain:
      "A dated copy of the co-op's pooled figures. Figures change only from one release to the next, and only by the data of at least the co-op's minimum number of farms, so no one can work out one farm's numbers by comparing two releases.",
  },
  {
    id: "withheld",
    term: "Withheld figure",
    plain:
      "A figure not published because fewer than the co-op's minimum number of farms contributed to it: with fewer, a reader could work out one farm's own numbers.",
  },
  {
    id: "drying-ratio",
    term: "Drying ratio",
    plain:
      "The dry weight of dried mushrooms as a share of their fresh weight: 9 % means 1 kg picked fresh gives about 90 g dried. Counted for farms that weigh their harvests again after drying.",
  },
  {
    id: "climate-regime",
    term: "Climate regime",
    plain:
      "How a fruiting room's humidity and air were run: for example misted on and off all day, or soaked once a day and left to dry out. The co-op keeps a register of regime kinds so farms can be compared.",
  },
  {
    id: "room-as-unit",
    term: "The room as the unit",
    plain:
      "Blocks in one room share its air and its handling, so they are not separate pieces of evidence about a regime. Each room's own average is worked out first; the comparison then counts rooms, not blocks.",
  },
  {
    id: "design-effect",
    term: "Design effect",
    plain:
      "How many times more blocks a trial needs when whole rooms, not single blocks, are given a treatment: 1 + (blocks per room − 1) × ICC. At 1.25, a room of 6 blocks tells as much as about 5 separate blocks.",
  },
  {
    id: "intraclass-correlation",
    term: "ICC (intraclass correlation)",
    plain:
      "How alike blocks in the same room are, from 0 (no more alike than any two blocks) to 1 (a room's blocks all give the same). The co-op's own rooms give an estimate; the more alike, the more rooms a trial needs.",
  },
  {
    id: "observational",
    term: "Observational comparison",
    plain:
      "A comparison of what farms happened to do, not a trial: nobody assigned rooms to regimes at random, so rooms run one way may also differ in other ways (cleaning, strains, the grower's hand) that explain some or all of the difference.",
  },
] as const satisfies readonly GlossaryTerm[];

export type GlossaryId = (typeof glossary)[number]["id"];

export function glossaryTerms(ids: readonly GlossaryId[]): GlossaryTerm[] {
  return ids.map((id) => glossary.find((term) => term.id === id)!);
}
