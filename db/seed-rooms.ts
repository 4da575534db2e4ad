/**
 * The demo's fruiting rooms: the co-op's climate regime kinds, a few invented rooms on three farms
 * with their regimes over the season, and some of each farm's blocks carried into them. Written
 * through the data layer as each farm's manager would record them, so the rows, their checks and
 * the activity log are what the app itself makes.
 */
import { and, asc, eq, isNull } from "drizzle-orm";
import type { NodePgDatabase } from "drizzle-orm/node-postgres";
import { withFarmContext } from "./client";
import * as schema from "./schema";
import { loadMember } from "@/lib/data/members";
import { addRoom, moveBlock, recordRegimeChange } from "@/lib/data/rooms";
import { regimeChangeSchema, roomSchema } from "@/lib/rooms/schemas";

function addDays(isoDate: string, days: number): string {
  const day = new Date(`${isoDate}T00:00:00Z`);
  day.setUTCDate(day.getUTCDate() + days);
  return day.toISOString().slice(0, 10);
}

interface RegimePlan {
  fromDay: number;
  kind: "MIST-ALLDAY" | "SOAK-DAILY" | null;
  [setting: string]: string | number | null;
}

interface RoomPlan {
  room: Record<string, string>;
  regimes: RegimePlan[];
}

const misted = (on: string, off: string) => ({ humidityMode: "cycling", cycleOnMinutes: on, cycleOffMinutes: off });
const soaked = (at: string, hours: string) => ({ humidityMode: "flooding", floodStartsAt: at, floodHours: hours });

// Days are counted from the seed's today; the demo's blocks were inoculated within the last 185 days.
const farmRooms: Record<string, RoomPlan[]> = {
  "Fernbrook Farm": [
    {
      room: {
        name: "Tub 1",
        kind: "tub",
        volume: "120",
        volumeUnit: "L",
        freshAir: "filter_holes",
        notes: "Clear tote by the north wall.",
      },
      regimes: [{ fromDay: -200, kind: "SOAK-DAILY", ...soaked("07:00", "3"), cleaningEveryDays: "14" }],
    },
    {
      room: { name: "Back tent", kind: "tent", volume: "1.2", volumeUnit: "m3", freshAir: "fan_timer", notes: "" },
      regimes: [
        { fromDay: -200, kind: "MIST-ALLDAY", ...misted("2", "13"), airChangesPerHour: "4", temperatureSetC: "18", cleaningEveryDays: "7" },
        { fromDay: -60, kind: "MIST-ALLDAY", ...misted("1", "9"), airChangesPerHour: "6", temperatureSetC: "17", cleaningEveryDays: "7" },
      ],
    },
  ],
  "Hollow Oak Mushrooms": [
    {
      room: {
        name: "Barn room",
        kind: "room",
        volume: "18",
        volumeUnit: "m3",
        freshAir: "fan_always",
        notes: "Insulated stall in the old barn.",
      },
      regimes: [
        { fromDay: -200, kind: "MIST-ALLDAY", ...misted("3", "12"), airChangesPerHour: "5", temperatureSetC: "16" },
        {
          fromDay: -90,
          kind: "SOAK-DAILY",
          ...soaked("06:30", "2.5"),
          airChangesPerHour: "5",
          temperatureSetC: "16",
          cleaningEveryDays: "10",
        },
      ],
    },
  ],
  "Mill Creek Fungi": [
    {
      room: { name: "Shelf tent", kind: "tent", volume: "800", volumeUnit: "L", freshAir: "opened_by_hand", notes: "" },
      regimes: [{ fromDay: -200, kind: "SOAK-DAILY", ...soaked("08:00", "4"), cleaningEveryDays: "21" }],
    },
  ],
};

export async function seedDemoRooms(owner: NodePgDatabase<typeof schema>, today: string): Promise<void> {
  const kinds = await owner
    .insert(schema.treatments)
    .values([
      {
        code: "MIST-ALLDAY",
        name: "Misted all day",
        kind: "humidity",
        description: "A mister or fogger on a timer, a few minutes on and a few off, day and night.",
      },
      {
        code: "SOAK-DAILY",
        name: "Soaked once a day",
        kind: "humidity",
        description: "Flooded or sprayed heavily for a few hours once a day, then left to dry out until the next day.",
      },
    ])
    .returning({ id: schema.treatments.id, code: schema.treatments.code });
  const kindId = new Map(kinds.map((kind) => [kind.code, kind.id]));

  for (const [farmName, plans] of Object.entries(farmRooms)) {
    const [farm] = await owner.select({ id: schema.farms.id }).from(schema.farms).where(eq(schema.farms.name, farmName));
    if (!farm) continue;
    const [manager] = await owner
      .select({ id: schema.users.id })
      .from(schema.users)
      .where(and(eq(schema.users.farmId, farm.id), eq(schema.users.role, "farm_manager")));
    const member = manager ? await loadMember(manager.id) : null;
    if (!member?.farmId) continue;
    const farmId = member.farmId;
    const roomIds: string[] = [];
    for (const plan of plans) {
      const { id } = await addRoom(member, roomSchema.parse(plan.room));
      roomIds.push(id);
      for (const { fromDay, kind, ...settings } of plan.regimes) {
        await recordRegimeChange(
          member,
          regimeChangeSchema.parse({
            roomId: id,
            startsOn: addDays(today, fromDay),
            regimeKindId: kind ? kindId.get(kind) : "",
            ...settings,
          }),
        );
      }
    }
    // Blocks still fruiting, the farm's own, read as its manager (blocks are under forced row-level security).
    const fruiting = await withFarmContext({ userId: member.id, farmId, role: "farm_manager" }, (tx) =>
      tx
        .select({ id: schema.blocks.id })
        .from(schema.blocks)
        .where(and(eq(schema.blocks.farmId, farmId), isNull(schema.blocks.spentMassG), eq(schema.blocks.contaminated, false)))
        .orderBy(asc(schema.blocks.code))
        .limit(12),
    );
    for (const [index, block] of fruiting.entries()) {
      const room = roomIds[index % roomIds.length];
      await moveBlock(member, { blockId: block.id, roomId: room, movedOn: null });
      // A few carried from the first room to the last one lately, as growers do between a table and the tub.
      if (roomIds.length > 1 && index % 4 === 0)
        await moveBlock(member, { blockId: block.id, roomId: roomIds.at(-1)!, movedOn: addDays(today, -10) });
    }
    console.log(
      `  ${farmName}: ${plans.length} fruiting ${plans.length === 1 ? "room" : "rooms"}, ${fruiting.length} blocks placed in them`,
    );
  }
}
