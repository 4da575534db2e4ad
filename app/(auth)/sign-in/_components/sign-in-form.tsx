"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { signInAction, type SignInState } from "../actions";

export function SignInForm({ returnTo }: { returnTo?: string }) {
  const [state, formAction, pending] = useActionState<SignInState, FormData>(signInAction, {});
  return (
    <form action={formAction} className="space-y-4" noValidate>
      <Field label="E-mail" name="email" type="email" autoComplete="username" required defaultValue={state.email} />
      <Field label="Password" name="password" type="password" autoComplete="current-password" required />
      {returnTo ? <input type="hidden" name="returnTo" value={returnTo} /> : null}
      {state.message ? (
        <p role="alert" className="rounded-lg bg-danger-bg px-3 py-2 text-sm text-danger-ink">
          {state.message}
        </p>
      ) : null}
      <Button type="submit" className="w-full" disabled={pending}>
        {pending ? "Signing in…" : "Sign in"}
      </Button>
    </form>
  );
}
