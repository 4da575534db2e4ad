"use server";

import { AuthError } from "next-auth";
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { z } from "zod";
import { signIn, signOut } from "@/auth";
import { guardedAction } from "@/lib/auth/guard";
import { newPasswordSchema } from "@/lib/auth/password";
import { changePassword, updatePreferences } from "@/lib/data/members";
import { endEverySession } from "@/lib/data/sessions";
import { canonicalTimeZone, dateStyleNames } from "@/lib/time/display";
import { displayUnitNames } from "@/lib/units";

const changePasswordSchema = z
  .object({
    currentPassword: z.string().min(1, "Type the password you signed in with."),
    newPassword: newPasswordSchema,
    repeatPassword: z.string(),
  })
  .refine((input) => input.newPassword === input.repeatPassword, {
    path: ["repeatPassword"],
    message: "The two new passwords differ: type the same one twice.",
  })
  .refine((input) => input.newPassword !== input.currentPassword, {
    path: ["newPassword"],
    message: "Choose a password different from the current one.",
  });

/** A new password ends every session, this one too; this browser signs in again with the new password. */
export const changePasswordAction = guardedAction("account:manage", changePasswordSchema, async (input, member) => {
  await changePassword(member, input.currentPassword, input.newPassword);
  try {
    await signIn("credentials", { email: member.email, password: input.newPassword, redirect: false });
  } catch (error) {
    if (!(error instanceof AuthError)) throw error;
    redirect("/sign-in?signedOut=password");
  }
  return { status: "ok", message: "Password changed. Every other device was signed out; we sent a note to your e-mail address." };
});

const everywhereSchema = z.object({ scope: z.literal("everywhere", "Use the Sign out everywhere button.") });

/** Ends every session of the member on every device, this one included. */
export const signOutEverywhereAction = guardedAction("account:manage", everywhereSchema, async (_input, member) => {
  await endEverySession(member);
  await signOut({ redirect: false });
  redirect("/sign-in?signedOut=everywhere");
});

const preferencesSchema = z.object({
  displayUnits: z.enum(displayUnitNames, "Choose metric or imperial."),
  notifyReminders: z
    .literal("on")
    .optional()
    .transform((value) => value === "on"),
  // Empty: follow the browser's zone (lib/time/browser-zone.ts).
  timeZone: z
    .string()
    .trim()
    .transform((value, context) => {
      if (value === "") return null;
      const zone = canonicalTimeZone(value);
      if (!zone) context.addIssue({ code: "custom", message: "Choose a time zone from the list, e.g. Europe/Berlin, or your browser's." });
      return zone;
    }),
  dateStyle: z.enum(dateStyleNames, "Choose one of the ways of writing dates."),
});

export const updatePreferencesAction = guardedAction("account:manage", preferencesSchema, async (input, member) => {
  await updatePreferences(member, input);
  revalidatePath("/", "layout");
  return { status: "ok", message: "Preferences saved." };
});
