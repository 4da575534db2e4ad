"use server";

import { AuthError } from "next-auth";
import { redirect } from "next/navigation";
import { z } from "zod";
import { signIn } from "@/auth";
import type { ActionState } from "@/lib/auth/guard";
import { newPasswordSchema } from "@/lib/auth/password";
import { redeemAccessToken } from "@/lib/data/members";
import { tokenRefusal } from "@/lib/members/tokens";

const acceptSchema = z
  .object({
    token: z.string(),
    name: z.string().trim().min(2, "Give your name as the co-op should see it.").max(120, "Keep your name under 120 characters."),
    password: newPasswordSchema,
    repeatPassword: z.string(),
  })
  .refine((input) => input.password === input.repeatPassword, {
    path: ["repeatPassword"],
    message: "The two passwords differ: type the same one twice.",
  });

function problems(error: z.ZodError): ActionState {
  const fieldErrors: Record<string, string[]> = {};
  for (const issue of error.issues) (fieldErrors[issue.path.join(".") || "form"] ??= []).push(issue.message);
  return { status: "error", message: "Some fields need attention.", fieldErrors };
}

/**
 * Signed-out: the token itself is the authority, checked and used once in the database. The new
 * member is then signed in with the password just set and lands on their start page, as anyone
 * who has just chosen a password expects.
 */
export async function acceptInvitationAction(_previous: ActionState, formData: FormData): Promise<ActionState> {
  const parsed = acceptSchema.safeParse(Object.fromEntries(formData));
  if (!parsed.success) return problems(parsed.error);
  const outcome = await redeemAccessToken(parsed.data.token, "invitation", { name: parsed.data.name, password: parsed.data.password });
  if (outcome.status !== "accepted" && outcome.status !== "reset")
    return { status: "error", message: tokenRefusal(outcome.status, "invitation") };
  try {
    await signIn("credentials", { email: outcome.email, password: parsed.data.password, redirect: false });
  } catch (error) {
    // The password is set either way; a sign-in refused now (too many tries from this network) is done by hand.
    if (!(error instanceof AuthError)) throw error;
    return { status: "ok", message: `Welcome. Your password is set: sign in as ${outcome.email}.` };
  }
  redirect("/");
}

const resetSchema = z
  .object({ token: z.string(), password: newPasswordSchema, repeatPassword: z.string() })
  .refine((input) => input.password === input.repeatPassword, {
    path: ["repeatPassword"],
    message: "The two passwords differ: type the same one twice.",
  });

export async function setNewPasswordAction(_previous: ActionState, formData: FormData): Promise<ActionState> {
  const parsed = resetSchema.safeParse(Object.fromEntries(formData));
  if (!parsed.success) return problems(parsed.error);
  const outcome = await redeemAccessToken(parsed.data.token, "password_reset", { name: "", password: parsed.data.password });
  if (outcome.status !== "reset")
    return { status: "error", message: tokenRefusal(outcome.status === "accepted" ? "unknown" : outcome.status, "password_reset") };
  return { status: "ok", message: "Your new password is set. Sign in with it." };
}
