import type { FormFieldSpec } from "@/components/forms/action-form";
import type { RegimeKind, RoomSummary } from "@/lib/data/rooms";
import { humidityModeLabels, roomFreshAirLabels, roomKindLabels } from "@/lib/rooms/lists";

const optionsOf = (labels: Record<string, string>) => Object.entries(labels).map(([value, label]) => ({ value, label }));

/** A room's fields, for adding one (blank) or changing one (its stored values). */
export function roomFormFields(room?: RoomSummary): FormFieldSpec[] {
  return [
    { name: "name", label: "Name", hint: "As your people call it, e.g. Tub 1 or Back tent.", defaultValue: room?.name },
    { name: "kind", label: "What it is", options: optionsOf(roomKindLabels), defaultValue: room?.kind },
    {
      name: "volume",
      label: "Inside size",
      hint: "Optional. In the unit picked below, e.g. 120 litres or 2.5 m³.",
      defaultValue: room?.volumeM3 == null ? "" : String(room.volumeM3),
    },
    {
      name: "volumeUnit",
      label: "Size in",
      options: [
        { value: "m3", label: "cubic metres (m³)" },
        { value: "L", label: "litres (L)" },
      ],
      defaultValue: room ? "m3" : "L",
    },
    { name: "freshAir", label: "How fresh air gets in", options: optionsOf(roomFreshAirLabels), defaultValue: room?.freshAir },
    { name: "notes", label: "Notes", hint: "Optional: where it is, what it is made of.", defaultValue: room?.notes },
  ];
}

/** A regime change: the day, the co-op's kind, the humidity mode and each mode's own fields, then the rest. */
export function regimeFormFields(kinds: RegimeKind[], today: string): FormFieldSpec[] {
  return [
    { name: "startsOn", label: "Run this way from", type: "date", defaultValue: today },
    {
      name: "regimeKindId",
      label: "Climate regime (the co-op's list)",
      options: [{ value: "", label: "Not one of the co-op's" }, ...kinds.map((kind) => ({ value: kind.id, label: kind.name }))],
      hint: "Naming the co-op's kind lets the co-op compare rooms run the same way.",
    },
    { name: "humidityMode", label: "How the humidity is kept", options: optionsOf(humidityModeLabels) },
    { name: "cycleOnMinutes", label: "Misted: minutes on each time", type: "number", hint: "For a misted room only, e.g. 2." },
    {
      name: "cycleOffMinutes",
      label: "Misted: minutes off between",
      type: "number",
      hint: "For a misted room only, e.g. 13; 0 if it never stops.",
    },
    { name: "floodStartsAt", label: "Soaked: the soak starts at", type: "time", hint: "For a soaked room only, e.g. 07:00." },
    { name: "floodHours", label: "Soaked: hours it stays soaked", hint: "For a soaked room only, e.g. 3 or 1.5." },
    { name: "airChangesPerHour", label: "Fresh air: changes an hour", hint: "Optional, e.g. 4." },
    { name: "temperatureSetC", label: "Temperature set point (°C)", hint: "Optional, e.g. 18." },
    { name: "cleaningEveryDays", label: "Cleaned every … days", type: "number", hint: "Optional; 1 for every day." },
    { name: "notes", label: "Notes", hint: "Optional." },
  ];
}
