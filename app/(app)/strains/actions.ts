"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { authorize, guardedAction, type ActionState } from "@/lib/auth/guard";
import { createRegistryEntry, importRegistryCsv, moveRegistryEntry } from "@/lib/data/registries";
import { isAppError } from "@/lib/errors";
import { registryKinds } from "@/lib/members/registry-csv";
import { strainSources, substrateTreatments, treatmentKinds } from "@/lib/members/lists";
import { count } from "@/lib/words";

const text = (what: string, max = 120) => z.string().trim().min(1, `Fill in ${what}.`).max(max, `Keep ${what} under ${max} characters.`);
const code = z
  .string()
  .trim()
  .toUpperCase()
  .regex(/^[A-Z0-9][A-Z0-9-]{0,19}$/, "Use a short code of letters, digits and dashes, e.g. PO-04.");
const percent = (what: string, max: number) =>
  z
    .string()
    .trim()
    .transform((value) => Number(value.replace(",", ".").replace("%", "")))
    .pipe(z.number(`Give ${what} as a number.`).min(0, `${what} cannot be below 0.`).max(max, `${what} cannot be above ${max} %.`));

const entrySchema = z.discriminatedUnion("kind", [
  z.object({ kind: z.literal("species"), scientificName: text("the scientific name"), commonName: text("the common name") }),
  z.object({
    kind: z.literal("strains"),
    code,
    species: z.uuid("Choose the species."),
    name: text("the strain's name"),
    source: z.enum(strainSources, "Choose where the culture came from."),
    notes: z.string().trim().max(500, "Keep notes under 500 characters.").default(""),
  }),
  z.object({
    kind: z.literal("substrate_recipes"),
    code,
    name: text("the recipe's name"),
    base: text("the base, e.g. hardwood sawdust"),
    supplement: z.string().trim().max(120).default(""),
    supplementPercent: percent("the supplement", 100),
    targetMoisture: percent("the target moisture", 99).transform((value) => value / 100),
    treatment: z.enum(substrateTreatments, "Choose sterilised or pasteurised."),
  }),
  z.object({
    kind: z.literal("treatments"),
    code,
    name: text("the name"),
    treatmentKind: z.enum(treatmentKinds, "Choose what kind of treatment."),
    description: z.string().trim().max(500).default(""),
  }),
]);

export const addRegistryEntryAction = guardedAction("registry:add", entrySchema, async (input, member) => {
  const status = await createRegistryEntry(member, input);
  revalidatePath("/strains");
  return {
    status: "ok",
    message: status === "active" ? "Added to the registry." : "Proposed: it shows to everyone once the coordinator approves it.",
  };
});

const moveSchema = z.object({ kind: z.enum(registryKinds), id: z.uuid(), move: z.enum(["approve", "retire", "reinstate", "delete"]) });

export const moveRegistryEntryAction = guardedAction("registry:manage", moveSchema, async (input, member) => {
  await moveRegistryEntry(member, input.kind, input.id, input.move);
  revalidatePath("/strains");
  return {
    status: "ok",
    message: {
      approve: "Approved.",
      retire: "Retired: kept for past records, no longer offered.",
      reinstate: "Back in use.",
      delete: "Deleted.",
    }[input.move],
  };
});

const importSchema = z.object({ kind: z.enum(registryKinds, "Choose which registry the file holds.") });

/** CSV files come as form data; the text is read here and checked line by line in lib/members. */
export async function importRegistryAction(_previous: ActionState, formData: FormData): Promise<ActionState> {
  try {
    const member = await authorize("registry:manage");
    const parsed = importSchema.safeParse({ kind: formData.get("kind") });
    const file = formData.get("file");
    if (!parsed.success)
      return { status: "error", message: "Choose which registry the file holds.", fieldErrors: { kind: ["Choose a registry."] } };
    if (!(file instanceof File) || file.size === 0)
      return { status: "error", message: "Choose a CSV file.", fieldErrors: { file: ["Choose a CSV file to import."] } };
    if (file.size > 1_000_000)
      return {
        status: "error",
        message: "The file is over 1 MB; a registry list is much smaller. Check it is the right file.",
        fieldErrors: { file: ["Too large."] },
      };
    const imported = await importRegistryCsv(member, parsed.data.kind, await file.text());
    revalidatePath("/strains");
    return { status: "ok", message: `Imported ${count(imported, "entry", "entries")}.` };
  } catch (error) {
    if (isAppError(error))
      return {
        status: "error",
        message: error.message,
        fieldErrors: Object.fromEntries(error.fieldProblems.map((problem) => [problem.field, [problem.message]])),
      };
    throw error;
  }
}
