/** Version of the shared season-log schema that these columns describe. */
export const seasonLogSchemaVersion = 3;

export const seasonLogColumnNames = [
  "block_id",
  "strain",
  "substrate",
  "trial",
  "arm",
  "inoculated_on",
  "season",
  "block_wet_weight",
  "substrate_moisture",
  "fruiting_method",
  "fruiting_room",
  "flush",
  "harvested_on",
  "fresh_weight",
  "dry_weight",
  "contaminated",
  "contaminated_on",
  "spent_weight",
  "notes",
] as const;

export type SeasonLogColumnName = (typeof seasonLogColumnNames)[number];

export interface SeasonLogColumn {
  name: SeasonLogColumnName;
  /** Short title for a page or a form. */
  title: string;
  /** What the column holds, in a grower's words. */
  meaning: string;
  examples: readonly string[];
  /** "always": every row; "harvest": every row that records a flush; "no": may stay blank. */
  required: "always" | "harvest" | "no";
  kind: "text" | "date" | "mass" | "moisture" | "yes-no" | "flush" | "season";
  /** A block column describes the bag and repeats on each of its rows; a harvest column describes one flush. */
  describes: "block" | "harvest";
  /** Other headers that surely mean this column. Case, spaces and punctuation do not matter. */
  synonyms: readonly string[];
  /** Headers that probably mean this column; the upload asks the grower to confirm them. */
  looseSynonyms: readonly string[];
}

