/**
 * The values of a room's and a regime's lists that the database keeps as enums (db/schema/enums.ts
 * builds them from here) and the forms check against: written once.
 */
export const roomKinds = ["tub", "tent", "room", "other"] as const;
/** How fresh air gets in: passive filter holes, a fan on a timer, a fan always on, opened by hand. */
export const roomFreshAirs = ["filter_holes", "fan_timer", "fan_always", "opened_by_hand"] as const;
/** "cycling": a mister or fogger on and off all day; "flooding": soaked once a day, then left to dry. */
export const humidityModes = ["cycling", "flooding"] as const;

export type RoomKind = (typeof roomKinds)[number];
export type RoomFreshAir = (typeof roomFreshAirs)[number];
export type HumidityMode = (typeof humidityModes)[number];

export const roomKindLabels: Record<RoomKind, string> = { tub: "Tub", tent: "Tent", room: "Room", other: "Other" };
export const roomFreshAirLabels: Record<RoomFreshAir, string> = {
  filter_holes: "Filter holes (passive)",
  fan_timer: "Fan on a timer",
  fan_always: "Fan always on",
  opened_by_hand: "Opened by hand",
};
export const humidityModeLabels: Record<HumidityMode, string> = {
  cycling: "Misted on a cycle (mister or fogger on and off all day)",
  flooding: "Soaked daily (flooded for a few hours, then left to dry)",
};

/** A room's inside size as a grower says it: litres under a cubic metre ("120 L"), else m³ ("2.5 m³"). */
export function sizeInWords(volumeM3: number | null): string {
  if (volumeM3 === null) return "not given";
  const rounded = (value: number) => String(Math.round(value * 100) / 100);
  return volumeM3 < 1 ? `${rounded(volumeM3 * 1000)} L` : `${rounded(volumeM3)} m³`;
}
