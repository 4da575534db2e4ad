"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import type { ActionState } from "@/lib/auth/guard";
import { undoCommitAction } from "./actions";

const initial: ActionState = { status: "idle" };

export function UndoCommitForm({ uploadId }: { uploadId: string }) {
  const [state, action, pending] = useActionState(undoCommitAction, initial);
  if (state.status === "ok")
    return (
      <Notice title="Undone">
        <p role="status">{state.message}</p>
      </Notice>
    );
  return (
    <form action={action} className="space-y-4">
      {state.status === "error" && state.message ? (
        <Notice tone="danger">
          <p>{state.message}</p>
        </Notice>
      ) : null}
      <input type="hidden" name="uploadId" value={uploadId} />
      <Field
        label="Why (kept in the history)"
        name="reason"
        required
        maxLength={500}
        errors={state.fieldErrors?.reason}
        hint="For example: sent last season's sheet, the mapping put grams in the kilogram column."
      />
      <Button type="submit" variant="danger" disabled={pending}>
        {pending ? "Undoing…" : "Undo this commit"}
      </Button>
    </form>
  );
}
