/**
 * Yes and no as growers write them and as spreadsheets export booleans in their language.
 * Spreadsheet words are those LibreOffice Calc and Excel write for TRUE and FALSE in each
 * locale (LibreOffice 7.4 checked by exporting under de-DE, fr-FR and en-US: WAHR/FALSCH,
 * VRAI/FAUX, TRUE/FALSE; the others from the programs' function names, common practice).
 * To add a language: add its words here and a line to `yes-no.test.ts`. A word must not mean
 * yes in one language and no in another.
 */
const words: Readonly<Record<string, { yes: readonly string[]; no: readonly string[] }>> = {
  english: { yes: ["yes", "y", "true", "1", "x"], no: ["no", "n", "false", "0"] },
  german: { yes: ["ja", "j", "wahr"], no: ["nein", "falsch"] },
  french: { yes: ["oui", "o", "vrai"], no: ["non", "faux"] },
  spanish: { yes: ["sí", "si", "verdadero"], no: ["falso"] },
  italian: { yes: ["sì", "vero"], no: [] },
  portuguese: { yes: ["sim", "verdadeiro"], no: ["não", "nao"] },
  dutch: { yes: ["waar"], no: ["nee", "onwaar"] },
  swedishDanishNorwegian: { yes: ["sant", "sand"], no: ["nej", "nei", "falskt", "falsk", "usant", "usand"] },
  polish: { yes: ["tak", "prawda"], no: ["nie", "fałsz"] },
  finnish: { yes: ["kyllä", "tosi"], no: ["ei", "epätosi"] },
};

const yesWords = new Set<string>();
const noWords = new Set<string>();
for (const language of Object.values(words)) {
  for (const word of language.yes) yesWords.add(word);
  for (const word of language.no) noWords.add(word);
}

const formulaBoolean = /^=?(.*?)(?:\(\))?$/u;

/** Lower case, and a spreadsheet's boolean that some programs export wrapped as a formula result ("=TRUE()"). */
function normalise(text: string): string {
  const word = text.trim().toLowerCase();
  return word.startsWith("=") || word.endsWith("()") ? word.replace(formulaBoolean, "$1") : word;
}

/**
 * Reads a yes/no cell: yes/no, y/n, true/false, 1/0, "x" for yes, and the same words in the
 * languages above (ja/nein, wahr/falsch, oui/non, vrai/faux, sí/no …). A blank cell is null (not stated).
 */
export function parseYesNo(text: string): { value: boolean | null } | { error: string; code: "not_yes_or_no" } {
  const word = normalise(text);
  if (word === "") return { value: null };
  if (yesWords.has(word)) return { value: true };
  if (noWords.has(word)) return { value: false };
  return {
    code: "not_yes_or_no",
    error: `"${text.trim()}" is not yes or no. Write yes or no (y/n, true/false, 1/0 or x for yes; ja/nein, oui/non, sí/no and the spreadsheet's TRUE/FALSE in your language also work), or leave the cell blank for no.`,
  };
}

/** Every word read as yes or no, for the schema page. */
export const yesNoWords = { yes: [...yesWords], no: [...noWords] };
