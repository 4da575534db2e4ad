"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import type { ActionState } from "@/lib/auth/guard";
import { chooseRemindersAction } from "../actions";

/**
 * Asks before stopping a farm's trial reminders, and offers to undo either way. Opening the link
 * changes nothing: mail scanners open links too.
 */
export function ReminderChoice({ token, trialCode, remindersAllowed }: { token: string; trialCode: string; remindersAllowed: boolean }) {
  const [state, choose, pending] = useActionState<ActionState, FormData>(chooseRemindersAction, { status: "idle" });
  const allowed = state.status === "ok" ? state.message === "resume" : remindersAllowed;
  const after = "Invitations, your enrolment confirmation and published results still arrive.";
  let heading = `Stop reminders about trial ${trialCode}?`;
  let text = `Your farm gets reminder e-mails about trial ${trialCode}. ${after}`;
  if (!allowed) {
    heading = "Reminders stopped";
    text = `Your farm gets no more reminder e-mails about trial ${trialCode}. ${after}`;
  } else if (state.status === "ok") {
    heading = "Reminders are on again";
    text = `Your farm gets reminder e-mails about trial ${trialCode} again.`;
  }
  return (
    <>
      <h1 className="text-2xl font-semibold text-moss-800">{heading}</h1>
      <p className="mt-4 text-base text-ink" role="status">
        {text}
      </p>
      {state.status === "error" && state.message ? (
        <p role="alert" className="mt-4 rounded-lg bg-danger-bg px-3 py-2 text-sm text-danger-ink">
          {state.message}
        </p>
      ) : null}
      <form action={choose} className="mt-6">
        <input type="hidden" name="token" value={token} />
        <input type="hidden" name="choice" value={allowed ? "stop" : "resume"} />
        <Button type="submit" variant={allowed ? "primary" : "secondary"} disabled={pending}>
          {pending ? "Saving…" : allowed ? "Stop reminders" : "Undo: send reminders again"}
        </Button>
      </form>
    </>
  );
}
