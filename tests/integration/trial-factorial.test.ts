import type { Pool } from "pg";
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { FactorialResults } from "@/app/(app)/trials/_components/factorial-results";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase } from "@/db/client";
import { loadMember, type Member } from "@/lib/data/members";
import {
  getCloseReview,
  getTrial,
  inviteFarms,
  listOwnAssignments,
  moveTrial,
  respondToInvitation,
  saveTrialDraft,
  type TrialDesignInput,
} from "@/lib/data/trials";
import { seededRandom } from "@/lib/random";
import { factorialAnova } from "@/lib/stats";
import { crossedArms } from "@/lib/trials/factorial";
import { CoopFixture } from "./adversarial/support/co-op-fixtures";
import { superuserPool } from "./support/database";

// A trial crossing two strains with two fruiting methods, from the design through lib/data to
// its stored analysis: the arms are saved as a crossing, the farms enrol and make their blocks,
// and closing runs the factorial analysis, whose answer names the methods and strains.

let inspector: Pool;
let fixture: CoopFixture;
let coordinator: Member;
let farms: { id: string; manager: Member }[];
let strainIds: string[];
let methodIds: string[];
let trialId: string;
let design: TrialDesignInput;
/** Every analysed block's BE with its farm and levels, as the test made them. */
const made: { farm: string; method: string; strain: string; be: number }[] = [];

async function memberByEmail(email: string): Promise<Member> {
  const { rows } = await inspector.query<{ id: string }>("select id from users where email = $1", [email]);
  return (await loadMember(rows[0].id))!;
}

