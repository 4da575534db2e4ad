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
