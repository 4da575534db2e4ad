"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { guardedAction } from "@/lib/auth/guard";
import { minimumPasswordLength } from "@/lib/auth/password";
import { changePassword, updatePreferences } from "@/lib/data/members";

const changePasswordSchema = z
  .object({
    currentPassword: z.string().min(1, "Type the password you signed in with."),
    newPassword: z
      .string()
      .min(minimumPasswordLength, `Use at least ${minimumPasswordLength} characters; a few unrelated words are easy to remember.`)
      .max(200, "Keep the password under 200 characters."),
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

export const changePasswordAction = guardedAction("account:manage", changePasswordSchema, async (input, member) => {
  await changePassword(member, input.currentPassword, input.newPassword);
  return { status: "ok", message: "Password changed. We sent a note to your e-mail address." };
});

const preferencesSchema = z.object({
  displayUnits: z.enum(["metric", "imperial"], "Choose metric or imperial."),
  notifyReminders: z
    .literal("on")
    .optional()
    .transform((value) => value === "on"),
});

export const updatePreferencesAction = guardedAction("account:manage", preferencesSchema, async (input, member) => {
  await updatePreferences(member, input);
  revalidatePath("/", "layout");
  return { status: "ok", message: "Preferences saved." };
});