export const seasonLogColumns: readonly SeasonLogColumn[] = [
  {
    name: "block_id",
    title: "Block",
    meaning: "Your own code for the block (bag). Write it the same way on every row of the block.",
    examples: ["FE-001", "T01-1-01", "B-17"],
    required: "always",
    kind: "text",
    describes: "block",
    synonyms: [
      "block",
      "block id",
      "block code",
      "block no",
      "block number",
      "block #",
      "bag",
      "bag id",
      "bag code",
      "bag no",
      "bag number",
    ],
    looseSynonyms: ["id", "code", "number"],
  },
  {
    name: "strain",
    title: "Strain",
    meaning: "The strain the block was inoculated with: the co-op's strain code or the strain's name in the register, in any case.",
    examples: ["PO-03", "HE-01", "LE-02"],
    required: "always",
    kind: "text",
    describes: "block",
    synonyms: ["strain", "strain code", "strain id", "culture", "isolate", "culture line"],
    looseSynonyms: ["variety", "cultivar", "spawn"],
  },
  {
    name: "substrate",
    title: "Substrate recipe",
    meaning: "The substrate recipe: the co-op's recipe code or the recipe's name in the register, in any case.",
    examples: ["HWB-20", "HWS-50", "Hardwood sawdust with 20 % wheat bran"],
    required: "no",
    kind: "text",
    describes: "block",
    synonyms: ["substrate", "substrate recipe", "recipe", "substrate code", "substrate mix", "mix"],
    looseSynonyms: ["medium"],
  },
  {
    name: "trial",
    title: "Trial",
    meaning:
      "The trial code, if the block is part of a co-op strain trial; a trial block must be on your farm's trial list. Leave blank otherwise.",
    examples: ["T-2026-01", ""],
    required: "no",
    kind: "text",
    describes: "block",
    synonyms: ["trial", "trial code", "trial id", "experiment"],
    looseSynonyms: ["study"],
  },
  {
    name: "arm",
    title: "Trial arm",
    meaning: "Which arm of the trial the block was given to (the strain or treatment it tests), as your farm's trial list says.",
    examples: ["A", "B", "Across"],
    required: "no",
    kind: "text",
    describes: "block",
    synonyms: ["arm", "trial arm", "treatment", "treatment arm"],
    looseSynonyms: ["group"],
  },
  {
    name: "inoculated_on",
    title: "Inoculated on",
    meaning: "The day the block was inoculated with spawn.",
    examples: ["2026-03-02", "02.03.2026", "03/02/2026"],
    required: "no",
    kind: "date",
    describes: "block",
    synonyms: [
      "inoculated",
      "inoculated on",
      "inoculation",
      "inoculation date",
      "date inoculated",
      "inoc date",
      "spawned",
      "spawned on",
      "spawning date",
      "spawn date",
    ],
    looseSynonyms: ["start date", "made on", "date made"],
  },
  {
    name: "season",
    title: "Season",
    meaning:
      "The season the block belongs to, if not the one its inoculation date falls in (the co-op's season start is on the Co-op settings page). Write the year the season starts, such as 2026; the two years it spans, such as 2026/27, mean the same. Leave blank to take the season from the inoculation date.",
    examples: ["2026", "2025/26", ""],
    required: "no",
    kind: "season",
    describes: "block",
    synonyms: ["season", "growing season", "season year", "crop year"],
    looseSynonyms: ["year", "campaign"],
  },
  {
    name: "block_wet_weight",
    title: "Wet block weight",
    meaning: "The block's weight when it was made (substrate and water, before colonisation), with its unit.",
    examples: ["2.5 kg", "5 lb 8 oz", "2500 g"],
    required: "no",
    kind: "mass",
    describes: "block",
    synonyms: [
      "block wet weight",
      "wet block",
      "wet block weight",
      "wet weight",
      "block weight",
      "wet mass",
      "block wet mass",
      "bag weight",
      "wet bag weight",
      "block mass",
    ],
    looseSynonyms: ["starting weight", "start weight"],
  },
  {
    name: "substrate_moisture",
    title: "Substrate moisture",
    meaning: "Moisture content of the substrate when the block was made, wet basis: the water share of the wet mass.",
    examples: ["62 %", "0.62", "60,5 %"],
    required: "no",
    kind: "moisture",
    describes: "block",
    synonyms: ["substrate moisture", "moisture", "moisture content", "mc", "water content", "moisture wb"],
    looseSynonyms: ["water"],
  },
  {
    name: "fruiting_method",
    title: "Fruiting method",
    meaning:
      "How the bag was opened for fruiting: the co-op's code or the method's name in the register. A trial block fruits as its arm says.",
    examples: ["SLIT-ACROSS", "TOP-OPEN", "Slits cut along the bag"],
    required: "no",
    kind: "text",
    describes: "block",
    synonyms: ["fruiting method", "fruiting", "opening", "opening method", "bag opening", "cut"],
    looseSynonyms: ["method"],
  },
  {
    name: "fruiting_room",
    title: "Fruiting room",
    meaning:
      "Where the block fruited: the name of one of your farm's rooms (a tub, tent or room), as it is on the Rooms page. Capitals and spaces do not matter. A name your farm has no room for is an error: add the room on the Rooms page first. Leave blank to keep the room already recorded; a block carried to another room later is moved on its page.",
    examples: ["Tent 1", "Tub A", ""],
    required: "no",
    kind: "text",
    describes: "block",
    // Growers fruit in tubs, tents (a frame with a cover and shelves) and rooms (common practice).
    synonyms: ["fruiting room", "room", "fruiting tent", "tent", "fruiting chamber", "chamber", "grow room", "fruiting tub"],
    looseSynonyms: ["tub", "location", "where fruited"],
  },
  {
    name: "flush",
    title: "Flush",
    meaning: "Which flush this harvest is: 1 for the first, 2 for the second and so on. Leave blank on a block row with no harvest yet.",
    examples: ["1", "2", "3"],
    required: "harvest",
    kind: "flush",
    describes: "harvest",
    synonyms: ["flush", "flush no", "flush number", "flush #", "break", "wave"],
    looseSynonyms: ["harvest no", "harvest number", "pick"],
  },
  {
    name: "harvested_on",
    title: "Harvested on",
    meaning: "The day the flush was picked.",
    examples: ["2026-04-11", "11.04.2026", "04/11/2026"],
    required: "no",
    kind: "date",
    describes: "harvest",
    synonyms: ["harvested", "harvested on", "harvest date", "date harvested", "picked", "picked on", "pick date", "date picked"],
    looseSynonyms: ["date", "harvest"],
  },
  {
    name: "fresh_weight",
    title: "Fresh weight",
    meaning: "Weight of the mushrooms picked in this flush, fresh, with its unit.",
    examples: ["640 g", "1.2 kg", "1 lb 6 oz"],
    required: "harvest",
    kind: "mass",
    describes: "harvest",
    synonyms: ["fresh weight", "fresh", "fresh mass", "harvest weight", "yield", "fresh yield", "picked weight", "mushroom weight"],
    looseSynonyms: ["weight", "mass"],
  },
  {
    name: "dry_weight",
    title: "Dry weight",
    meaning: "Weight of the same mushrooms after dehydrating, if you dried and weighed them.",
    examples: ["64 g", "0.12 kg", ""],
    required: "no",
    kind: "mass",
    describes: "harvest",
    synonyms: ["dry weight", "dry", "dried weight", "dry mass", "dried"],
    looseSynonyms: [],
  },
  {
    name: "contaminated",
    title: "Contaminated",
    meaning: "Whether the block was lost to mould or bacteria: yes or no (blank means no).",
    examples: ["no", "yes", "x"],
    required: "no",
    kind: "yes-no",
    describes: "block",
    synonyms: ["contaminated", "contamination", "contam", "is contaminated"],
    looseSynonyms: ["lost", "mould", "mold"],
  },
  {
    name: "contaminated_on",
    title: "Contaminated on",
    meaning: "The day you found the contamination.",
    examples: ["2026-03-19", ""],
    required: "no",
    kind: "date",
    describes: "block",
    synonyms: ["contaminated on", "contamination date", "date contaminated", "contaminated date", "contam date"],
    looseSynonyms: ["lost on"],
  },
  {
    name: "spent_weight",
    title: "Spent block weight",
    meaning: "The block's weight after its last flush, with its unit.",
    examples: ["1.4 kg", "3 lb", ""],
    required: "no",
    kind: "mass",
    describes: "block",
    synonyms: ["spent weight", "spent", "spent block", "spent block weight", "spent mass", "spent block mass"],
    looseSynonyms: ["final weight", "end weight"],
  },
  {
    name: "notes",
    title: "Notes",
    meaning: "Anything else worth keeping about the block or the harvest.",
    examples: ["pinned late", "side pins", ""],
    required: "no",
    kind: "text",
    describes: "harvest",
    synonyms: ["notes", "note", "comments", "comment", "remarks", "observations"],
    looseSynonyms: [],
  },
];