beforeAll(async () => {
  inspector = superuserPool();
  fixture = new CoopFixture(inspector);
  coordinator = await memberByEmail("coordinator@aldervalley.example");
  const species = await fixture.species("Crossed oyster", ["Grey Morning", "Valley Wild"]);
  strainIds = species.strainIds;
  methodIds = [await fixture.method("Opened top"), await fixture.method("Horizontal slits")];
  farms = await Promise.all(["Alder Bend", "Brook Lea", "Copse End", "Dale Foot"].map((name) => fixture.farm(`${name} Mushrooms`)));
  design = {
    title: "Slits or an opened top, for two oyster strains",
    question: "Do horizontal slits give more BE than an opened top, and does that depend on the strain?",
    speciesId: species.id,
    designKind: "strain_by_method",
    arms: crossedArms(strainIds, methodIds),
    outcomeFlushes: 2,
    contaminatedHandling: "exclude",
    protocolNotes: "",
    enrolmentDeadline: null,
    inoculationFrom: null,
    inoculationTo: null,
    fruitingFrom: null,
    fruitingTo: null,
    dataDue: null,
    smallestDifference: 6,
    expectedSd: 5,
    plannedFarms: 4,
    expectedLoss: 0,
  };
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

describe("a trial crossing strains with fruiting methods", () => {
  it("refuses arms that do not cross every strain with every method, saying which combination is missing", async () => {
    const missing = await saveTrialDraft(coordinator, { ...design, arms: design.arms.slice(0, 3) }).catch((error: unknown) => error);
    expect(missing).toMatchObject({ code: "invalid_input" });
    expect((missing as Error).message).toMatch(
      /^No arm is Valley Wild with Horizontal slits \S+; a crossed trial needs every combination\.$/,
    );
    await expect(
      saveTrialDraft(coordinator, {
        ...design,
        arms: design.arms.map((arm, index) => (index === 1 ? { ...arm, treatmentId: null } : arm)),
      }),
    ).rejects.toMatchObject({ message: "Arm B: pick its fruiting method; in a crossed trial every arm is one strain with one method." });
  });

  it("saves the crossing as four arms, each one strain with one method", async () => {
    const saved = await saveTrialDraft(coordinator, design);
    trialId = saved.id;
    const trial = await getTrial(coordinator, trialId);
    expect(trial.designKind).toBe("strain_by_method");
    expect(trial.arms.map((arm) => [arm.label, arm.strainName, arm.treatmentName?.replace(/ \S+$/, ""), arm.isReference])).toEqual([
      ["A", "Grey Morning", "Opened top", true],
      ["B", "Grey Morning", "Horizontal slits", false],
      ["C", "Valley Wild", "Opened top", false],
      ["D", "Valley Wild", "Horizontal slits", false],
    ]);
  });

  it("does not open enrolment on half a crossing, should the arms change after the draft was saved", async () => {
    await inspector.query("update trial_arms set treatment_id = $1 where trial_id = $2 and label = 'D'", [methodIds[0], trialId]);
    await expect(moveTrial(coordinator, trialId, "open")).rejects.toMatchObject({
      code: "conflict",
      message: expect.stringMatching(/^Two arms are both Valley Wild with Opened top \S+; each combination is one arm\./) as unknown,
    });
    await inspector.query("update trial_arms set treatment_id = $1 where trial_id = $2 and label = 'D'", [methodIds[1], trialId]);
  });

  it("enrols four farms, whose blocks are analysed as a crossing when the trial closes", async () => {
    await moveTrial(coordinator, trialId, "open");
    await inviteFarms(
      coordinator,
      trialId,
      farms.map((farm) => farm.id),
    );
    for (const farm of farms) await respondToInvitation(farm.manager, trialId, { accept: true, blocksPerArm: 4 });
    await moveTrial(coordinator, trialId, "running");
    const trial = await getTrial(coordinator, trialId);
    // Slits add 6 BE points for both strains, Valley Wild 3 over Grey Morning: no interaction in truth.
    const random = seededRandom("slits and tops");
    for (const farm of farms) {
      const list = await listOwnAssignments(farm.manager, trialId);
      expect(list).toHaveLength(16);
      const farmEffect = random.normal(0, 8);
      for (const arm of trial.arms) {
        const slits = arm.treatmentId === methodIds[1] ? 6 : 0;
        const valley = arm.strainId === strainIds[1] ? 3 : 0;
        const blocks = list
          .filter((entry) => entry.armLabel === arm.label)
          .map(() => {
            const be = 80 + farmEffect + slits + valley + random.normal(0, 3);
            made.push({ farm: farm.id, method: arm.treatmentId!, strain: arm.strainId, be });
            // 1 000 g dry substrate per block, so BE % = fresh grams ÷ 10.
            return { trialArmId: arm.id, flushes: [be * 7, be * 3] };
          });
        await fixture.blocks(farm.id, arm.strainId, blocks);
      }
    }
    await moveTrial(coordinator, trialId, "collecting", { reviewed: (await getCloseReview(coordinator, trialId)).fingerprint });

    const { results } = await getTrial(coordinator, trialId);
    const factorial = results!.factorial!;
    expect(factorial.factors).toEqual(["fruiting method", "strain"]);
    // The same blocks through lib/stats directly: method first, farm as block (type II, least-squares means).
    const direct = factorialAnova(made.map((block) => ({ a: block.method, b: block.strain, block: block.farm, y: block.be })));
    expect(factorial.anova!.first.p).toBeCloseTo(direct.a.p, 9);
    expect(factorial.anova!.interaction.ss).toBeCloseTo(direct.interaction.ss, 6);
    expect(factorial.anova!.farm.df).toBe(3);
    const [slits] = factorial.mainEffects[0];
    expect(slits.level).toMatch(/^Horizontal slits/);
    expect(slits.estimate).toBeCloseTo(-direct.aComparisons[0].difference, 9);
    expect(factorial.cellMeans.map((cell) => cell.blocks)).toEqual([16, 16, 16, 16]);
    expect(factorial.interactionMaterial, `interaction p = ${factorial.anova!.interaction.p}`).toBe(false);

    // The stored answer is the crossing's, in the methods' and strains' names, never an arm's letter.
    const answer = results!.analysis.answer;
    expect(answer).toBe(factorial.answer);
    expect(answer).toMatch(
      new RegExp(
        `^Horizontal slits \\S+ gave ${Math.round(slits.estimate)} BE points more than opened top \\S+, across both strains \\(95 % interval ${Math.round(slits.lower)} to ${Math.round(slits.upper)}\\)\\.`,
      ),
    );
    expect(answer).toContain("Valley Wild gave");
    expect(answer).toMatch(/did not clearly depend on the strain \(interaction p = 0\.\d{3}\)/);
    expect(answer).not.toMatch(/\barm\b/i);

    // The results page's tables of the crossing, as the server renders them.
    const html = renderToStaticMarkup(createElement(FactorialResults, { factorial }));
    expect(html).toContain("Does the fruiting method matter, does the strain, and does one depend on the other?");
    expect(html).toMatch(/<th scope="row"[^>]*>Fruiting method × strain<\/th>/);
    expect(html.match(/16 blocks/g)).toHaveLength(4);
    expect(html).toContain(`${factorial.mainEffects[0][0].estimate.toFixed(1)}<`);
  });
});
