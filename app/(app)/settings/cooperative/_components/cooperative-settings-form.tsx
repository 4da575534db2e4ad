"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import type { ActionState } from "@/lib/auth/guard";
import { updateCooperativeSettingsAction } from "../actions";

export function CooperativeSettingsForm({ minimumFarms, showPerFarmEstimates }: { minimumFarms: number; showPerFarmEstimates: boolean }) {
  const [state, formAction, pending] = useActionState<ActionState, FormData>(updateCooperativeSettingsAction, { status: "idle" });
  return (
    <form action={formAction} className="max-w-xl space-y-5">
      {state.status === "ok" ? <Notice title="Saved">{state.message}</Notice> : null}
      {state.status === "error" && state.message ? (
        <Notice tone="danger" title="Not saved">
          {state.message}
        </Notice>
      ) : null}
      <Field
        label="Minimum number of farms behind a published figure"
        name="minimumFarms"
        type="number"
        inputMode="numeric"
        min={2}
        max={50}
        required
        defaultValue={minimumFarms}
        errors={state.fieldErrors?.minimumFarms}
        hint="Every pooled figure (means, contamination rates, chart elements) from fewer farms shows “fewer than N farms” instead. 3 or more is recommended."
      />
      <div className="space-y-1">
        <label className="flex min-h-11 items-center gap-3 text-sm font-medium">
          <input
            type="checkbox"
            name="showPerFarmEstimates"
            defaultChecked={showPerFarmEstimates}
            className="h-5 w-5"
            aria-describedby="showPerFarmEstimates-hint"
          />
          Show anonymised per-farm estimates in the farm-by-farm charts
        </label>
        <p id="showPerFarmEstimates-hint" className="text-xs text-ink-soft">
          Off: members see only the pooled estimate and their own farm. On: every farm&apos;s estimate, unnamed and in a random order.
        </p>
        {state.fieldErrors?.showPerFarmEstimates ? (
          <p className="text-sm text-danger-ink">{state.fieldErrors.showPerFarmEstimates.join(" ")}</p>
        ) : null}
      </div>
      <Button type="submit" disabled={pending}>
        {pending ? "Saving…" : "Save co-op settings"}
      </Button>
    </form>
  );
}
