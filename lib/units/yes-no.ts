const yesWords = new Set(["yes", "y", "true", "1", "x"]);
const noWords = new Set(["no", "n", "false", "0"]);

/** Reads a yes/no cell: yes/no, y/n, true/false, 1/0 and "x" for yes. A blank cell is null (not stated). */
export function parseYesNo(text: string): { value: boolean | null } | { error: string; code: "not_yes_or_no" } {
  const word = text.trim().toLowerCase();
  if (word === "") return { value: null };
  if (yesWords.has(word)) return { value: true };
  if (noWords.has(word)) return { value: false };
  return {
    code: "not_yes_or_no",
    error: `"${text.trim()}" is not yes or no. Write yes or no (y/n, true/false, 1/0 or x for yes), or leave the cell blank for no.`,
  };
}
