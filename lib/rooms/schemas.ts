/**
 * What a room, a regime change and a block's move must be, for every way in (the forms, the
 * phone's queue, the demo): the form's strings in, typed values out, each refusal worded for the
 * person who typed it.
 */
import { z } from "zod";
import { humidityModes, roomFreshAirs, roomKinds } from "./lists";

const isoDay = (message: string) =>
  z
    .string({ error: message })
    .regex(/^\d{4}-\d{2}-\d{2}$/, message)
    .refine(
      (day) => !Number.isNaN(Date.parse(`${day}T00:00:00Z`)) && new Date(`${day}T00:00:00Z`).toISOString().startsWith(day),
      "Choose a real day.",
    );

const id = (message: string) => z.uuid({ error: message });

/** "" → null; "1,5" or "1.5" → 1.5; anything else unreadable → NaN (refused by the checks after). */
function readNumber(typed: string | undefined): number | null {
  const text = (typed ?? "").trim();
  if (text === "") return null;
  if (!/^-?\d+([.,]\d+)?$/.test(text)) return Number.NaN;
  return Number(text.replace(",", "."));
}

const typed = z.string().max(50, "Write a number, e.g. 12 or 1.5.").optional();

const roomFields = z.object({
  name: z.string().trim().min(1, "Give the room a name, e.g. Tub 1 or Back tent.").max(100, "A room's name is at most 100 characters."),
  kind: z.enum(roomKinds, { error: "Choose what it is: a tub, a tent, a room or other." }),
  volume: typed,
  volumeUnit: z.enum(["L", "m3"], { error: "Choose litres or cubic metres." }).default("m3"),
  freshAir: z.enum(roomFreshAirs, { error: "Choose how fresh air gets in." }),
  notes: z.string().trim().max(1000, "Notes are at most 1000 characters.").default(""),
});

function checkVolume(room: { volume?: string }, context: z.RefinementCtx): void {
  const volume = readNumber(room.volume);
  if (volume !== null && (Number.isNaN(volume) || volume <= 0))
    context.addIssue({
      code: "custom",
      path: ["volume"],
      message: "Write the inside size as a number above 0, e.g. 120 (litres) or 2.5 (m³), or leave it blank.",
    });
  else if (volume !== null && /^\d+,\d{3}$/.test((room.volume ?? "").trim()))
    context.addIssue({
      code: "custom",
      path: ["volume"],
      message: "Is the comma a thousands separator? Write the size without it, e.g. 1000, or with a point: 1.5.",
    });
}

function roomValues(room: z.infer<typeof roomFields>) {
  const volume = readNumber(room.volume);
  return {
    name: room.name,
    kind: room.kind,
    volumeM3: volume === null ? null : room.volumeUnit === "L" ? volume / 1000 : volume,
    freshAir: room.freshAir,
    notes: room.notes,
  };
}

export const roomSchema = roomFields.superRefine(checkVolume).transform(roomValues);

export type RoomInput = z.infer<typeof roomSchema>;

export const roomEditSchema = roomFields
  .extend({ roomId: id("Pick the room from your rooms.") })
  .superRefine(checkVolume)
  .transform((room) => ({ roomId: room.roomId, ...roomValues(room) }));

/** Retiring (a day) or bringing back (no day) a room; its history stays either way. */
export const roomRetirementSchema = z.object({
  roomId: id("Pick the room from your rooms."),
  retiredOn: z.union([z.literal(""), isoDay("Choose the day the room stopped being used.")]).transform((day) => (day === "" ? null : day)),
});

function numberField(
  context: z.RefinementCtx,
  field: string,
  text: string | undefined,
  check: { min: number; max: number; whole?: boolean; message: string },
): void {
  const value = readNumber(text);
  if (value === null) return;
  if (Number.isNaN(value) || value < check.min || value > check.max || (check.whole && !Number.isInteger(value)))
    context.addIssue({ code: "custom", path: [field], message: check.message });
}