/** Codes for the template's example rows; the co-op's own registry codes make the template import as it stands. */
export interface TemplateCodes {
  strains: readonly string[];
  substrates: readonly string[];
  fruitingMethods: readonly string[];
}

const inventedCodes: TemplateCodes = { strains: ["PO-03", "LM-01"], substrates: ["HW-80/20"], fruitingMethods: ["X-cut"] };

// Two blocks, one with two flushes, one still colonising.
export function templateRows(codes: TemplateCodes = inventedCodes): Partial<Record<SeasonLogColumnName, string>>[] {
  const first = codes.strains[0] ?? inventedCodes.strains[0];
  const second = codes.strains[1] ?? first;
  const substrate = codes.substrates[0] ?? "";
  const fruitingMethod = codes.fruitingMethods[0] ?? "";
  const made = { substrate, inoculated_on: "2026-03-02", block_wet_weight: "2.5 kg", substrate_moisture: "62 %", contaminated: "no" };
  return [
    {
      block_id: "B-001",
      strain: first,
      ...made,
      fruiting_method: fruitingMethod,
      flush: "1",
      harvested_on: "2026-04-11",
      fresh_weight: "640 g",
    },
    {
      block_id: "B-001",
      strain: first,
      ...made,
      fruiting_method: fruitingMethod,
      flush: "2",
      harvested_on: "2026-04-25",
      fresh_weight: "410 g",
      dry_weight: "41 g",
      spent_weight: "1.4 kg",
      notes: "last flush",
    },
    { block_id: "B-002", strain: second, ...made, inoculated_on: "2026-03-09", notes: "still colonising" },
  ];
}

function csvField(value: string): string {
  return /[",\n\r]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

/** A CSV template of the current schema version: the header and a few example rows. */
export function seasonLogTemplateCsv(codes: TemplateCodes = inventedCodes): string {
  const lines = [seasonLogColumnNames.join(",")];
  for (const row of templateRows(codes)) {
    lines.push(seasonLogColumnNames.map((name) => csvField(row[name] ?? "")).join(","));
  }
  return `${lines.join("\r\n")}\r\n`;
}
