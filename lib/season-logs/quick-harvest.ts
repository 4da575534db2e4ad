import { z } from "zod";

/** The quick harvest form, as a grower fills it in on a phone in the grow room. */
export const recordHarvestSchema = z.object({
  blockCode: z.string().trim().min(1, "Enter the block code written on the bag.").max(100, "A block code is at most 100 characters."),
  flush: z.coerce
    .number({ error: "Enter the flush number, 1 for the first." })
    .int("The flush is a whole number, 1 for the first.")
    .min(1, "The flush is 1 or more.")
    .max(20, "A block gives at most 20 flushes; check the number."),
  weight: z
    .string()
    .trim()
    .min(1, "Enter the fresh weight you picked, for example 640 or 1 lb 6 oz.")
    .max(50, "Write the weight as a number with its unit, for example 640 g."),
  unit: z.enum(["g", "kg", "lb", "oz"], { error: "Choose the unit you weighed in." }),
  harvestedOn: z
    .string()
    .regex(/^\d{4}-\d{2}-\d{2}$/, "Choose the day you picked the flush.")
    .refine((day) => !Number.isNaN(Date.parse(`${day}T00:00:00Z`)), "Choose a real day."),
});
