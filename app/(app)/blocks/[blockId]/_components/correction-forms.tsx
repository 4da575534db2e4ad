"use client";

import { startTransition, useActionState, useState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import type { ActionState } from "@/lib/auth/guard";
import { correctBlockAction, correctHarvestAction } from "../actions";

const initial: ActionState = { status: "idle" };
const units = ["g", "kg", "lb", "oz"] as const;

/**
 * The state a correction form shows: the last answer, and its warnings until a field is edited
 * (warnings stand for the values they were given for). Sent by hand rather than through the
 * form's action: React resets a form after its action, and the grower's edits must stay.
 */
function useCorrection(action: (state: ActionState, data: FormData) => Promise<ActionState>) {
  const [state, run, pending] = useActionState(action, initial);
  const [edited, setEdited] = useState(false);
  const [answered, setAnswered] = useState(state);
  if (answered !== state) {
    setAnswered(state);
    setEdited(false);
  }
  const warnings = state.status === "confirm" && !edited ? (state.warnings ?? []) : [];
  return {
    state,
    pending,
    warnings,
    warningsFor: (field: string) => warnings.filter((warning) => warning.field === field).map((warning) => warning.message),
    /** Any field edited: the form's change event bubbles from each of them. */
    onChange: () => setEdited(true),
    onSubmit: (event: React.FormEvent<HTMLFormElement>) => {
      event.preventDefault();
      const data = new FormData(event.currentTarget, (event.nativeEvent as SubmitEvent).submitter);
      startTransition(() => run(data));
    },
  };
}

function Answer({ state }: { state: ActionState }) {
  if (state.status === "ok")
    return (
      <Notice title="Saved">
        <p role="status">{state.message}</p>
      </Notice>
    );
  if (state.status === "error" && state.message)
    return (
      <Notice tone="danger">
        <p>{state.message}</p>
      </Notice>
    );
  return null;
}

function FieldWarnings({ name, messages }: { name: string; messages: string[] }) {
  if (messages.length === 0) return null;
  return (
    <ul id={`${name}-warnings`} className="-mt-2 text-sm text-caution-ink" data-testid={`${name}-warnings`}>
      {messages.map((message) => (
        <li key={message}>Check: {message}</li>
      ))}
    </ul>
  );
}

function SaveAnyway({
  warnings,
  message,
  pending,
  label = "Save anyway",
}: {
  warnings: { code: string }[];
  message?: string;
  pending: boolean;
  label?: string;
}) {
  if (warnings.length === 0) return null;
  return (
    <Notice tone="caution" title="Not saved yet">
      <p>{message}</p>
      <p>If the values are right as they are, save them anyway: the warning is kept and the history shows your reason.</p>
      <Button type="submit" name="acceptWarnings" value={warnings.map((warning) => warning.code).join(",")} disabled={pending}>
        {label}
      </Button>
    </Notice>
  );
}

function UnitPicker({ name, label, defaultValue }: { name: string; label: string; defaultValue: string }) {
  return (
    <div className="space-y-1">
      <label htmlFor={name} className="block text-sm font-medium">
        {label}
      </label>
      <select
        id={name}
        name={name}
        defaultValue={defaultValue}
        className="block min-h-11 w-full rounded-lg border border-oat-300 bg-white px-3 text-base"
      >
        {units.map((unit) => (
          <option key={unit} value={unit}>
            {unit}
          </option>
        ))}
      </select>
    </div>
  );
}

function ReasonField({ errors }: { errors?: string[] }) {
  return (
    <Field
      label="Why (kept in the history)"
      name="reason"
      required
      maxLength={500}
      errors={errors}
      hint="For example: typed kg for g, weighed the wrong bag."
    />
  );
}

export interface BlockFormValues {
  blockId: string;
  wetMass: string;
  moisture: string;
  inoculatedOn: string;
  contaminated: boolean;
  contaminatedOn: string;
  spentMass: string;
  notes: string;
}

/** A block's recorded values, as stored, to correct; judged by the import's rules when saved. */
export function BlockCorrectionForm({ values, defaultUnit }: { values: BlockFormValues; defaultUnit: "g" | "lb" }) {
  const form = useCorrection(correctBlockAction);
  const errors = form.state.fieldErrors;
  return (
    <form onSubmit={form.onSubmit} onChange={form.onChange} className="space-y-4">
      <Answer state={form.state} />
      <input type="hidden" name="blockId" value={values.blockId} />
      <div className="grid grid-cols-[1fr_7rem] items-start gap-3">
        <Field
          label="Wet block weight"
          name="wetMass"
          defaultValue={values.wetMass}
          errors={errors?.wetMass}
          autoComplete="off"
          hint="With its unit, or in the unit picked. Blank: not weighed."
        />
        <UnitPicker name="wetUnit" label="Unit" defaultValue={defaultUnit} />
      </div>
      <FieldWarnings name="wetMass" messages={form.warningsFor("wetMass")} />
      <Field
        label="Substrate moisture"
        name="moisture"
        defaultValue={values.moisture}
        errors={errors?.moisture}
        hint="Wet basis, such as 62 % or 0.62."
      />
      <Field label="Inoculated on" name="inoculatedOn" type="date" defaultValue={values.inoculatedOn} errors={errors?.inoculatedOn} />
      <FieldWarnings name="inoculatedOn" messages={form.warningsFor("inoculatedOn")} />
      <div className="flex min-h-11 items-center gap-2">
        <input id="contaminated" name="contaminated" type="checkbox" defaultChecked={values.contaminated} className="size-5" />
        <label htmlFor="contaminated" className="text-sm font-medium">
          Contaminated
        </label>
      </div>
      <Field
        label="Contamination found on"
        name="contaminatedOn"
        type="date"
        defaultValue={values.contaminatedOn}
        errors={errors?.contaminatedOn}
      />
      <FieldWarnings name="contaminatedOn" messages={form.warningsFor("contaminatedOn")} />
      <div className="grid grid-cols-[1fr_7rem] items-start gap-3">
        <Field label="Spent block weight" name="spentMass" defaultValue={values.spentMass} errors={errors?.spentMass} autoComplete="off" />
        <UnitPicker name="spentUnit" label="Unit" defaultValue={defaultUnit} />
      </div>
      <FieldWarnings name="spentMass" messages={form.warningsFor("spentMass")} />
      <Field label="Notes" name="notes" defaultValue={values.notes} errors={errors?.notes} />
      <ReasonField errors={errors?.reason} />
      <SaveAnyway warnings={form.warnings} message={form.state.message} pending={form.pending} />
      <Button type="submit" disabled={form.pending} variant={form.warnings.length > 0 ? "secondary" : "primary"}>
        {form.pending ? "Saving…" : form.warnings.length > 0 ? "Check again" : "Save the correction"}
      </Button>
    </form>
  );
}

/** One harvest's day and fresh weight to correct, or the harvest to delete; either needs a reason. */
export function HarvestCorrectionForm({
  harvest,
  defaultUnit,
}: {
  harvest: { id: string; flush: number; weight: string; harvestedOn: string };
  defaultUnit: "g" | "lb";
}) {
  const form = useCorrection(correctHarvestAction);
  const errors = form.state.fieldErrors;
  // Which button was pressed last: warnings after "Delete" are answered by "Delete anyway".
  const [intent, setIntent] = useState<"correct" | "delete">("correct");
  const deleting = intent === "delete" && form.warnings.length > 0;
  return (
    <form
      onSubmit={(event) => {
        const pressed = event.nativeEvent.submitter?.getAttribute("value");
        if (pressed === "delete" || pressed === "correct") setIntent(pressed);
        form.onSubmit(event);
      }}
      onChange={form.onChange}
      className="space-y-4"
    >
      <Answer state={form.state} />
      <input type="hidden" name="harvestId" value={harvest.id} />
      {/* Before the buttons: a button pressed after it says its own intent, which wins. */}
      {deleting ? <input type="hidden" name="intent" value="delete" /> : null}
      <div className="grid grid-cols-[1fr_7rem] items-start gap-3">
        <Field
          label={`Fresh weight of flush ${harvest.flush}`}
          name="weight"
          defaultValue={harvest.weight}
          errors={errors?.weight}
          autoComplete="off"
          hint="With its unit, or in the unit picked: 1 lb 2 oz, 640 g."
        />
        <UnitPicker name="unit" label="Unit" defaultValue={defaultUnit} />
      </div>
      <FieldWarnings name="weight" messages={form.warningsFor("weight")} />
      <Field label="Picked on" name="harvestedOn" type="date" required defaultValue={harvest.harvestedOn} errors={errors?.harvestedOn} />
      <FieldWarnings name="harvestedOn" messages={form.warningsFor("harvestedOn")} />
      <FieldWarnings name="flush" messages={form.warningsFor("flush")} />
      <FieldWarnings name="blockCode" messages={form.warningsFor("blockCode")} />
      <ReasonField errors={errors?.reason} />
      <SaveAnyway
        warnings={form.warnings}
        message={form.state.message}
        pending={form.pending}
        label={deleting ? "Delete anyway" : undefined}
      />
      <div className="flex flex-wrap gap-3">
        <Button
          type="submit"
          name="intent"
          value="correct"
          disabled={form.pending}
          variant={form.warnings.length > 0 ? "secondary" : "primary"}
        >
          {form.pending ? "Saving…" : "Save the correction"}
        </Button>
        <Button type="submit" name="intent" value="delete" variant="danger" formNoValidate disabled={form.pending}>
          Delete this harvest
        </Button>
      </div>
    </form>
  );
}
