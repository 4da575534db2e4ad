import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, withFarmContext } from "@/db/client";
import { trialEnrolments } from "@/db/schema";
import { farmContextOf } from "@/lib/data/context";
import { loadMember, type Member } from "@/lib/data/members";
import { askToJoinTrial, getOwnEnrolment, listOwnAssignments, listTrialHistory, respondToInvitation } from "@/lib/data/trials";
import { CoopFixture } from "./adversarial/support/co-op-fixtures";
import { superuserPool } from "./support/database";

// A farm asks to join an open trial it was not invited to; another farm, a grower, a trial that is
// not open and a forged farm id must not get the same.

let inspector: Pool;
let fixture: CoopFixture;
let coordinator: Member;
let farms: { id: string; manager: Member }[];
let species: { id: string; strainIds: string[] };

async function trialIn(status: "open" | "running" | "draft") {
  const trial = await fixture.runningTrial(
    species.id,
    [
      { label: "A", strainId: species.strainIds[0], reference: true },
      { label: "B", strainId: species.strainIds[1] },
    ],
    [farms[0].id],
  );
  await inspector.query("update trials set status = $2 where id = $1", [trial.id, status]);
  return trial.id;
}

beforeAll(async () => {
  inspector = superuserPool();
  fixture = new CoopFixture(inspector);
  const { rows } = await inspector.query<{ id: string }>("select id from users where email = 'coordinator@aldervalley.example'");
  coordinator = (await loadMember(rows[0].id))!;
  species = await fixture.species("Join oyster", ["Join strain A", "Join strain B"]);
  farms = await Promise.all(["Invited", "Asking", "Other"].map((name) => fixture.farm(`${name} Farm`)));
});

afterAll(async () => {
  await fixture.dispose();
  await inspector.end();
  await closeDatabase();
});

describe("asking to join an open trial", () => {
  it("puts the farm on the list, lets it accept as if invited, and shows the coordinator", async () => {
    const trialId = await trialIn("open");
    const asking = farms[1].manager;
    expect(await getOwnEnrolment(asking, trialId)).toBeNull();
    await askToJoinTrial(asking, trialId);
    expect((await getOwnEnrolment(asking, trialId))?.status).toBe("invited");
    await respondToInvitation(asking, trialId, { accept: true, blocksPerArm: 2 });
    expect(await listOwnAssignments(asking, trialId)).toHaveLength(4);
    const history = await listTrialHistory(coordinator, trialId);
    expect(history.find((event) => event.action === "trial.farm_asked_to_join")?.actorLabel).toBe(asking.name);
    // Another farm sees nothing of it.
    expect(await getOwnEnrolment(farms[2].manager, trialId)).toBeNull();
    await expect(askToJoinTrial(asking, trialId)).rejects.toMatchObject({ code: "conflict" });
  });

  it("is refused for a trial that is not open, a draft, and anyone but a farm manager", async () => {
    await expect(askToJoinTrial(farms[1].manager, await trialIn("running"))).rejects.toMatchObject({ code: "conflict" });
    await expect(askToJoinTrial(farms[1].manager, await trialIn("draft"))).rejects.toMatchObject({ code: "not_found" });
    const open = await trialIn("open");
    const {
      rows: [grower],
    } = await inspector.query<{ id: string }>(
      "insert into users (email, name, role, farm_id) values ($1, 'Grower of Asking', 'grower', $2) returning id",
      [`grower-${fixture.run.toLowerCase()}@fixture.example`, farms[1].id],
    );
    for (const member of [(await loadMember(grower.id))!, coordinator])
      await expect(askToJoinTrial(member, open)).rejects.toMatchObject({ code: "forbidden" });
    await inspector.query("delete from users where id = $1", [grower.id]);
  });

  it("cannot put another farm on the list, even written straight through the tenant door", async () => {
    const open = await trialIn("open");
    await expect(
      withFarmContext(farmContextOf(farms[1].manager), (tx) => tx.insert(trialEnrolments).values({ trialId: open, farmId: farms[2].id })),
    ).rejects.toMatchObject({ cause: { message: expect.stringMatching(/row-level security/) as unknown } });
    const { rows } = await inspector.query("select 1 from trial_enrolments where trial_id = $1 and farm_id = $2", [open, farms[2].id]);
    expect(rows).toEqual([]);
  });
});
