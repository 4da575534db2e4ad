import { agree, count } from "@/lib/words";

/** The viewer's own blocks of one strain that a pooled figure cannot take in, by what they lack. */
export interface OwnLeftOutCounts {
  strainName: string;
  /** Uncontaminated blocks with a harvest but no wet block weight or no moisture: no dry substrate mass, so no BE. */
  noDryMass: number;
  /** Blocks without a fruiting method: in "any fruiting method" figures, never in one filtered by a method. */
  noFruitingMethod: number;
  /** Blocks without a substrate recipe: likewise for a recipe filter. */
  noRecipe: number;
}

export interface OwnLeftOutNote {
  text: string;
  fix: { href: string; label: string };
}

const columnsPage = { href: "/season-logs/columns", label: "See the season-log columns" };

/**
 * What the viewer can fix in their own records so their blocks count: one sentence per strain and
 * gap, with the place to fix it. Only the viewer's own counts; nothing about other farms. A gap is
 * named only where the view needs what is missing (a fruiting method only under a method filter).
 */
export function ownLeftOutNotes(
  counts: readonly OwnLeftOutCounts[],
  view: { byFruitingMethod: boolean; byRecipe: boolean },
): OwnLeftOutNote[] {
  return counts.flatMap((strain) => {
    const notes: OwnLeftOutNote[] = [];
    const yours = (n: number) => `Your ${count(n, "block")} of ${strain.strainName}`;
    if (strain.noDryMass > 0)
      notes.push({
        text: `${yours(strain.noDryMass)} with a harvest ${agree(strain.noDryMass, "has", "have")} no dry substrate mass (a wet block weight and a moisture), so ${agree(strain.noDryMass, "it has no BE and is", "they have no BE and are")} not in the co-op's BE figures or your place among them. Add block_wet_weight and substrate_moisture to your season log and upload it again, or correct each block on its page: in Blocks & harvests their BE reads “no dry mass”.`,
        fix: { href: "/blocks", label: "Open Blocks & harvests" },
      });
    if (view.byFruitingMethod && strain.noFruitingMethod > 0)
      notes.push({
        text: `${yours(strain.noFruitingMethod)} ${agree(strain.noFruitingMethod, "has", "have")} no fruiting method, so ${agree(strain.noFruitingMethod, "it is", "they are")} counted under “Any fruiting method” but not under a chosen one. Add the fruiting_method column to your season log (a code from the co-op's register) and upload it again.`,
        fix: columnsPage,
      });
    if (view.byRecipe && strain.noRecipe > 0)
      notes.push({
        text: `${yours(strain.noRecipe)} ${agree(strain.noRecipe, "has", "have")} no substrate recipe, so ${agree(strain.noRecipe, "it is", "they are")} counted under “Any recipe” but not under a chosen one. Add the substrate column to your season log (a code from the co-op's register) and upload it again.`,
        fix: columnsPage,
      });
    return notes;
  });
}
