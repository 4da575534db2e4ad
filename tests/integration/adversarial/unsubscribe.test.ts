import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { chooseRemindersAction } from "@/app/(auth)/unsubscribe/[token]/actions";
import { closeDatabase } from "@/db/client";
import { getReminderChoice } from "@/lib/data/trials";
import { signOptOutToken } from "@/lib/trials/reminder-opt-out";
import { superuserPool } from "../support/database";

/**
 * Mail scanners and link previews open every link in a message. Before, opening the unsubscribe
 * link stopped the farm's reminders at once, so a scanner could stop them unasked. Now the page
 * only reads; a click stops them, and another click undoes it.
 */

let inspector: Pool;
let enrolment: { id: string; code: string; allowed: boolean };
let token: string;

const allowed = async () =>
  (await inspector.query<{ reminders_allowed: boolean }>("select reminders_allowed from trial_enrolments where id = $1", [enrolment.id]))
    .rows[0].reminders_allowed;

function form(fields: Record<string, string>): FormData {
  const data = new FormData();
  for (const [name, value] of Object.entries(fields)) data.set(name, value);
  return data;
}

beforeAll(async () => {
  inspector = superuserPool();
  const { rows } = await inspector.query<{ id: string; code: string; reminders_allowed: boolean }>(
    "select e.id, t.code, e.reminders_allowed from trial_enrolments e join trials t on t.id = e.trial_id order by t.code, e.id limit 1",
  );
  enrolment = { id: rows[0].id, code: rows[0].code, allowed: rows[0].reminders_allowed };
  await inspector.query("update trial_enrolments set reminders_allowed = true where id = $1", [enrolment.id]);
  token = signOptOutToken(enrolment.id, process.env.AUTH_SECRET!);
});

afterAll(async () => {
  await inspector.query("update trial_enrolments set reminders_allowed = $2 where id = $1", [enrolment.id, enrolment.allowed]);
  await inspector.end();
  await closeDatabase();
});

describe("the unsubscribe link", () => {
  it("opened any number of times (a mail scanner), changes nothing and says what a click would do", async () => {
    for (let opened = 0; opened < 3; opened++) {
      expect(await getReminderChoice(token)).toEqual({ trialCode: enrolment.code, remindersAllowed: true });
    }
    expect(await allowed()).toBe(true);
  });

  it("stops reminders on a click, and the undo brings them back", async () => {
    expect(await chooseRemindersAction({ status: "idle" }, form({ token, choice: "stop" }))).toEqual({ status: "ok", message: "stop" });
    expect(await allowed()).toBe(false);
    expect(await getReminderChoice(token)).toMatchObject({ remindersAllowed: false });
    expect(await chooseRemindersAction({ status: "idle" }, form({ token, choice: "resume" }))).toEqual({ status: "ok", message: "resume" });
    expect(await allowed()).toBe(true);
  });

  it("does nothing for a forged or altered link, nor without a choice", async () => {
    const altered = token.replace(/.$/, (last) => (last === "A" ? "B" : "A"));
    expect(await getReminderChoice(altered)).toBeNull();
    expect(await chooseRemindersAction({ status: "idle" }, form({ token: altered, choice: "stop" }))).toMatchObject({ status: "error" });
    expect(await chooseRemindersAction({ status: "idle" }, form({ token }))).toMatchObject({ status: "error" });
    expect(await allowed()).toBe(true);
  });
});
