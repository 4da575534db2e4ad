"use server";

import { AuthError } from "next-auth";
import { redirect } from "next/navigation";
import { z } from "zod";
import { RateLimitedSignin, signIn } from "@/auth";
import { waitInWords } from "@/lib/auth/sign-in-pace";
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
  if (!parsed.success) {
    const typed = formData.get("email");
    return { message: parsed.error.issues[0]?.message, email: typeof typed === "string" ? typed : "" };
  }
  const { email, password, returnTo } = parsed.data;
  try {
    await signIn("credentials", { email, password, redirect: false });
  } catch (error) {
    if (!(error instanceof AuthError)) throw error;
    return {
      email,
      message:
        error instanceof RateLimitedSignin
          ? `Too many tries for this account from your network. Wait ${waitInWords(error.retryAfterSeconds)}, then try again; if you have forgotten the password, reset it by e-mail.`
          : "That e-mail and password do not match an active member. Check both and try again.",
    };
  }
  redirect(safeReturnPath(returnTo));
}
