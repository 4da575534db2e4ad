import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, withFarmContext } from "@/db/client";
import { farmContextOf } from "@/lib/data/context";
import { loadMember, type Member } from "@/lib/data/members";
import {
  getCloseReview,
  getTrial,
  getTrialListSeasonLog,
  inviteFarms,
  listOwnAssignments,
  listOwnRoomDraw,
  listTrialProgress,
  moveTrial,
  respondToInvitation,
  saveTrialDraft,
} from "@/lib/data/trials";
import { seededRandom } from "@/lib/random";
import { roomMeanAnalysis } from "@/lib/stats";
import { drawRoomsToArms } from "@/lib/trials/room-draw";
import { sql } from "drizzle-orm";
import { CoopFixture } from "./adversarial/support/co-op-fixtures";
import { superuserPool } from "./support/database";

// A room-level trial from enrolment to its analysis: each farm picks its own fruiting rooms, which
// are drawn to the arms with a recorded seed; the blocks of each room take its arm; closing analyses
// room means with farm as block. Room names stay the farm's own: another farm and the coordinator
// read none, and the stored report holds no room id or name.

let inspector: Pool;
let fixture: CoopFixture;
let coordinator: Member;
let farms: { id: string; manager: Member }[];
let roomsOf: Map<string, string[]>;
let trialId: string;
const made: { farm: string; room: string; arm: string; be: number }[] = [];

beforeAll(async () => {
  inspector = superuserPool();
  fixture = new CoopFixture(inspector);
  const { rows } = await inspector.query<{ id: string }>("select id from users where email = 'coordinator@aldervalley.example'");
  coordinator = (await loadMember(rows[0].id))!;
  const species = await fixture.species("Room oyster", ["Room Grey"]);
  const regimes = [await fixture.regimeKind("Misted all day"), await fixture.regimeKind("Soaked once a day")];
  farms = await Promise.all(["Ash Rooms", "Birch Rooms", "Cedar Rooms"].map((name) => fixture.farm(name)));
  roomsOf = new Map();
  for (const farm of farms) roomsOf.set(farm.id, await Promise.all([0, 1, 2, 3].map(() => fixture.room(farm.id, []))));
  const saved = await saveTrialDraft(coordinator, {
    title: "Misted or soaked rooms",
    question: "Do rooms misted all day give more BE than rooms soaked once a day?",
    speciesId: species.id,
    designKind: "rooms",
    arms: [
      { label: "A", strainId: species.strainIds[0], treatmentId: regimes[0], isReference: true },
      { label: "B", strainId: species.strainIds[0], treatmentId: regimes[1], isReference: false },
    ],
    outcomeFlushes: 2,
    contaminatedHandling: "exclude",
    protocolNotes: "",
    enrolmentDeadline: null,
    inoculationFrom: null,
    inoculationTo: null,
    fruitingFrom: null,
    fruitingTo: null,
    dataDue: null,
    smallestDifference: 8,
    expectedSd: 12,
    plannedFarms: 3,
    expectedLoss: 0,
    blocksPerRoom: 3,
    roomIcc: 0.1,
  });
  trialId = saved.id;
  await moveTrial(coordinator, trialId, "open");
  await inviteFarms(
    coordinator,
    trialId,
    farms.map((farm) => farm.id),
  );
});

afterAll(async () => {
  if (trialId) {
    await inspector.query("delete from blocks where trial_arm_id in (select id from trial_arms where trial_id = $1)", [trialId]);
    await inspector.query("delete from trials where id = $1", [trialId]);
  }
  await fixture.dispose();
  await inspector.end();
  await closeDatabase();
});

