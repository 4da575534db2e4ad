import { z } from "zod";
import { releaseSchedules } from "./release-schedule";

/** The smallest minimum the co-op may set: with two farms, each learns the other's figures by subtracting its own. */
export const lowestMinimumFarms = 3;

/** The Co-op settings form: how pooled figures are published. The database holds the same limits. */
export const cooperativeSettingsSchema = z.object({
  minimumFarms: z.coerce
    .number("Enter the minimum number of farms as a whole number, such as 3.")
    .int("Enter a whole number of farms, such as 3.")
    .min(
      lowestMinimumFarms,
      "At least 3 farms: with 2, each of the two farms would learn the other's figures by taking its own away from the pooled one.",
    )
    .max(50, "At most 50 farms; a larger minimum would hide every result."),
  showPerFarmEstimates: z.preprocess((value) => value === "on", z.boolean()),
  releaseSchedule: z.enum(releaseSchedules, "Choose when releases are published: every night, every Monday, or only when you cut one."),
  releaseHour: z.coerce
    .number("Enter the hour as a whole number from 0 to 23.")
    .int("Enter the hour as a whole number from 0 to 23.")
    .min(0, "Enter the hour as a whole number from 0 to 23.")
    .max(23, "Enter the hour as a whole number from 0 to 23."),
});

export type CooperativeSettingsInput = z.infer<typeof cooperativeSettingsSchema>;
