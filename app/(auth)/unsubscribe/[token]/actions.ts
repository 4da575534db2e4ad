"use server";

import { z } from "zod";
import type { ActionState } from "@/lib/auth/guard";
import { optBackIntoReminders, optOutOfReminders } from "@/lib/data/trials";

const choiceSchema = z.object({
  token: z.string().min(1, "Open the link from the e-mail again."),
  choice: z.enum(["stop", "resume"], "Use one of the buttons on the page."),
});

/**
 * Signed-out: the signed link is the authority. Only a click on the page stops (or resumes) the
 * reminders, never opening the link. The state's message says which was done: "stop" or "resume".
 */
export async function chooseRemindersAction(_previous: ActionState, formData: FormData): Promise<ActionState> {
  const parsed = choiceSchema.safeParse(Object.fromEntries(formData));
  if (!parsed.success) return { status: "error", message: parsed.error.issues[0].message };
  const { token, choice } = parsed.data;
  const trialCode = choice === "stop" ? await optOutOfReminders(token) : await optBackIntoReminders(token);
  if (!trialCode)
    return {
      status: "error",
      message: "The link is incomplete or was not made by Rhizomorph. Copy the whole link from the e-mail, or ask the coordinator.",
    };
  return { status: "ok", message: choice };
}
