"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { guardedAction } from "@/lib/auth/guard";
import { isLoggerClockZone } from "@/lib/climate/zones";
import { uploadClimateLog } from "@/lib/data/climate";

/** Server actions take bodies up to 2 MB (next.config.ts): a reading every 10 minutes for most of a year. */
const largestClimateLogBytes = 1_900_000;

const asTheFileSays = "file";

const uploadSchema = z.object({
  roomId: z.uuid("Open the room's page again."),
  timeZone: z.string().refine(isLoggerClockZone, "Choose the zone the logger's clock was set to."),
  dateOrder: z.enum([asTheFileSays, "dmy", "mdy"], "Choose a date order."),
  decimal: z.enum([asTheFileSays, ".", ","], "Choose a decimal mark."),
  temperatureUnit: z.enum([asTheFileSays, "C", "F"], "Choose a temperature unit."),
  file: z
    .instanceof(File, { message: "Choose the logger's CSV file." })
    .refine((file) => file.size > 0, "Choose the logger's CSV file; this one is empty.")
    .refine(
      (file) => file.size <= largestClimateLogBytes,
      "The file is over 1.9 MB. Export fewer days from the logger (for example one month per file) and upload each.",
    ),
});

export const uploadClimateLogAction = guardedAction("climate-log:upload", uploadSchema, async (input, member) => {
  const result = await uploadClimateLog(member, {
    roomId: input.roomId,
    fileName: input.file.name.replace(/[\\/\u0000-\u001f]/g, "_").slice(0, 200) || "climate-log.csv",
    bytes: new Uint8Array(await input.file.arrayBuffer()),
    options: {
      timeZone: input.timeZone,
      dateOrder: input.dateOrder === asTheFileSays ? undefined : input.dateOrder,
      decimal: input.decimal === asTheFileSays ? undefined : input.decimal,
      temperatureUnit: input.temperatureUnit === asTheFileSays ? undefined : input.temperatureUnit,
    },
  });
  revalidatePath(`/rooms/${input.roomId}/climate`);
  return {
    status: "ok",
    message: `Stored ${result.stored} readings (${result.shape}).${
      result.skipped ? ` ${result.skipped} readings fall in times the room's earlier logs already cover and were left out.` : ""
    }`,
  };
});
