"use client";

import { useActionState, useState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import type { ActionState } from "@/lib/auth/guard";
import type { HarvestTarget } from "@/lib/data/blocks";
import { recordHarvestAction } from "./actions";

const initial: ActionState = { status: "idle" };

function today(): string {
  const now = new Date();
  return `${now.getFullYear()}-${String(now.getMonth() + 1).padStart(2, "0")}-${String(now.getDate()).padStart(2, "0")}`;
}

/** Block code with suggestions, the next flush filled in, weight with its unit, and today's date. */
export function QuickHarvestForm({
  targets,
  initialBlock,
  defaultUnit,
}: {
  targets: HarvestTarget[];
  initialBlock: string;
  defaultUnit: "g" | "lb";
}) {
  const [state, action, pending] = useActionState(recordHarvestAction, initial);
  const [blockCode, setBlockCode] = useState(initialBlock);
  const suggested = targets.find((target) => target.code.toLowerCase() === blockCode.trim().toLowerCase())?.nextFlush;
  const [flush, setFlush] = useState<string>(suggested ? String(suggested) : "");
  const [flushTouched, setFlushTouched] = useState(false);
  const shownFlush = flushTouched ? flush : suggested ? String(suggested) : flush;

  return (
    <form
      action={action}
      className="space-y-4 rounded-xl border border-oat-300 bg-white p-5 shadow-sm"
      key={state.status === "ok" ? state.message : "form"}
    >
      {state.status === "ok" ? (
        <Notice title="Saved">
          <p role="status">{state.message}</p>
        </Notice>
      ) : null}
      {state.status === "error" && state.message ? (
        <Notice tone="danger">
          <p>{state.message}</p>
        </Notice>
      ) : null}
      <Field
        label="Block code"
        name="blockCode"
        list="block-codes"
        autoComplete="off"
        autoCapitalize="characters"
        required
        value={blockCode}
        onChange={(event) => {
          setBlockCode(event.target.value);
          setFlushTouched(false);
        }}
        errors={state.fieldErrors?.blockCode}
        hint="As written on the bag; start typing to pick from your blocks."
      />
      <datalist id="block-codes">
        {targets.map((target) => (
          <option key={target.code} value={target.code} />
        ))}
      </datalist>
      <Field
        label="Flush"
        name="flush"
        type="number"
        inputMode="numeric"
        min={1}
        max={20}
        required
        value={shownFlush}
        onChange={(event) => {
          setFlush(event.target.value);
          setFlushTouched(true);
        }}
        errors={state.fieldErrors?.flush}
        hint={suggested ? `Flush ${suggested} is next for this block.` : undefined}
      />
      <div className="grid grid-cols-[1fr_7rem] items-start gap-3">
        <Field label="Fresh weight" name="weight" inputMode="decimal" required errors={state.fieldErrors?.weight} placeholder="640" />
        <div className="space-y-1">
          <label htmlFor="unit" className="block text-sm font-medium">
            Unit
          </label>
          <select
            id="unit"
            name="unit"
            defaultValue={defaultUnit}
            className="block min-h-11 w-full rounded-lg border border-oat-300 bg-white px-3 text-base"
          >
            <option value="g">g</option>
            <option value="kg">kg</option>
            <option value="lb">lb</option>
            <option value="oz">oz</option>
          </select>
        </div>
      </div>
      <Field label="Picked on" name="harvestedOn" type="date" required defaultValue={today()} errors={state.fieldErrors?.harvestedOn} />
      <Button type="submit" disabled={pending} className="w-full">
        {pending ? "Saving…" : "Save this flush"}
      </Button>
    </form>
  );
}
