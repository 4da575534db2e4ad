"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import type { ActionState } from "@/lib/auth/guard";
import { releaseScheduleLabels, releaseSchedules, type CooperativeSettingsInput } from "@/lib/pooled";
import { updateCooperativeSettingsAction } from "../actions";

const selectClass = "block min-h-11 w-full rounded-lg border border-oat-300 bg-white px-3 py-2 text-base text-ink";

/** `timeZone`: the coordinator's own, whose clocks the release hour is shown and saved on. */
export function CooperativeSettingsForm({ settings, timeZone }: { settings: CooperativeSettingsInput; timeZone: string }) {
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
        min={3}
        max={50}
        required
        defaultValue={settings.minimumFarms}
        errors={state.fieldErrors?.minimumFarms}
        hint="Every pooled figure (means, counts, contamination rates, chart elements) from fewer farms shows “fewer than N farms” instead, and a release changes a figure only when at least this many farms changed it. At least 3."
      />
      <div className="space-y-1">
        <label className="flex min-h-11 items-center gap-3 text-sm font-medium">
          <input
            type="checkbox"
            name="showPerFarmEstimates"
            defaultChecked={settings.showPerFarmEstimates}
            className="h-5 w-5"
            aria-describedby="showPerFarmEstimates-hint"
          />
          Show anonymised per-farm estimates in the farm-by-farm charts
        </label>
        <p id="showPerFarmEstimates-hint" className="text-xs text-ink-soft">
          Off: members see only the pooled estimate and their own farm. On: every farm&apos;s estimate, unnamed and in a random order, in
          the Co-op results and in trial reports analysed while it is on.
        </p>
        {state.fieldErrors?.showPerFarmEstimates ? (
          <p className="text-sm text-danger-ink">{state.fieldErrors.showPerFarmEstimates.join(" ")}</p>
        ) : null}
      </div>
      <div className="grid grid-cols-1 gap-4 sm:grid-cols-2">
        <div className="space-y-1">
          <label htmlFor="releaseSchedule" className="block text-sm font-medium text-ink">
            When releases of the pooled figures are published
          </label>
          <select
            id="releaseSchedule"
            name="releaseSchedule"
            defaultValue={settings.releaseSchedule}
            className={selectClass}
            aria-describedby={state.fieldErrors?.releaseSchedule ? "releaseSchedule-errors" : undefined}
          >
            {releaseSchedules.map((schedule) => (
              <option key={schedule} value={schedule}>
                {releaseScheduleLabels[schedule]}
              </option>
            ))}
          </select>
          {state.fieldErrors?.releaseSchedule ? (
            <p id="releaseSchedule-errors" className="text-sm text-danger-ink">
              {state.fieldErrors.releaseSchedule.join(" ")}
            </p>
          ) : null}
        </div>
        <Field
          label={`At (hour, ${timeZone})`}
          name="releaseHour"
          type="number"
          inputMode="numeric"
          min={0}
          max={23}
          required
          defaultValue={settings.releaseHour}
          errors={state.fieldErrors?.releaseHour}
        />
      </div>
      <Button type="submit" disabled={pending}>
        {pending ? "Saving…" : "Save co-op settings"}
      </Button>
    </form>
  );
}
