"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import type { ActionState } from "@/lib/auth/guard";

type Action = (state: ActionState, formData: FormData) => Promise<ActionState>;

/** A one-button form for a server action, with its outcome announced beside it. */
export function ActionForm({
  action,
  hidden,
  label,
  variant = "primary",
  confirm,
  children,
}: {
  action: Action;
  hidden: Record<string, string>;
  label: string;
  variant?: "primary" | "secondary" | "danger";
  confirm?: string;
  children?: React.ReactNode;
}) {
  const [state, formAction, pending] = useActionState(action, { status: "idle" });
  return (
    <form
      action={formAction}
      className="space-y-2"
      onSubmit={(event) => {
        if (confirm && !window.confirm(confirm)) event.preventDefault();
      }}
    >
      {Object.entries(hidden).map(([name, value]) => (
        <input key={name} type="hidden" name={name} value={value} />
      ))}
      {children}
      <Button type="submit" variant={variant} disabled={pending}>
        {pending ? "Working…" : label}
      </Button>
      {state.status !== "idle" && state.message ? (
        <p role="status" className={`text-sm ${state.status === "error" ? "text-danger-ink" : "text-moss-700"}`}>
          {state.message}
          {state.fieldErrors
            ? Object.values(state.fieldErrors)
                .flat()
                .filter((message) => message !== state.message)
                .map((message) => (
                  <span key={message} className="block">
                    {message}
                  </span>
                ))
            : null}
        </p>
      ) : null}
    </form>
  );
}
