"use server";

import { headers } from "next/headers";
import { z } from "zod";
import { clientAddress } from "@/lib/auth/client-address";
import type { ActionState } from "@/lib/auth/guard";
import { requestPasswordReset } from "@/lib/data/members";
import { env } from "@/lib/env";

const requestSchema = z.object({ email: z.string().trim().toLowerCase().pipe(z.email("Enter the e-mail address you sign in with.")) });

/** The same answer whether or not the address belongs to a member. */
export async function requestResetAction(_previous: ActionState, formData: FormData): Promise<ActionState> {
  const parsed = requestSchema.safeParse(Object.fromEntries(formData));
  if (!parsed.success)
    return {
      status: "error",
      message: "Some fields need attention.",
      fieldErrors: { email: parsed.error.issues.map((issue) => issue.message) },
    };
  const ip = clientAddress(await headers(), env("RHIZO_TRUSTED_PROXIES"));
  await requestPasswordReset(parsed.data.email, ip);
  return {
    status: "ok",
    message: `If ${parsed.data.email} belongs to an active member, a reset link is on its way. It works once, for one hour. Nothing arrived? Check the address and your spam folder, or ask your farm manager or the coordinator.`,
  };
}