/** A change of how a room is run, from its start day on; each humidity mode has fields of its own. */
export const regimeChangeSchema = z
  .object({
    roomId: id("Pick the room from your rooms."),
    startsOn: isoDay("Choose the day the room started being run this way."),
    regimeKindId: z
      .union([z.literal(""), id("Pick a climate regime from the co-op's list, or leave it unset.")])
      .optional()
      .transform((kind) => (kind ? kind : null)),
    humidityMode: z.enum(humidityModes, { error: "Choose how the humidity is kept: misted on a cycle, or soaked daily." }),
    cycleOnMinutes: typed,
    cycleOffMinutes: typed,
    floodStartsAt: z.string().max(10).optional(),
    floodHours: typed,
    airChangesPerHour: typed,
    temperatureSetC: typed,
    cleaningEveryDays: typed,
    notes: z.string().trim().max(1000, "Notes are at most 1000 characters.").default(""),
  })
  .superRefine((regime, context) => {
    const blank = (text: string | undefined) => (text ?? "").trim() === "";
    if (regime.humidityMode === "cycling") {
      if (blank(regime.cycleOnMinutes))
        context.addIssue({
          code: "custom",
          path: ["cycleOnMinutes"],
          message: "Enter how many minutes the mister runs each time, e.g. 2.",
        });
      if (blank(regime.cycleOffMinutes))
        context.addIssue({
          code: "custom",
          path: ["cycleOffMinutes"],
          message: "Enter the minutes it rests between runs, e.g. 13 (0 if it never stops).",
        });
      numberField(context, "cycleOnMinutes", regime.cycleOnMinutes, {
        min: 1,
        max: 1440,
        whole: true,
        message: "Whole minutes, from 1 to 1440.",
      });
      numberField(context, "cycleOffMinutes", regime.cycleOffMinutes, {
        min: 0,
        max: 1440,
        whole: true,
        message: "Whole minutes, from 0 to 1440.",
      });
      for (const field of ["floodStartsAt", "floodHours"] as const)
        if (!blank(regime[field]))
          context.addIssue({ code: "custom", path: [field], message: "Leave this blank for a misted room, or choose “Soaked daily”." });
    } else {
      if (!/^([01]\d|2[0-3]):[0-5]\d$/.test((regime.floodStartsAt ?? "").trim()))
        context.addIssue({ code: "custom", path: ["floodStartsAt"], message: "Enter the time the soak starts, e.g. 07:00." });
      if (blank(regime.floodHours))
        context.addIssue({ code: "custom", path: ["floodHours"], message: "Enter how many hours it stays soaked, e.g. 3." });
      numberField(context, "floodHours", regime.floodHours, { min: 0.1, max: 24, message: "Hours, more than 0 and at most 24." });
      for (const field of ["cycleOnMinutes", "cycleOffMinutes"] as const)
        if (!blank(regime[field]))
          context.addIssue({
            code: "custom",
            path: [field],
            message: "Leave this blank for a soaked room, or choose “Misted on a cycle”.",
          });
    }
    numberField(context, "airChangesPerHour", regime.airChangesPerHour, {
      min: 0,
      max: 1000,
      message: "Air changes an hour: a number from 0, e.g. 4.",
    });
    numberField(context, "temperatureSetC", regime.temperatureSetC, {
      min: -10,
      max: 50,
      message: "A set point in °C between -10 and 50.",
    });
    numberField(context, "cleaningEveryDays", regime.cleaningEveryDays, {
      min: 1,
      max: 366,
      whole: true,
      message: "Whole days, 1 or more (1 = every day).",
    });
  })
  .transform((regime) => {
    const cycling = regime.humidityMode === "cycling";
    return {
      roomId: regime.roomId,
      startsOn: regime.startsOn,
      regimeKindId: regime.regimeKindId,
      humidityMode: regime.humidityMode,
      cycleOnMinutes: cycling ? readNumber(regime.cycleOnMinutes) : null,
      cycleOffMinutes: cycling ? readNumber(regime.cycleOffMinutes) : null,
      floodStartsAt: cycling ? null : (regime.floodStartsAt ?? "").trim(),
      floodHours: cycling ? null : readNumber(regime.floodHours),
      airChangesPerHour: readNumber(regime.airChangesPerHour),
      temperatureSetC: readNumber(regime.temperatureSetC),
      cleaningEveryDays: readNumber(regime.cleaningEveryDays),
      notes: regime.notes,
    };
  });

export type RegimeChangeInput = z.infer<typeof regimeChangeSchema>;

/** A block carried into a room on a day; no day means it has been there from the start of fruiting. */
export const moveSchema = z.object({
  blockId: id("Pick the block from your blocks."),
  roomId: id("Choose the room the block went to."),
  movedOn: z
    .union([z.literal(""), isoDay("Choose the day it was moved, or leave it blank for “from the start of fruiting”.")])
    .optional()
    .transform((day) => (day ? day : null)),
});

export type MoveInput = z.infer<typeof moveSchema>;

/** The phone form's room picker: blank (left as it is) or one of the farm's rooms. */
export const roomPickSchema = z
  .union([z.literal(""), id("Pick the room from the list, or leave it as it is.")])
  .optional()
  .transform((room) => (room ? room : null));
