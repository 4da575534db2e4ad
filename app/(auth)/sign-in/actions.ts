"use server";

import { AuthError } from "next-auth";
import { redirect } from "next/navigation";
import { z } from "zod";
import { signIn } from "@/auth";
import { signInLimits } from "@/lib/data/sign-in";
import { safeReturnPath } from "@/lib/auth/return-path";

export interface SignInState {
  message?: string;
  email?: string;
}

const signInSchema = z.object({
  email: z.string().trim().min(1, "Enter your e-mail address."),
  password: z.string().min(1, "Enter your password."),
  returnTo: z.string().optional(),
});

export async function signInAction(_previous: SignInState, formData: FormData): Promise<SignInState> {
  const parsed = signInSchema.safeParse(Object.fromEntries(formData));
  if (!parsed.success) return { message: parsed.error.issues[0]?.message, email: String(formData.get("email") ?? "") };
  const { email, password, returnTo } = parsed.data;
  try {
    await signIn("credentials", { email, password, redirect: false });
  } catch (error) {
    if (!(error instanceof AuthError)) throw error;
    const rateLimited = "code" in error && error.code === "rate_limited";
    return {
      email,
      message: rateLimited
        ? `Too many attempts. Wait ${signInLimits.windowMinutes} minutes, then try again or ask your farm manager or the coordinator to reset your password.`
        : "That e-mail and password do not match an active member. Check both and try again.",
    };
  }
  redirect(safeReturnPath(returnTo));
}
