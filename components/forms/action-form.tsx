"use client";

import { useActionState, useId } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import type { ActionState } from "@/lib/auth/guard";

export interface FormFieldSpec {
  name: string;
  label: string;
  type?: "text" | "email" | "password" | "checkbox" | "file" | "number" | "date" | "time";
  options?: { value: string; label: string }[];
  hint?: string;
  autoComplete?: string;
  defaultValue?: string;
  defaultChecked?: boolean;
}

const selectClass = "block min-h-11 w-full rounded-lg border border-oat-300 bg-white px-3 py-2 text-base text-ink";

/**
 * The form for one server action on every page: labelled fields with their own errors, any
 * inputs the page adds as children, the action's message, and a submit button that says when it
 * is working. A one-button form (a move, a reminder) needs only `action`, `hidden` and `submitLabel`.
 */
export function ActionForm({
  action,
  submitLabel,
  pendingLabel = "Saving…",
  fields = [],
  hidden = {},
  variant = "primary",
  successMessage,
  testId,
  inline = false,
  confirm,
  children,
}: {
  action: (state: ActionState, formData: FormData) => Promise<ActionState>;
  submitLabel: string;
  pendingLabel?: string;
  fields?: FormFieldSpec[];
  hidden?: Record<string, string>;
  variant?: "primary" | "secondary" | "danger";
  successMessage?: string;
  testId?: string;
  inline?: boolean;
  /** Asked before a change that is hard to take back. */
  confirm?: string;
  /** Inputs the page lays out itself, between the fields and the button. */
  children?: React.ReactNode;
}) {
  // On an error the form shows what was typed again (React empties a form after its action runs);
  // each answer remounts the fields, so their starting values are the ones just sent.
  const [state, formAction, pending] = useActionState<ActionState & { typed?: Record<string, string>; answer?: number }, FormData>(
    async (previous, formData) => {
      const next = await action(previous, formData);
      const typed = Object.fromEntries(
        [...formData.entries()].filter((entry): entry is [string, string] => typeof entry[1] === "string" && !/password/i.test(entry[0])),
      );
      return {
        ...next,
        typed: next.status === "error" || next.status === "confirm" ? typed : undefined,
        answer: (previous.answer ?? 0) + 1,
      };
    },
    { status: "idle" },
  );
  const errorsOf = (name: string) => state.fieldErrors?.[name];
  const startOf = (field: FormFieldSpec) => state.typed?.[field.name] ?? field.defaultValue;
  // Ids of this form's own: two forms on one page may have fields of the same name.
  const formId = useId();
  const idOf = (name: string) => `${testId ?? "form"}${formId}-${name}`;
  const keyOf = (name: string) => `${name}-${state.answer ?? 0}`;
  // Errors for names that have no field here (hidden inputs, inputs passed as children) are listed under the message.
  const shown = new Set(fields.map((field) => field.name));
  const otherErrors = Object.entries(state.fieldErrors ?? {})
    .filter(([name]) => !shown.has(name))
    .flatMap(([, errors]) => errors)
    .filter((error) => error !== state.message);
  return (
    <form
      action={formAction}
      onSubmit={confirm ? (event) => (window.confirm(confirm) ? undefined : event.preventDefault()) : undefined}
      data-testid={testId}
      className={inline ? "flex flex-wrap items-end gap-2" : "space-y-4"}
      // The fields described here show the server's messages beside them; inputs a page passes as
      // children may ask the browser to check them first (a required tick box).
      noValidate={!children}
    >
      {Object.entries(hidden).map(([name, value]) => (
        <input key={name} type="hidden" name={name} value={value} />
      ))}
      {fields.map((field) =>
        field.options ? (
          <div key={keyOf(field.name)} className="space-y-1">
            <label htmlFor={idOf(field.name)} className="block text-sm font-medium text-ink">
              {field.label}
            </label>
            <select
              id={idOf(field.name)}
              name={field.name}
              defaultValue={startOf(field)}
              aria-describedby={errorsOf(field.name)?.length ? `${idOf(field.name)}-errors` : undefined}
              className={selectClass}
            >
              {field.options.map((option) => (
                <option key={option.value} value={option.value}>
                  {option.label}
                </option>
              ))}
            </select>
            {errorsOf(field.name)?.length ? (
              <ul id={`${idOf(field.name)}-errors`} className="text-sm text-danger-ink">
                {errorsOf(field.name)?.map((error) => (
                  <li key={error}>{error}</li>
                ))}
              </ul>
            ) : null}
          </div>
        ) : field.type === "checkbox" ? (
          <label key={keyOf(field.name)} className="flex min-h-11 items-center gap-3 text-sm">
            <input
              type="checkbox"
              name={field.name}
              value="on"
              defaultChecked={state.typed ? state.typed[field.name] === "on" : field.defaultChecked}
              className="h-5 w-5"
            />
            {field.label}
          </label>
        ) : (
          <Field
            key={keyOf(field.name)}
            id={idOf(field.name)}
            label={field.label}
            name={field.name}
            type={field.type ?? "text"}
            hint={field.hint}
            autoComplete={field.autoComplete}
            defaultValue={field.type === "password" || field.type === "file" ? undefined : startOf(field)}
            errors={errorsOf(field.name)}
          />
        ),
      )}
      {children}
      {state.status === "error" && state.message ? (
        <p role="alert" className="rounded-lg bg-danger-bg px-3 py-2 text-sm text-danger-ink">
          {state.message}
          {otherErrors.map((error) => (
            <span key={error} className="block">
              {error}
            </span>
          ))}
        </p>
      ) : null}
      {state.status === "ok" ? (
        <p role="status" className="rounded-lg bg-moss-50 px-3 py-2 text-sm text-moss-800">
          {state.message ?? successMessage ?? "Saved."}
        </p>
      ) : null}
      <Button type="submit" variant={variant} disabled={pending}>
        {pending ? pendingLabel : submitLabel}
      </Button>
    </form>
  );
}