describe("a room-level trial", () => {
  it("refuses another farm's room and too few rooms, saying what to pick", async () => {
    const [ash, birch] = farms;
    await expect(
      respondToInvitation(birch.manager, trialId, {
        accept: true,
        blocksPerArm: null,
        roomIds: [roomsOf.get(ash.id)![0], roomsOf.get(birch.id)![0]],
      }),
    ).rejects.toMatchObject({ code: "invalid_input", message: expect.stringMatching(/rooms of your own farm/) as unknown });
    await expect(
      respondToInvitation(birch.manager, trialId, { accept: true, blocksPerArm: null, roomIds: [roomsOf.get(birch.id)![0]] }),
    ).rejects.toMatchObject({ code: "invalid_input", message: expect.stringMatching(/at least 2 of your fruiting rooms/) as unknown });
    // Nothing half-saved: the farm is still only invited.
    const { rows } = await inspector.query<{ status: string }>("select status from trial_enrolments where trial_id = $1 and farm_id = $2", [
      trialId,
      birch.id,
    ]);
    expect(rows[0].status).toBe("invited");
  });

  it("draws each farm's rooms to the arms, balanced and reproducible from the recorded seed, each room's blocks taking its arm", async () => {
    for (const farm of farms)
      await respondToInvitation(farm.manager, trialId, { accept: true, blocksPerArm: null, roomIds: roomsOf.get(farm.id)! });
    const trial = await getTrial(coordinator, trialId);
    const armIds = trial.arms.map((arm) => arm.id);
    for (const farm of farms) {
      const { rows } = await inspector.query<{ seed: string; blocks_per_arm: number }>(
        "select randomisation_seed as seed, blocks_per_arm from trial_enrolments where trial_id = $1 and farm_id = $2",
        [trialId, farm.id],
      );
      const stored = await inspector.query<{ room_id: string; arm_id: string; sequence: number }>(
        "select room_id, arm_id, sequence from trial_room_assignments where trial_id = $1 and farm_id = $2 order by sequence",
        [trialId, farm.id],
      );
      const replay = drawRoomsToArms({ seed: rows[0].seed, armIds, roomIds: roomsOf.get(farm.id)! });
      expect(stored.rows.map((row) => ({ sequence: row.sequence, roomId: row.room_id, armId: row.arm_id }))).toEqual(replay);
      expect(armIds.map((armId) => replay.filter((entry) => entry.armId === armId).length)).toEqual([2, 2]);
      expect(rows[0].blocks_per_arm).toBe(6);

      const draw = await listOwnRoomDraw(farm.manager, trialId);
      expect(draw).toHaveLength(4);
      const list = await listOwnAssignments(farm.manager, trialId);
      expect(list).toHaveLength(12);
      for (const entry of list) expect(draw.find((room) => room.roomName === entry.roomName)?.armLabel).toBe(entry.armLabel);
      // The list's season log places each block in its room, so an upload records where it fruits.
      const { csv } = await getTrialListSeasonLog(farm.manager, trialId);
      for (const entry of list) expect(csv).toMatch(new RegExp(`^${entry.blockCode},.*,${entry.roomName!},`, "m"));
    }
    const { rows: audit } = await inspector.query<{ details: unknown }>(
      "select details from audit_events where action = 'trial.enrolment_accepted' and details->>'trialId' = $1",
      [trialId],
    );
    expect(audit).toHaveLength(3);
    expect(audit[0].details).toMatchObject({ rooms: 4, blocks: 12 });
  });

  it("keeps the draw the farm's own: another farm and the coordinator read no room of it, by the app or by SQL", async () => {
    const [ash, birch] = farms;
    const ashRooms = (await listOwnRoomDraw(ash.manager, trialId)).map((room) => room.roomName);
    const birchSees = await listOwnRoomDraw(birch.manager, trialId);
    expect(birchSees.some((room) => ashRooms.includes(room.roomName))).toBe(false);
    const own = await withFarmContext(farmContextOf(ash.manager), (tx) =>
      tx.execute(sql`select room_id from trial_room_assignments where farm_id = ${ash.id}`),
    );
    expect(own.rows).toHaveLength(4);
    for (const member of [birch.manager, coordinator]) {
      const rows = await withFarmContext(farmContextOf(member), (tx) =>
        tx.execute(sql`select room_id from trial_room_assignments where farm_id = ${ash.id}`),
      );
      expect(rows.rows).toHaveLength(0);
    }
    expect(await listOwnRoomDraw(coordinator, trialId)).toEqual([]);
    const progress = await listTrialProgress(coordinator, await getTrial(coordinator, trialId));
    const shown = JSON.stringify(progress);
    for (const name of ashRooms) expect(shown).not.toContain(name);
  });

  it("analyses room means with farm as block when the trial closes, and stores no room's name, id or mean", async () => {
    await moveTrial(coordinator, trialId, "running");
    const trial = await getTrial(coordinator, trialId);
    const random = seededRandom("misted or soaked rooms");
    for (const farm of farms) {
      const draw = await inspector.query<{ room_id: string; arm_id: string }>(
        "select room_id, arm_id from trial_room_assignments where trial_id = $1 and farm_id = $2",
        [trialId, farm.id],
      );
      const farmEffect = random.normal(0, 8);
      for (const room of draw.rows) {
        // Soaked rooms give 6 points more; each room its own air (room effect SD 4), blocks within it SD 3.
        const roomEffect = random.normal(0, 4) + (room.arm_id === trial.arms[1].id ? 6 : 0);
        const blocks = [0, 1, 2].map(() => {
          const be = 80 + farmEffect + roomEffect + random.normal(0, 3);
          made.push({ farm: farm.id, room: room.room_id, arm: trial.arms.find((arm) => arm.id === room.arm_id)!.label, be });
          // 1 000 g dry substrate per block, so BE % = fresh grams ÷ 10.
          return { trialArmId: room.arm_id, flushes: [be * 7, be * 3] };
        });
        const ids = await fixture.blocks(farm.id, trial.arms[0].strainId, blocks);
        await fixture.move(farm.id, ids, room.room_id);
      }
    }
    await moveTrial(coordinator, trialId, "collecting", { reviewed: (await getCloseReview(coordinator, trialId)).fingerprint });
    const { results } = await getTrial(coordinator, trialId);
    const rooms = results!.rooms!;
    expect(rooms.unit).toBe("room");
    expect(rooms.roomsPerArm).toEqual([
      { label: "A", rooms: 6 },
      { label: "B", rooms: 6 },
    ]);
    // The same rooms through lib/stats directly (reference first, as the report orders the arms).
    const ordered = [...made].sort((a, b) => a.arm.localeCompare(b.arm));
    const direct = roomMeanAnalysis(
      ordered.map((block) => ({ farm: block.farm, room: block.room, treatment: block.arm, y: block.be })),
    ).analysis;
    expect(rooms.anova!.arm.f).toBeCloseTo(direct.treatment.f, 6);
    expect(rooms.anova!.residualDf).toBe(8);
    expect(rooms.versusReference[0].estimate).toBeCloseTo(-direct.comparisons[0].difference, 6);
    expect(rooms.iccObserved).not.toBeNull();
    expect(results!.analysis.anova).toBeNull();
    expect(results!.analysis.answer).toBe(rooms.answer);

    const stored = JSON.stringify(results);
    for (const block of made) expect(stored).not.toContain(block.room);
    const names = await inspector.query<{ name: string }>("select name from fruiting_rooms where farm_id = any($1)", [
      farms.map((farm) => farm.id),
    ]);
    for (const { name } of names.rows) expect(stored).not.toContain(`"${name}"`);
    // No room's own mean: none of the twelve room means appears to one decimal.
    const roomMeans = roomMeanAnalysis(
      made.map((block) => ({ farm: block.farm, room: block.room, treatment: block.arm, y: block.be })),
    ).rooms;
    for (const room of roomMeans) expect(stored).not.toContain(String(room.mean));
  });
});
